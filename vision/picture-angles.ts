import type { Condition, Digit, MotionId } from "@/lib/motions/catalog";
import type { MotionReading } from "./angles";
import { DIGIT_CHAIN, LANDMARK_COUNT, WRIST, type HandLandmarks } from "./landmarks";
import { pictureTurnDeg, sideOnNeutral } from "./wrist-axis";

/**
 * Angles read in the picture, where the landmark model's 3-D hand is least sure of itself.
 *
 * With gravity minimized, finger flexion is tested with the hand resting on its little-finger edge and the camera
 * above: the hand is seen side-on from the thumb side, the fingers' bending plane lies in the picture, and the hand's
 * width (along which the 3-D hand frame is built) lies along the depth. There, the turn of the proximal phalanx from
 * the metacarpal line measured in the picture read MCP flexion twice as truly as the corrected 3-D angle on training
 * clips (seed 77000401, lite, 40 readings: MAE 6.7 against 13.3 degrees, slope 0.91 against 0.68). The same picture
 * angle measured in the world landmarks' x and y instead read 14.5 (the model bends the world fingers), so the
 * picture's own points are used, scaled by its aspect. Against gravity (the little-finger side) the corrected 3-D angle
 * was as good or better (3.9 against 4.7), and PIP and DIP read worse in the picture (training: 12.3 and 22.4 against
 * 10.9 and 15.5), so only MCP flexion with gravity minimized is read this way. Kinarc's rule from those figures.
 */

/** Whether the engine reads this motion in the picture when the hand is seen side-on (and the capture keeps picture points). */
export function readsInPicture(motion: MotionId, condition: Condition): boolean {
  return motion === "mcp.flexion" && condition === "gravity_minimized";
}

/**
 * MCP flexion of one finger in the picture: the turn from the wrist-to-knuckle line to the knuckle-to-PIP line, toward
 * the palm positive (the palm's side from where the thumb sits, as for the wrist: vision/wrist-axis.ts sideOnNeutral).
 * Null when the hand is not side-on in this frame, the digit is the thumb, or a point is missing.
 */
export function pictureMcpFlexion(hand: HandLandmarks, image: readonly (readonly number[])[], imageAspect: number, digit: Digit): MotionReading | null {
  if (digit === "thumb" || image.length !== LANDMARK_COUNT || !(imageAspect > 0)) return null;
  const sideOn = sideOnNeutral([hand]);
  if (!sideOn) return null;
  const [mcp, pip] = DIGIT_CHAIN[digit];
  const at = (i: number): [number, number] => [image[i][0] * imageAspect, image[i][1]];
  const [w, m, p] = [at(WRIST), at(mcp), at(pip)];
  const a = [m[0] - w[0], m[1] - w[1]];
  const b = [p[0] - m[0], p[1] - m[1]];
  const lengthB = Math.hypot(b[0], b[1]);
  if (!(Math.hypot(a[0], a[1]) > 1e-9 && lengthB > 1e-9) || ![...a, ...b].every(Number.isFinite)) return null;
  const turn = sideOn.palmarTurn;
  const deg = turn * pictureTurnDeg(a, b);
  return { deg, imagePlaneDeg: deg, axis: [0, 0, turn], travel: [(-b[1] / lengthB) * turn, (b[0] / lengthB) * turn, 0] };
}
