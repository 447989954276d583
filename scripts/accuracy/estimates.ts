import type { Digit, MotionId, Side } from "@/lib/motions/catalog";
import { handAxes, readMotion } from "@/vision/angles";
import type { FingerPicture } from "@/vision/estimator";
import type { Vec3 } from "@/vision/vec";
import type { PoseKey } from "./hand-pose";

/**
 * Which of the measurement engine's motions reads each degree of freedom of the pose model, both positive the same
 * way. Thumb CMC has no motion in the catalog yet and so no row.
 */
export const ENGINE_MOTION_FOR: Partial<Record<PoseKey, { motion: MotionId; digit: Digit }>> = {
  "wrist.flexionDeg": { motion: "wrist.flexion", digit: "middle" },
  "wrist.radialDeviationDeg": { motion: "wrist.radial_deviation", digit: "middle" },
  "thumb.mcpFlexionDeg": { motion: "mcp.flexion", digit: "thumb" },
  "thumb.ipFlexionDeg": { motion: "ip.flexion", digit: "thumb" },
  ...Object.fromEntries(
    (["index", "middle", "ring", "little"] as const).flatMap((finger) => [
      [`${finger}.mcpFlexionDeg`, { motion: "mcp.flexion", digit: finger }],
      [`${finger}.pipFlexionDeg`, { motion: "pip.flexion", digit: finger }],
      [`${finger}.dipFlexionDeg`, { motion: "dip.flexion", digit: finger }],
      // The engine reads the middle finger's spread as whichever way it went; the pose model calls thumb-ward positive.
      ...(finger === "middle" ? [] : [[`${finger}.mcpAbductionDeg`, { motion: "finger.abduction", digit: finger }]]),
    ]),
  ),
};

export const ESTIMATED_KEYS = Object.keys(ENGINE_MOTION_FOR) as PoseKey[];

export interface AngleEstimate {
  /** From the 3-D (world) landmarks. */
  deg: number;
  /** The same angle as seen in the image plane. */
  imagePlaneDeg: number;
  /**
   * |cos| of the angle between the joint's axis and the camera's line of sight: 1 when the motion's plane lies in
   * the image (the angle is all in view), 0 when it is edge-on (the angle is all in depth).
   */
  planeFacing: number;
  /** cos of the angle between the hand's radial axis and the direction to the camera: +1 thumb side toward it. */
  radialTowardCamera: number;
  /** cos of the angle between the palm's normal and the direction to the camera: +1 palm toward it. */
  palmTowardCamera: number;
  /** The landmarks and side the reading came from: the finger estimator reads the whole finger. */
  hand?: readonly Vec3[];
  side?: Side;
  /** The picture points of the same frame: the finger estimator reads them too (kinarc-correction-6). */
  picture?: FingerPicture | null;
}

/**
 * Every estimable angle of one frame through the measurement engine (`vision/angles`), from 21 landmarks in metres,
 * camera axes. Wrist angles need the forearm's direction (elbow to wrist); without it they are null.
 */
export function estimateAngles(
  hand: readonly Vec3[],
  side: Side,
  forearm: Vec3 | null,
  picture: FingerPicture | null = null,
): Partial<Record<PoseKey, AngleEstimate | null>> {
  const axes = handAxes(hand, side);
  const result: Partial<Record<PoseKey, AngleEstimate | null>> = {};
  for (const key of ESTIMATED_KEYS) {
    const { motion, digit } = ENGINE_MOTION_FOR[key]!;
    const reading = axes ? readMotion(motion, digit, hand, axes, forearm) : null;
    // Camera axes: z points away from the camera, so "toward the camera" is -z.
    result[key] =
      reading && axes
        ? {
            deg: reading.deg,
            imagePlaneDeg: reading.imagePlaneDeg,
            planeFacing: Math.abs(reading.axis[2]),
            radialTowardCamera: -axes.radialAxis[2],
            palmTowardCamera: -axes.palmarNormal[2],
            hand,
            side,
            picture,
          }
        : null;
  }
  return result;
}
