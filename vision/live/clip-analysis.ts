/**
 * A video file into a capture file in the browser: the app's tracker, stepped through every frame of the clip
 * (clip-stepper.ts), then the shared clip capture builder (clip-capture.ts). The same path `npm run -s analyze-clip`
 * takes through the tracking harness page. Browser-only.
 */
import type { CaptureFile } from "@/lib/capture/schema";
import type { CaptureTarget } from "@/lib/tracking/capture-recorder";
import { clipCapture, otherHandSeen, type ClipNeutral } from "./clip-capture";
import { loadClip, stepThroughClip, type SteppedClip } from "./clip-stepper";
import { createHandTracker } from "./tracker";
import type { ModelVariant, TrackedFrame } from "./types";

export interface ClipAnalysisOptions {
  /** The app's model; the server's correction and uncertainty assume it (vision/uncertainty.ts). Default "lite". */
  handModel?: ModelVariant;
  /** Forearm direction from the pose model, for wrist motions. */
  forearm?: boolean;
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
  const [tracker] = await Promise.all([createHandTracker({ handModel: options.handModel ?? "lite", forearm: options.forearm ?? false }), loadClip(video, src)]);
  try {
    const unsubscribe = options.onFrame ? tracker.subscribe(options.onFrame) : () => {};
    await tracker.warmUp(video);
    const stepped = await stepThroughClip(video, tracker, { onProgress: options.onProgress, signal: options.signal });
    unsubscribe();
    const { capture, neutral } = clipCapture(target, stepped.frames, "the clip");
    return { capture, neutral, stepped, otherHand: otherHandSeen(stepped.frames, target.side) };
  } finally {
    tracker.close();
  }
}
