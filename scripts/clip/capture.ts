/** The CLI's words around the shared clip capture builder (vision/live/clip-capture.ts): refusals exit 2. */
import type { CaptureFile } from "@/lib/capture/schema";
import type { CaptureTarget } from "@/lib/tracking/capture-recorder";
import type { Side } from "@/lib/motions/catalog";
import { ClipCaptureError, captureFromClipFrames, otherHandSeen } from "@/vision/live/clip-capture";
import type { TrackedFrame } from "@/vision/live/types";
import { ClipInputError } from "./options";

export function captureFromFrames(target: CaptureTarget, frames: readonly TrackedFrame[], clipLabel: string): CaptureFile {
  try {
    return captureFromClipFrames(target, frames, clipLabel);
  } catch (error) {
    if (error instanceof ClipCaptureError) throw new ClipInputError(error.message);
    throw error;
  }
}

/** A note when the tracker saw the other hand in most frames with a hand; null when the sides agree. */
export function handednessNote(frames: readonly Pick<TrackedFrame, "handedness">[], side: Side): string | null {
  const other = otherHandSeen(frames, side);
  return other ? `the tracker saw a ${other.seen} hand in ${other.frames} of ${other.framesWithHand} frames with a hand, but --side is ${side}` : null;
}
