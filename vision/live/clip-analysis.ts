/**
 * A video file into a capture file in the browser: the app's tracker, stepped through every frame of the clip
 * (clip-stepper.ts), then the shared clip capture builder (clip-capture.ts). The same path `npm run -s analyze-clip`
 * takes through the tracking harness page. Browser-only.
 */
import type { CaptureFile } from "@/lib/capture/schema";
import { fitsWithBothModels } from "@/lib/captures/upload";
import type { CaptureTarget } from "@/lib/tracking/capture-recorder";
import { clipCapture, otherHandSeen, withFullModelFrames, type ClipNeutral } from "./clip-capture";
import { loadClip, stepThroughClip, type SteppedClip } from "./clip-stepper";
import { createHandTracker, type HandTracker } from "./tracker";
import type { ModelVariant, TrackedFrame } from "./types";

export interface ClipAnalysisOptions {
  /** The app's model; the server's correction and uncertainty assume it (vision/uncertainty.ts). Default "lite". */
  handModel?: ModelVariant;
  /** Forearm direction from the pose model, for wrist motions. */
  forearm?: boolean;
  /**
   * Step the clip a second time with the full hand model and keep its frames in the capture (`fullModel`), so the
   * engine reads both models together (vision/model-pair.ts). For finger motions; wrist clips keep one model.
   */
  fullModel?: boolean;
  /** Progress over every pass: with `fullModel` the total counts the clip's frames twice. */
  onProgress?: (done: number, total: number) => void;
  /** Each frame as it is tracked, e.g. to draw the hand over the clip while it is measured. */
  onFrame?: (frame: TrackedFrame) => void;
  signal?: AbortSignal;
}

export interface ClipAnalysisResult {
  capture: CaptureFile;
  stepped: SteppedClip;
  /** Set when the tracker saw the other hand than the target's side in most frames with a hand. */
  otherHand: ReturnType<typeof otherHandSeen>;
  /** Wrist motions: the straight-wrist reading from the clip's still start (in `capture.neutral`), or why not; null otherwise. */
  neutral: ClipNeutral | null;
}

/** Analyzes the clip at `src` (an object URL of the picked file, or the stored file's URL) into a capture for `target`. */
export async function analyzeClipInBrowser(video: HTMLVideoElement, src: string, target: CaptureTarget, options: ClipAnalysisOptions = {}): Promise<ClipAnalysisResult> {
  // The second pass pairs the full model with the lite one (vision/model-pair.ts): only when the first is the lite.
  const withFull = options.fullModel === true && (options.handModel ?? "lite") === "lite";
  const passes = withFull ? 2 : 1;
  // The second model loads with the first, so a connection lost while the clip is stepped does not cost it. If it
  // cannot load at all, the first model's reading stands.
  const fullReady = withFull ? createHandTracker({ handModel: "full", forearm: false }).catch(() => null) : Promise.resolve(null);
  let full: HandTracker | null = null;
  try {
    const [tracker] = await Promise.all([createHandTracker({ handModel: options.handModel ?? "lite", forearm: options.forearm ?? false }), loadClip(video, src)]);
    let stepped: SteppedClip;
    try {
      const unsubscribe = options.onFrame ? tracker.subscribe(options.onFrame) : () => {};
      await tracker.warmUp(video);
      stepped = await stepThroughClip(video, tracker, { onProgress: (done, total) => options.onProgress?.(done, passes * total), signal: options.signal });
      unsubscribe();
    } finally {
      tracker.close();
    }
    const { capture, neutral } = clipCapture(target, stepped.frames, "the clip");
    const alone: ClipAnalysisResult = { capture, neutral, stepped, otherHand: otherHandSeen(stepped.frames, target.side) };
    full = await fullReady;
    if (!full) return alone;
    // The same frames at the same times (the first pass's frame rate), read by the other model.
    await full.warmUp(video);
    const second = await stepThroughClip(video, full, {
      fps: stepped.fps,
      onProgress: (done, total) => options.onProgress?.(total + done, 2 * total),
      signal: options.signal,
    });
    const both = withFullModelFrames(capture, target, second.frames, "the clip");
    // A long clip's second set of frames could push the upload past the server's limit: then the first model's stands.
    return both === capture || !fitsWithBothModels(both) ? alone : { ...alone, capture: both };
  } finally {
    (full ?? (await fullReady))?.close();
  }
}
