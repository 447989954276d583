/**
 * Tracked frames of a clip into a capture file (format v1), for the CLI (scripts/clip) and the app (uploads) alike,
 * through the same recorder live attempts use. Pure: runs in the browser and in Node.
 */
import type { CaptureFile } from "@/lib/capture/schema";
import { CaptureRecorder, type CaptureTarget } from "@/lib/tracking/capture-recorder";
import type { Side } from "@/lib/motions/catalog";
import type { TrackedFrame } from "./types";

/** A clip that gives no capture: no frames, or no hand in any frame. Message starts with "CLIP: ". */
export class ClipCaptureError extends Error {
  override name = "ClipCaptureError";
}

/**
 * Every tracked frame, hand or not, in order, with the picture landmarks kept so the clip can be reviewed with the
 * hand drawn over it. `clipLabel` names the clip in refusals (a file name, or "the clip").
 */
export function captureFromClipFrames(target: CaptureTarget, frames: readonly TrackedFrame[], clipLabel: string): CaptureFile {
  const recorder = new CaptureRecorder(target, null, true);
  for (const frame of frames) recorder.push(frame);
  const capture = recorder.finish();
  if (!capture) throw new ClipCaptureError(`CLIP: ${clipLabel} has no frames the tracker could read`);
  if (!capture.frames.some((f) => f.hand)) throw new ClipCaptureError(`CLIP: no hand in view in any of the ${capture.frames.length} frames of ${clipLabel}`);
  return capture;
}

/**
 * The other hand than `side` in most frames with a hand: a wrong side flips the sign of some motions, and the analysis
 * trusts the side it is given. Null when the sides agree (or no frame names a hand).
 */
export function otherHandSeen(frames: readonly Pick<TrackedFrame, "handedness">[], side: Side): { seen: Side; frames: number; framesWithHand: number } | null {
  const named = frames.filter((f) => f.handedness !== null);
  const other = named.filter((f) => f.handedness !== side).length;
  if (named.length === 0 || other * 2 <= named.length) return null;
  return { seen: side === "left" ? "right" : "left", frames: other, framesWithHand: named.length };
}
