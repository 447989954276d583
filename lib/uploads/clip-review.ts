/**
 * What the therapist sees of an analyzed clip besides the stored attempt's numbers: the per-frame angle trace and the
 * hand drawing, read from the stored capture with the same engine that produced the attempt. Pure (no I/O).
 */
import type { CaptureFile } from "@/lib/capture/schema";
import type { AnalyzeOptions } from "@/vision/analyze-capture";
import { analyzeCaptureFile } from "@/vision/model-pair";
import type { FrameQuality } from "@/vision/pipeline";

export interface TracePoint {
  /** Milliseconds from the clip's first frame; the clip's own media time (frame i at i/fps). */
  t: number;
  /** The engine's angle for this frame, null when the frame was skipped (no hand, low score). */
  angleDeg: number | null;
  smoothedDeg: number | null;
  quality: FrameQuality;
}

export interface ClipReviewTrace {
  points: TracePoint[];
  /** Picture landmarks per frame ([x, y] 0-1), null where none were kept or no hand was found. */
  images: ([number, number][] | null)[];
  /** Each repetition's span on the clip's clock and its held peak, for marks on the trace. */
  repetitions: { startMs: number; endMs: number; peakDeg: number }[];
  /** The hand models whose frames the stored capture holds: both when it carries the full model's (vision/model-pair.ts). */
  handModels: ("lite" | "full")[];
}

/** Rounded to 0.1 degree: finer than any angle the engine claims, and a minute of frames stays small to send. */
const tenth = (v: number | null) => (v === null ? null : Math.round(v * 10) / 10);

export function clipReviewTrace(capture: CaptureFile, options: Pick<AnalyzeOptions, "correction"> = {}): ClipReviewTrace {
  // One pass through the analysis itself, so the trace is read exactly as the stored figures were (straight-wrist
  // reading, picture points, both hand models and all).
  const points: TracePoint[] = [];
  const analysis = analyzeCaptureFile(capture, {
    ...options,
    onFrame: (reading, index) => {
      points.push({ t: capture.frames[index].t, angleDeg: tenth(reading.angleDeg), smoothedDeg: tenth(reading.smoothedDeg), quality: reading.quality });
    },
  });
  return {
    points,
    images: capture.frames.map((f) => (f.hand && f.image ? f.image.map((p) => [p[0], p[1]] as [number, number]) : null)),
    repetitions: analysis.repetitions.map((r) => ({ startMs: r.startMs, endMs: r.endMs, peakDeg: r.peakDeg })),
    handModels: capture.fullModel ? ["lite", "full"] : ["lite"],
  };
}

/** The index of the frame on screen at `mediaTimeMs`: the last frame whose time is not after it (binary search). */
export function frameIndexAt(points: readonly Pick<TracePoint, "t">[], mediaTimeMs: number): number {
  let low = 0;
  let high = points.length - 1;
  if (high < 0) return -1;
  // A presented frame's media time can read a hair before its nominal start; 1 ms is far under a frame's length.
  const at = mediaTimeMs + 1;
  if (at < points[0].t) return 0;
  while (low < high) {
    const mid = Math.ceil((low + high) / 2);
    if (points[mid].t <= at) low = mid;
    else high = mid - 1;
  }
  return low;
}
