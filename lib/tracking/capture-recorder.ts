/**
 * Collects tracked frames between start and stop into a capture file (format v1, lib/capture/schema.ts). Pure.
 * Frame times restart at 0; the tracker's landmarks are already in the unmirrored camera axes the format asks for.
 */
import { CAPTURE_FORMAT, CAPTURE_VERSION, IMAGE_ASPECT_RANGE, type CaptureFile, type CaptureFrame } from "@/lib/capture/schema";
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

export class CaptureRecorder {
  private readonly frames: CaptureFrame[] = [];
  private startMs: number | null = null;
  private imageAspect: number | null = null;
  private readonly keepsImage: boolean;

  constructor(
    readonly target: CaptureTarget,
    /** Gravity in camera axes at the start, from the motion sensor; omitted when there is none. */
    private readonly gravity: Vec3 | null = null,
    /**
     * Keep the picture landmarks too (a stored clip is reviewed with the hand drawn over it); off for live attempts,
     * except where the engine reads them (the finger estimator, vision/correction.ts readsPicturePoints), so the
     * server can too.
     */
    keepImage = false,
  ) {
    this.keepsImage = keepImage || readsPicturePoints(CORRECTION_MODEL, target.motion, target.digit);
  }

  push(frame: Pick<TrackedFrame, "t" | "score" | "hand" | "forearm"> & Partial<Pick<TrackedFrame, "image" | "imageAspect">>): void {
    const aspect = frame.imageAspect;
    if (this.imageAspect === null && aspect !== undefined && aspect > IMAGE_ASPECT_RANGE[0] && aspect < IMAGE_ASPECT_RANGE[1]) {
      this.imageAspect = aspect;
    }
    this.startMs ??= frame.t;
    const last = this.frames[this.frames.length - 1];
    // Times must not run backwards in the file; a camera clock that stutters is held at the last time.
    const t = Math.max(last?.t ?? 0, frame.t - this.startMs);
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
    this.frames.push(out);
  }

  get frameCount(): number {
    return this.frames.length;
  }

  get durationMs(): number {
    return this.frames.length ? this.frames[this.frames.length - 1].t : 0;
  }

  /** The capture file, or null when no frame was recorded. */
  finish(): CaptureFile | null {
    if (this.frames.length === 0) return null;
    const { oneFinger, ...target } = this.target;
    const capture: CaptureFile = { format: CAPTURE_FORMAT, version: CAPTURE_VERSION, ...target, ...(oneFinger ? { oneFinger: true } : {}), frames: [...this.frames] };
    if (this.gravity && this.gravity.every(Number.isFinite) && Math.hypot(...this.gravity) > 1e-9) capture.gravity = [this.gravity[0], this.gravity[1], this.gravity[2]];
    if (this.keepsImage && this.imageAspect !== null) capture.imageAspect = this.imageAspect;
    return capture;
  }
}

/** A capture id for the outbox and the server's idempotency: random, URL- and log-safe. */
export function newCaptureUid(): string {
  return crypto.randomUUID().replace(/-/g, "");
}
