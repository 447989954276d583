/** The CLI's words around the shared clip capture builder (vision/live/clip-capture.ts): refusals exit 2. */
import type { CaptureFile } from "@/lib/capture/schema";
import type { CaptureTarget } from "@/lib/tracking/capture-recorder";
import type { Side } from "@/lib/motions/catalog";
import { ClipCaptureError, clipCapture, otherHandSeen } from "@/vision/live/clip-capture";
import type { TrackedFrame } from "@/vision/live/types";
import { ClipInputError } from "./options";

/**
 * The clip's capture; for wrist motions with the straight-wrist reading from the clip's still start in its neutral
 * frames. When the start is not still enough, `note` says so (on stderr by default, as the CLI's other notes) and the
 * wrist is read from the capture's start, as the app's upload does.
 */
export function captureFromFrames(
  target: CaptureTarget,
  frames: readonly TrackedFrame[],
  clipLabel: string,
  note: (text: string) => void = (text) => process.stderr.write(`analyze-clip: note: ${text}\n`),
): CaptureFile {
  try {
    const { capture, neutral } = clipCapture(target, frames, clipLabel);
    if (neutral && !neutral.ok) note(`no straight-wrist reading: ${neutral.problem} The wrist is read from how the hand started.`);
    return capture;
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
