import type { Side } from "@/lib/motions/catalog";
import { handAxes, type HandAxes } from "./angles";
import type { HandLandmarks } from "./landmarks";
import { add, dot, normalize, scale, type Vec3 } from "./vec";

/**
 * Depth mirror ambiguity of one camera. A hand seen edge-on (the little-finger side view Kinarc asks for in finger
 * flexion) looks almost the same in the picture when it is mirrored front to back, and the landmark model sometimes
 * answers with the mirrored hand: the index and little MCPs swap in depth, the palm normal flips, and a finger bent
 * 80 degrees toward the palm reads as 60 degrees of hyperextension. Measured on held-out clips (seed 20261205, four
 * fingers flexing at the MCP to 83 degrees, little-finger side, lite model): 28 of 181 frames flipped, all near the end
 * of range, each reading -30 to -67 degrees (scripts/accuracy/clip-report.md).
 *
 * A real hand cannot turn its palm through more than a right angle between two camera frames. So the palm normal of
 * the frames already accepted is the reference, and a frame whose palm faces the other way is read mirrored in depth
 * (every landmark's z reflected through the wrist), which is the other answer the picture allows. [Our reasoning from
 * the camera geometry; the figures before and after are in the clip report.] The mirror leaves the picture as it
 * was, so it is only considered when the picture did not jump since the frame before (landmarks moved less than
 * `MAX_PICTURE_JUMP` hand lengths across the image on average): a jump is a real turn, a cut in a clip or another
 * hand, and the reference starts again from that frame, as it does after a gap in tracking.
 */
export interface DepthMirrorCheck {
  hand: HandLandmarks;
  axes: HandAxes;
  /** Whether this frame was read mirrored in depth. */
  mirrored: boolean;
}

/** How far the reference follows each accepted frame's palm normal: slow enough that one odd frame cannot turn it. */
const REFERENCE_WEIGHT = 0.2;
/**
 * Mean movement across the picture between two frames, in hand lengths (wrist to middle MCP), beyond which the picture
 * itself changed. A hand moving a joint at a test's pace shifts its landmarks a few hundredths of a hand length a frame
 * at 30 fps [our estimate]; a cut from a palm view to a back view moves the thumb side across the hand (about one).
 */
export const MAX_PICTURE_JUMP = 0.35;

function pictureJump(before: HandLandmarks, after: HandLandmarks): number {
  const [wx, wy] = before[0];
  const [mx, my] = before[9];
  const handLength = Math.hypot(mx - wx, my - wy, before[9][2] - before[0][2]);
  if (!(handLength > 0)) return Number.POSITIVE_INFINITY;
  let sum = 0;
  for (let i = 0; i < before.length; i++) sum += Math.hypot(after[i][0] - before[i][0], after[i][1] - before[i][1]);
  return sum / before.length / handLength;
}

/** Every landmark reflected through the plane z = wrist z (camera depth). Angles do not depend on the plane chosen. */
export function mirrorInDepth(hand: HandLandmarks): HandLandmarks {
  const wristZ = hand[0][2];
  return hand.map(([x, y, z]) => [x, y, 2 * wristZ - z] as Vec3);
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

  /** The frame as it should be read, given the palm's direction in the frames before it. */
  check(hand: HandLandmarks, axes: HandAxes): DepthMirrorCheck {
    let result: DepthMirrorCheck = { hand, axes, mirrored: false };
    if (this.previousSeen && pictureJump(this.previousSeen, hand) > MAX_PICTURE_JUMP) this.reference = null;
    this.previousSeen = hand;
    if (this.reference && dot(axes.palmarNormal, this.reference) < 0) {
      const mirroredHand = mirrorInDepth(hand);
      const mirroredAxes = handAxes(mirroredHand, this.side);
      if (mirroredAxes && dot(mirroredAxes.palmarNormal, this.reference) > 0) {
        result = { hand: mirroredHand, axes: mirroredAxes, mirrored: true };
        this.mirroredFrames += 1;
      }
    }
    this.reference = this.reference
      ? (normalize(add(scale(this.reference, 1 - REFERENCE_WEIGHT), scale(result.axes.palmarNormal, REFERENCE_WEIGHT))) ?? result.axes.palmarNormal)
      : result.axes.palmarNormal;
    return result;
  }
}
