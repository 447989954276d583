/** Tracked frames of a clip into a capture file (format v1) through the same recorder the browser uses. */
import type { CaptureFile } from "@/lib/capture/schema";
import { CaptureRecorder, type CaptureTarget } from "@/lib/tracking/capture-recorder";
import type { TrackedFrame } from "@/vision/live/types";
import { ClipInputError } from "./options";

export function captureFromFrames(target: CaptureTarget, frames: readonly TrackedFrame[], clipLabel: string): CaptureFile {
  const recorder = new CaptureRecorder(target);
  for (const frame of frames) recorder.push(frame);
  const capture = recorder.finish();
  if (!capture) throw new ClipInputError(`CLIP: ${clipLabel} has no frames the tracker could read`);
  if (!capture.frames.some((f) => f.hand)) throw new ClipInputError(`CLIP: no hand in view in any of the ${capture.frames.length} frames of ${clipLabel}`);
  return capture;
}
