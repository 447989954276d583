/**
 * What an uploaded clip is measured as, shared by the browsers that analyze it and the server that stores the result.
 * Pure (no server imports), so the client bundle can use it.
 */
import { CONDITIONS, DIGITS, MOTIONS, SIDES, digitAllowed, isMotionId, type Condition, type Digit, type MotionId, type Side } from "@/lib/motions/catalog";

/**
 * The capture id every analysis of one uploaded clip is sent under, whoever's browser runs it (the client's right
 * after the upload, or the therapist's later): the server stores a capture id once, so one clip is never two attempts.
 */
export function clipCaptureUid(uploadUid: string): string {
  return `clip-${uploadUid}`;
}

export interface ClipTarget {
  motion: MotionId;
  side: Side;
  digit: Digit | null;
  condition: Condition;
}

export class ClipTargetError extends Error {
  constructor(
    readonly field: "motion" | "side" | "digit" | "condition",
    message: string,
  ) {
    super(`${field}: ${message}`);
  }
}

/**
 * The analysis target from what was sent with the clip plus the condition chosen by whoever runs the analysis (the
 * client says how the arm rested; the plane check then verifies it). Throws naming the field that is missing or wrong.
 */
export function clipTarget(clip: { motion: string | null; side: string | null; digit: string | null }, condition: string): ClipTarget {
  if (!clip.motion || !isMotionId(clip.motion)) throw new ClipTargetError("motion", "expected a motion from Kinarc's catalogue");
  if (!clip.side || !(SIDES as readonly string[]).includes(clip.side)) throw new ClipTargetError("side", 'expected "left" or "right"');
  const digit = clip.digit && (DIGITS as readonly string[]).includes(clip.digit) ? (clip.digit as Digit) : null;
  if (!digitAllowed(clip.motion, digit)) {
    const def = MOTIONS[clip.motion];
    throw new ClipTargetError("digit", def.joint === "wrist" ? `expected none for ${clip.motion}` : `expected one of ${def.digits.join(", ")} for ${clip.motion}`);
  }
  if (!(CONDITIONS as readonly string[]).includes(condition)) throw new ClipTargetError("condition", 'expected "against_gravity" or "gravity_minimized"');
  return { motion: clip.motion, side: clip.side as Side, digit, condition: condition as Condition };
}

/** Words for the outbox and the review, e.g. "PIP flexion, right index (clip)". */
export function clipLabel(target: Pick<ClipTarget, "motion" | "side" | "digit">): string {
  return `${MOTIONS[target.motion].label}, ${target.side}${target.digit ? ` ${target.digit}` : ""} (clip)`;
}
