/**
 * Puts a neutral reading's frames into a capture file (lib/capture/schema.ts `neutral`), so the server takes the
 * same reading the browser did (vision/analyze-capture.ts). Pure.
 */
import type { CaptureFile, CaptureFrame } from "@/lib/capture/schema";
import type { NeutralFrame } from "@/vision/wrist-axis";

function fileFrame(frame: NeutralFrame): CaptureFrame {
  // As the recorder does: a broken landmark becomes "no hand", so one NaN cannot make the whole file unreadable.
  const hand =
    frame.hand && frame.hand.length === 21 && frame.hand.every((p) => p.length === 3 && p.every(Number.isFinite))
      ? frame.hand.map((p) => [p[0], p[1], p[2]] as [number, number, number])
      : null;
  return { t: Math.max(0, Number.isFinite(frame.t) ? frame.t : 0), score: Number.isFinite(frame.score) ? Math.min(1, Math.max(0, frame.score)) : 0, hand };
}

/** The capture with `neutral.frames` set from the reading's frames; unchanged when there are none. */
export function withNeutralFrames(capture: CaptureFile, frames: readonly NeutralFrame[]): CaptureFile {
  if (frames.length === 0) return capture;
  const out: CaptureFrame[] = [];
  for (const frame of frames) {
    const f = fileFrame(frame);
    // Times must not run backwards in the file, as for the attempt's own frames.
    out.push({ ...f, t: Math.max(f.t, out[out.length - 1]?.t ?? 0) });
  }
  return { ...capture, neutral: { frames: out } };
}
