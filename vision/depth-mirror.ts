import type { Side } from "@/lib/motions/catalog";
import { handAxes, readMotion, type HandAxes } from "./angles";
import type { HandLandmarks } from "./landmarks";
import { add, dot, normalize, scale, type Vec3 } from "./vec";

/**
 * Depth mirror ambiguity of one camera. A hand seen edge-on (the little-finger side view Kinarc asks for in finger
 * flexion) looks almost the same in the picture when it is mirrored front to back, and the landmark model sometimes
 * answers with the mirrored hand: the index and little MCPs swap in depth, the palm normal flips, and every finger
 * angle changes sign, so four fingers bent 75 degrees at the MCP read as 75 degrees of hyperextension. Measured on
 * held-out clips (scripts/accuracy/clip-report.md): in one clip of ten the tracker held the mirrored hand for most
 * of the motion, and reading it as seen put that clip's MCP error at 24 degrees.
 *
 * Which of the two answers is the hand is decided by anatomy, never by a single frame's landmarks alone:
 * - Decisive frames: the four fingers together read more than `DECISIVE_MCP_DEG` of hyperextension at the MCP (the
 *   AAOS normal is 45: clinical-references.md; clawing from an ulnar nerve lesion shows less) or more than
 *   `DECISIVE_PIP_DEG` at the PIP (beyond the swan-neck deformities of rheumatoid hands [from memory: rarely over
 *   40]). The other answer reads the same amount of flexion, which a hand can do, so that answer is taken.
 * - In between (near straight fingers, where the sign is a few degrees either way, or part-way through a motion) the
 *   palm's direction in the decisive frames before it is the reference: a real hand cannot turn its palm through more
 *   than a right angle between two camera frames. Without a decisive frame yet, the frame is read as seen.
 * The mirror leaves the picture as it was, so the reference holds only while the picture does not jump (landmarks
 * moving less than `MAX_PICTURE_JUMP` hand lengths on average since the frame before): a jump is a real turn, a cut
 * in a clip or another hand, and the reference is dropped, as it is after a gap in tracking.
 */
export interface DepthMirrorCheck {
  hand: HandLandmarks;
  axes: HandAxes;
  /** Whether this frame was read mirrored in depth. */
  mirrored: boolean;
}

/** Mean MCP hyperextension of the four fingers beyond which a hand is taken to be the mirror image. */
export const DECISIVE_MCP_DEG = 50;
/** Mean PIP hyperextension of the four fingers beyond which a hand is taken to be the mirror image. */
export const DECISIVE_PIP_DEG = 45;
/** How far the reference follows each decisive frame's palm normal. */
const REFERENCE_WEIGHT = 0.2;
/**
 * Mean movement across the picture between two frames, in hand lengths (wrist to middle MCP), beyond which the picture
 * itself changed. A hand moving a joint at a test's pace shifts its landmarks a few hundredths of a hand length a frame
 * at 30 fps [our estimate]; a cut from a palm view to a back view moves the thumb side across the hand (about one).
 */
export const MAX_PICTURE_JUMP = 0.35;

const FINGER_DIGITS = ["index", "middle", "ring", "little"] as const;

/** Every landmark reflected through the plane z = wrist z (camera depth). Angles do not depend on the plane chosen. */
export function mirrorInDepth(hand: HandLandmarks): HandLandmarks {
  const wristZ = hand[0][2];
  return hand.map(([x, y, z]) => [x, y, 2 * wristZ - z] as Vec3);
}

/** Mean flexion of the four fingers at one joint as the landmarks stand (negative = hyperextension); null if unreadable. */
function meanFlexionDeg(hand: HandLandmarks, axes: HandAxes, motion: "mcp.flexion" | "pip.flexion"): number | null {
  let sum = 0;
  for (const digit of FINGER_DIGITS) {
    const reading = readMotion(motion, digit, hand, axes, null);
    if (!reading || !Number.isFinite(reading.deg)) return null;
    sum += reading.deg;
  }
  return sum / FINGER_DIGITS.length;
}

/** Mean flexion of the four fingers at the MCP and PIP as the landmarks stand. */
interface FingerBend {
  mcpDeg: number | null;
  pipDeg: number | null;
}

function fingerBend(hand: HandLandmarks, axes: HandAxes): FingerBend {
  return { mcpDeg: meanFlexionDeg(hand, axes, "mcp.flexion"), pipDeg: meanFlexionDeg(hand, axes, "pip.flexion") };
}

function bentBackBeyondAnyHand({ mcpDeg, pipDeg }: FingerBend, sign: 1 | -1): boolean {
  return (mcpDeg !== null && sign * mcpDeg < -DECISIVE_MCP_DEG) || (pipDeg !== null && sign * pipDeg < -DECISIVE_PIP_DEG);
}

/** Whether the landmarks, as they stand, show a hand bent backwards beyond what a hand does: the mirror is the hand. */
export function anatomicallyMirrored(hand: HandLandmarks, axes: HandAxes): boolean {
  return bentBackBeyondAnyHand(fingerBend(hand, axes), 1);
}

/**
 * The palm normal of the hand mirrored in depth. Reflecting the landmarks (z -> -z) reflects the radial and long axes,
 * and their cross product comes out reflected and reversed: (x, y, z) -> (-x, -y, z). The same reversal turns every
 * finger's flexion axis, so each finger angle of the mirrored hand is exactly the negative of the seen one; the
 * mirrored hand is therefore built only for frames that are read mirrored.
 */
function mirroredPalmNormal([x, y, z]: Vec3): Vec3 {
  return [-x, -y, z];
}

function pictureJump(before: HandLandmarks, after: HandLandmarks): number {
  const [wx, wy, wz] = before[0];
  const [mx, my, mz] = before[9];
  const handLength = Math.hypot(mx - wx, my - wy, mz - wz);
  if (!(handLength > 0)) return Number.POSITIVE_INFINITY;
  let sum = 0;
  for (let i = 0; i < before.length; i++) sum += Math.hypot(after[i][0] - before[i][0], after[i][1] - before[i][1]);
  return sum / before.length / handLength;
}

export class PalmContinuity {
  private reference: Vec3 | null = null;
  private previousSeen: HandLandmarks | null = null;
  mirroredFrames = 0;

  constructor(private readonly side: Side) {}

  /** Forget the reference (after a gap in tracking, when the hand may really have turned). */
  reset(): void {
    this.reference = null;
    this.previousSeen = null;
  }

  /** The frame as it should be read. */
  check(hand: HandLandmarks, axes: HandAxes): DepthMirrorCheck {
    if (this.previousSeen && pictureJump(this.previousSeen, hand) > MAX_PICTURE_JUMP) this.reference = null;
    this.previousSeen = hand;
    const bend = fingerBend(hand, axes);
    const mirroredNormal = mirroredPalmNormal(axes.palmarNormal);
    let mirror = false;
    if (bentBackBeyondAnyHand(bend, 1)) {
      mirror = true;
      this.follow(mirroredNormal);
    } else if (bentBackBeyondAnyHand(bend, -1)) {
      this.follow(axes.palmarNormal);
    } else if (this.reference && dot(axes.palmarNormal, this.reference) < 0 && dot(mirroredNormal, this.reference) > 0) {
      mirror = true;
    }
    if (!mirror) return { hand, axes, mirrored: false };
    const mirroredHand = mirrorInDepth(hand);
    const mirroredAxes = handAxes(mirroredHand, this.side);
    if (!mirroredAxes) return { hand, axes, mirrored: false };
    this.mirroredFrames += 1;
    return { hand: mirroredHand, axes: mirroredAxes, mirrored: true };
  }

  private follow(palmarNormal: Vec3): void {
    this.reference = this.reference
      ? (normalize(add(scale(this.reference, 1 - REFERENCE_WEIGHT), scale(palmarNormal, REFERENCE_WEIGHT))) ?? palmarNormal)
      : palmarNormal;
  }
}
