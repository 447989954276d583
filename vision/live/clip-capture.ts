/**
 * Tracked frames of a clip into a capture file (format v1), for the CLI (scripts/clip) and the app (uploads) alike,
 * through the same recorder live attempts use. Pure: runs in the browser and in Node.
 */
import type { CaptureFile } from "@/lib/capture/schema";
import { withNeutralFrames } from "@/lib/tracking/neutral-frames";
import { CaptureRecorder, type CaptureTarget } from "@/lib/tracking/capture-recorder";
import { MOTIONS, type Side } from "@/lib/motions/catalog";
import { NEUTRAL_LIMITS, neutralReading, type NeutralFrame, type NeutralReading } from "@/vision/wrist-axis";
import type { TrackedFrame } from "./types";

/** A clip that gives no capture: no frames, or no hand in any frame. Message starts with "CLIP: ". */
export class ClipCaptureError extends Error {
  override name = "ClipCaptureError";
}

export const CLIP_NEUTRAL = {
  /** The upload form asks for this long a still, straight wrist at the start, as the live reading holds (NEUTRAL_HOLD_MS). */
  holdMs: 3000,
  /**
   * The still stretch must begin within this of the clip's first frame: a client needs a moment to settle after
   * pressing record, but a still moment later in the clip may be a held end position, not a straight wrist.
   */
  searchMs: 5000,
} as const;

/** The straight-wrist reading found at a clip's start, with the frames it came from (times from 0), or why not. */
export type ClipNeutral =
  | { ok: true; reading: NeutralReading; frames: NeutralFrame[]; startMs: number }
  | { ok: false; problem: string };

/**
 * The first still stretch at the start of a clip that makes a valid straight-wrist reading (vision/wrist-axis.ts
 * `neutralReading`, the same rule as the live reading and the server): each frame with a tracked hand in the first
 * `searchMs` is tried as the start of a `holdMs` window, earliest first.
 */
export function clipStartNeutral(frames: readonly Pick<TrackedFrame, "t" | "score" | "hand">[], side: Side, limits: Partial<typeof CLIP_NEUTRAL> = {}): ClipNeutral {
  const { holdMs, searchMs } = { ...CLIP_NEUTRAL, ...limits };
  if (frames.length === 0) return { ok: false, problem: "the clip has no frames." };
  const firstT = frames[0].t;
  let firstProblem: string | null = null;
  for (let i = 0; i < frames.length && frames[i].t - firstT <= searchMs; i++) {
    const start = frames[i];
    if (!start.hand || !(start.score >= NEUTRAL_LIMITS.minScore)) continue;
    const window: NeutralFrame[] = [];
    for (let j = i; j < frames.length && frames[j].t - start.t <= holdMs; j++) window.push({ t: frames[j].t - start.t, score: frames[j].score, hand: frames[j].hand });
    const outcome = neutralReading(window, side);
    if (outcome.ok) return { ok: true, reading: outcome.reading, frames: window, startMs: start.t - firstT };
    firstProblem ??= outcome.problem;
  }
  return {
    ok: false,
    problem: `the first ${(searchMs / 1000).toFixed(0)} seconds of the clip did not show a still, straight wrist: ${firstProblem ?? "no hand was tracked."}`,
  };
}

/**
 * Every tracked frame, hand or not, in order, with the picture landmarks kept so the clip can be reviewed with the
 * hand drawn over it, plus, for wrist motions, the straight-wrist reading from the clip's start in `neutral.frames`
 * (the server takes it again from them). `neutral` is null for finger motions. `clipLabel` names the clip in refusals.
 */
export function clipCapture(target: CaptureTarget, frames: readonly TrackedFrame[], clipLabel: string): { capture: CaptureFile; neutral: ClipNeutral | null } {
  const recorder = new CaptureRecorder(target, { keepImage: true });
  for (const frame of frames) recorder.push(frame);
  const capture = recorder.finish();
  if (!capture) throw new ClipCaptureError(`CLIP: ${clipLabel} has no frames the tracker could read`);
  if (!capture.frames.some((f) => f.hand)) throw new ClipCaptureError(`CLIP: no hand in view in any of the ${capture.frames.length} frames of ${clipLabel}`);
  if (MOTIONS[target.motion].joint !== "wrist") return { capture, neutral: null };
  // The still start stays in the attempt's frames too: the review lines frames up with the clip's own times.
  const neutral = clipStartNeutral(frames, target.side);
  return { capture: neutral.ok ? withNeutralFrames(capture, neutral.frames) : capture, neutral };
}

/** The capture alone (see clipCapture). */
export function captureFromClipFrames(target: CaptureTarget, frames: readonly TrackedFrame[], clipLabel: string): CaptureFile {
  return clipCapture(target, frames, clipLabel).capture;
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

/**
 * The capture with a second model's tracking of the same clip kept as `fullModel` (vision/model-pair.ts), when that
 * model found the hand somewhere and its frames are the capture's frames at the same times; else the capture as it was.
 */
export function withFullModelFrames(capture: CaptureFile, target: CaptureTarget, fullFrames: readonly TrackedFrame[], clipLabel: string): CaptureFile {
  let frames: CaptureFile["frames"];
  try {
    frames = clipCapture(target, fullFrames, clipLabel).capture.frames;
  } catch (error) {
    if (error instanceof ClipCaptureError) return capture;
    throw error;
  }
  if (frames.length !== capture.frames.length || frames.some((f, i) => f.t !== capture.frames[i].t)) return capture;
  return { ...capture, fullModel: { frames } };
}
