/**
 * Collects tracked frames between start and stop into a capture file (format v1, lib/capture/schema.ts). Pure.
 * Frame times restart at 0; the tracker's landmarks are already in the unmirrored camera axes the format asks for.
 */
import { CAPTURE_FORMAT, CAPTURE_VERSION, IMAGE_ASPECT_RANGE, type CaptureFile, type CaptureFrame } from "@/lib/capture/schema";
import { fitsWithBothModels } from "@/lib/captures/upload";
import type { Condition, Digit, MotionId, Side } from "@/lib/motions/catalog";
import type { TrackedFrame } from "@/vision/live/types";
import { CORRECTION_MODEL, readsPicturePoints } from "@/vision/correction";
import type { Vec3 } from "@/vision/vec";

export interface CaptureTarget {
  motion: MotionId;
  side: Side;
  digit: Digit | null;
  condition: Condition;
  /** The tested finger bends on its own, the others held straight (written to the capture only when true). */
  oneFinger?: boolean;
}

function finitePoint(p: readonly number[]): boolean {
  return p.length === 3 && p.every(Number.isFinite);
}

/**
 * With both models: the least share of an attempt's frames the second model must have read for its frames to be kept.
 * Pairing starts a frame or two late at most (a frame already on its way when it was switched on); a capture where
 * the second model fell away (it stopped loading, the page was slowed) keeps one model's reading. Our threshold.
 */
export const MIN_PAIRED_SHARE = 0.9;

type RecordedFrame = Pick<TrackedFrame, "t" | "score" | "hand" | "forearm"> & Partial<Pick<TrackedFrame, "image" | "imageAspect" | "fullModel">>;

export interface RecorderOptions {
  /** Gravity in camera axes at the start, from the motion sensor; omitted when there is none. */
  gravity?: Vec3 | null;
  /**
   * Keep the picture landmarks too (a stored clip is reviewed with the hand drawn over it); off for live attempts,
   * except where the engine reads them (the finger estimator, vision/correction.ts readsPicturePoints), so the
   * server can too.
   */
  keepImage?: boolean;
  /**
   * Keep the full model's reading of each frame (`TrackedFrame.fullModel`) as the capture's `fullModel`, so the
   * engine reads both models together (vision/model-pair.ts). Frames the second model did not read count as frames
   * where it found no hand; see MIN_PAIRED_SHARE.
   */
  pairModel?: boolean;
  /**
   * Keep only the frames of the last this-many milliseconds (times then start at 0 from the first kept frame): for a
   * recording that runs until someone decides to keep it, as in a visit, so a long wait neither fills the device's
   * memory nor passes the upload limit.
   */
  keepLastMs?: number;
}

/**
 * The most of a visit attempt that is kept: its last minute. A minute at 30 frames a second is about 2.5 MB of JSON
 * per model (lib/captures/upload.ts), so both models' frames fit the upload limit.
 */
export const VISIT_KEEP_LAST_MS = 60_000;

export class CaptureRecorder {
  private frames: CaptureFrame[] = [];
  private startMs: number | null = null;
  private imageAspect: number | null = null;
  private readonly keepsImage: boolean;
  /** With `pairModel`: the full model's frames, one for each of `frames`, and how many it actually read. */
  private fullFrames: CaptureFrame[] | null;
  /** Per frame, whether the second model read it. */
  private paired: boolean[] = [];
  /** With `keepLastMs`: the first frame still inside the window; the ones before it are dropped in batches. */
  private head = 0;
  private readonly gravity: Vec3 | null;
  private readonly keepLastMs: number | null;

  constructor(
    readonly target: CaptureTarget,
    options: RecorderOptions = {},
  ) {
    this.gravity = options.gravity ?? null;
    this.keepsImage = (options.keepImage ?? false) || readsPicturePoints(CORRECTION_MODEL, target.motion, target.digit);
    this.fullFrames = options.pairModel ? [] : null;
    if (options.keepLastMs !== undefined && !(options.keepLastMs > 0)) throw new Error(`keepLastMs: expected a positive number of milliseconds, got ${options.keepLastMs}`);
    this.keepLastMs = options.keepLastMs ?? null;
  }

  push(frame: RecordedFrame): void {
    const aspect = frame.imageAspect;
    if (this.imageAspect === null && aspect !== undefined && aspect > IMAGE_ASPECT_RANGE[0] && aspect < IMAGE_ASPECT_RANGE[1]) {
      this.imageAspect = aspect;
    }
    this.startMs ??= frame.t;
    const last = this.frames[this.frames.length - 1];
    // Times must not run backwards in the file; a camera clock that stutters is held at the last time.
    const t = Math.max(last?.t ?? 0, frame.t - this.startMs);
    this.frames.push(this.captureFrame(t, frame));
    if (this.fullFrames) {
      this.paired.push(frame.fullModel !== undefined);
      this.fullFrames.push(this.captureFrame(t, frame.fullModel ?? { score: 0, hand: null }));
    }
    if (this.keepLastMs !== null) this.dropOlderThan(t - this.keepLastMs);
  }

  /**
   * Moves the window's start past frames before `fromMs` (each frame is passed once), and drops the frames behind it
   * in batches, so a long recording neither scans nor copies its frames on every push.
   */
  private dropOlderThan(fromMs: number): void {
    while (this.head < this.frames.length - 1 && this.frames[this.head].t < fromMs) this.head++;
    if (this.head < 256 || this.head < this.frames.length / 4) return;
    this.frames = this.frames.slice(this.head);
    if (this.fullFrames) this.fullFrames = this.fullFrames.slice(this.head);
    this.paired = this.paired.slice(this.head);
    this.head = 0;
  }

  /** The frames a capture finished now holds: from the window's start, times from 0 there. */
  private keptFrames(frames: CaptureFrame[]): CaptureFrame[] {
    // After a batch is dropped the window starts at index 0 but not at time 0.
    const base = this.frames[this.head]?.t ?? 0;
    if (base === 0) return frames.slice(this.head);
    return frames.slice(this.head).map((f) => ({ ...f, t: f.t - base }));
  }

  private captureFrame(t: number, frame: Omit<RecordedFrame, "t">): CaptureFrame {
    // A frame with a broken landmark is kept as "no hand" rather than dropped, so the frame count stays honest.
    const hand = frame.hand && frame.hand.length === 21 && frame.hand.every(finitePoint) ? frame.hand.map((p) => [p[0], p[1], p[2]] as [number, number, number]) : null;
    const score = Number.isFinite(frame.score) ? Math.min(1, Math.max(0, frame.score)) : 0;
    const out: CaptureFrame = { t, score, hand };
    if (frame.forearm && finitePoint(frame.forearm) && Math.hypot(...frame.forearm) > 1e-9) out.forearm = [frame.forearm[0], frame.forearm[1], frame.forearm[2]];
    if (this.keepsImage) {
      // 1e-5 of the picture is well under a pixel; fewer digits keep a minute of frames small.
      const image = hand && frame.image && frame.image.length === 21 && frame.image.every(finitePoint) ? frame.image : null;
      out.image = image ? image.map((p) => [Math.round(p[0] * 1e5) / 1e5, Math.round(p[1] * 1e5) / 1e5] as [number, number]) : null;
    }
    return out;
  }

  /** With `pairModel`: how many of the kept frames the second model read. */
  get pairedFrameCount(): number {
    return this.paired.slice(this.head).filter(Boolean).length;
  }

  /** Frames a capture finished now would hold (read on every frame by the live page: no copying). */
  get frameCount(): number {
    return this.frames.length - this.head;
  }

  get durationMs(): number {
    return this.frames.length ? this.frames[this.frames.length - 1].t - this.frames[this.head].t : 0;
  }

  /** The capture file, or null when no frame was recorded. */
  finish(): CaptureFile | null {
    if (this.frames.length === 0) return null;
    const { oneFinger, ...target } = this.target;
    const frames = this.keptFrames(this.frames);
    const capture: CaptureFile = { format: CAPTURE_FORMAT, version: CAPTURE_VERSION, ...target, ...(oneFinger ? { oneFinger: true } : {}), frames };
    if (this.gravity && this.gravity.every(Number.isFinite) && Math.hypot(...this.gravity) > 1e-9) capture.gravity = [this.gravity[0], this.gravity[1], this.gravity[2]];
    if (this.keepsImage && this.imageAspect !== null) capture.imageAspect = this.imageAspect;
    const full = this.fullFrames;
    const fullKept = full ? this.keptFrames(full) : null;
    if (fullKept && this.pairedFrameCount >= MIN_PAIRED_SHARE * frames.length && fullKept.some((f) => f.hand)) {
      const both: CaptureFile = { ...capture, fullModel: { frames: fullKept } };
      // A long attempt's second set of frames could push the upload past the server's limit: then one model's stands.
      if (fitsWithBothModels(both)) return both;
    }
    return capture;
  }
}

/** A capture id for the outbox and the server's idempotency: random, URL- and log-safe. */
export function newCaptureUid(): string {
  return crypto.randomUUID().replace(/-/g, "");
}
