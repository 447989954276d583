/** Tracked frames of a clip into a capture file (format v1) through the same recorder the browser uses. */
import type { CaptureFile } from "@/lib/capture/schema";
import { CaptureRecorder, type CaptureTarget } from "@/lib/tracking/capture-recorder";
import type { Side } from "@/lib/motions/catalog";
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

/**
 * A note when the tracker saw the other hand in most frames with a hand: a wrong --side flips the sign of some
 * motions, and the analysis trusts the side it is given. Null when the sides agree (or no frame names a hand).
 */
export function handednessNote(frames: readonly Pick<TrackedFrame, "handedness">[], side: Side): string | null {
  const named = frames.filter((f) => f.handedness !== null);
  const other = named.filter((f) => f.handedness !== side).length;
  if (named.length === 0 || other * 2 <= named.length) return null;
  return `the tracker saw a ${side === "left" ? "right" : "left"} hand in ${other} of ${named.length} frames with a hand, but --side is ${side}`;
}
