import { describe, expect, it } from "vitest";
import { MOTIONS, MOTION_IDS, SIDES, type Digit, type MotionId } from "@/lib/motions/catalog";
import { handAxes, readMotion } from "./angles";
import { neutralPose, poseHand, randomPlacement, SeededRandom, withMotionAngle, type HandPose } from "./testing/synthetic-hand";

// The synthetic hand (testing/synthetic-hand.ts) is posed at angles we choose; reading them back checks the
// measurement against the definitions of the joint angles, not against itself: the model builds positions by
// rotating bones, the reader recovers angles from positions alone.

function digitsOf(motion: MotionId): (Digit | null)[] {
  const def = MOTIONS[motion];
  return def.joint === "wrist" ? [null] : [...def.digits];
}

/** Angles each motion is checked at; within a normal range and past zero where the joint can go there. */
const TEST_ANGLES: Record<MotionId, number[]> = {
  "wrist.flexion": [-30, 0, 25, 60, 80],
  "wrist.extension": [-20, 10, 45, 70],
  "wrist.radial_deviation": [-10, 5, 20],
  "wrist.ulnar_deviation": [-5, 15, 30],
  "mcp.flexion": [-20, 0, 30, 60, 90],
  "mcp.extension": [-40, 10, 30, 45],
  "pip.flexion": [-5, 20, 60, 100],
  "dip.flexion": [-5, 15, 50, 80],
  "ip.flexion": [-10, 20, 50, 80],
  "ip.extension": [-90, -45, -10, 5],
  "finger.abduction": [-5, 5, 12, 20],
  "finger.adduction": [-20, -10, 0, 5],
};

/** A busy base pose, so a reading must not pick up the other joints. */
function busyBase(): HandPose {
  const pose = neutralPose();
  pose.wristFlexionDeg = 12;
  pose.wristRadialDeviationDeg = -6;
  for (const d of ["index", "middle", "ring", "little"] as const) {
    pose.fingers[d] = { mcpFlexionDeg: 15, radialAbductionDeg: 0, pipFlexionDeg: 20, dipFlexionDeg: 10 };
  }
  pose.thumb = { mcpFlexionDeg: 10, ipFlexionDeg: 15 };
  return pose;
}

describe("readMotion on the synthetic hand", () => {
  const random = new SeededRandom(7);
  const placements = Array.from({ length: 12 }, () => randomPlacement(random));

  for (const motion of MOTION_IDS) {
    it(`${motion}: reads back the set angle, both hands, 12 camera orientations`, () => {
      let checked = 0;
      for (const side of SIDES) {
        for (const digit of digitsOf(motion)) {
          for (const placement of placements) {
            for (const deg of TEST_ANGLES[motion]) {
              const posed = poseHand(withMotionAngle(busyBase(), motion, digit, deg), side, placement);
              const axes = handAxes(posed.landmarks, side)!;
              const reading = readMotion(motion, digit, posed.landmarks, axes, posed.forearm);
              expect(reading, `${motion} ${side} ${digit}`).not.toBeNull();
              // Exact geometry, so only floating-point error is allowed. The middle finger abducts either way, so
              // its abduction reads as a size without direction.
              const expected = motion === "finger.abduction" && digit === "middle" ? Math.abs(deg) : deg;
              expect(reading!.deg).toBeCloseTo(expected, 6);
              checked++;
            }
          }
        }
      }
      expect(checked).toBeGreaterThan(0);
    });
  }

  it("a hand posed as the other side reads with flipped signs (the side is taken from the test, not guessed)", () => {
    const placement = placements[0];
    const posed = poseHand(withMotionAngle(neutralPose(), "pip.flexion", "index", 60), "right", placement);
    const asLeft = readMotion("pip.flexion", "index", posed.landmarks, handAxes(posed.landmarks, "left")!, null);
    expect(asLeft!.deg).toBeCloseTo(-60, 6);
  });

  it("image-plane angle equals the 3-D angle when the joint moves in the image plane, and is smaller when foreshortened", () => {
    // Forearm pointing right, radial axis straight at the camera: finger flexion happens in the x-y plane.
    const flat = { forearmDistal: [1, 0, 0] as const, forearmRadial: [0, 0, -1] as const, wrist: [0, 0, 0.5] as const };
    const posed = poseHand(withMotionAngle(neutralPose(), "pip.flexion", "middle", 70), "right", flat);
    const reading = readMotion("pip.flexion", "middle", posed.landmarks, handAxes(posed.landmarks, "right")!, null)!;
    expect(reading.imagePlaneDeg).toBeCloseTo(70, 6);
    // Tilt the radial axis 50 degrees out of the viewing direction: the projected angle differs from the true one.
    const tilted = { ...flat, forearmRadial: [0, Math.sin((50 * Math.PI) / 180), -Math.cos((50 * Math.PI) / 180)] as const };
    const posedTilted = poseHand(withMotionAngle(neutralPose(), "pip.flexion", "middle", 70), "right", tilted);
    const r2 = readMotion("pip.flexion", "middle", posedTilted.landmarks, handAxes(posedTilted.landmarks, "right")!, null)!;
    expect(r2.deg).toBeCloseTo(70, 6);
    // The proximal phalanx lies along x (in the image plane); the middle phalanx leaves it at 70 deg in a plane tilted
    // 50 deg from the image plane, so its projection is (cos 70, sin 70 cos 50): worked by hand, 60.6 deg.
    const expected = (Math.atan2(Math.sin((70 * Math.PI) / 180) * Math.cos((50 * Math.PI) / 180), Math.cos((70 * Math.PI) / 180)) * 180) / Math.PI;
    expect(r2.imagePlaneDeg).toBeCloseTo(expected, 6);
  });

  it("wrist motions need a forearm direction", () => {
    const posed = poseHand(neutralPose(), "left", placements[1]);
    expect(readMotion("wrist.flexion", null, posed.landmarks, handAxes(posed.landmarks, "left")!, null)).toBeNull();
  });

  it("collapsed landmarks give no hand axes instead of a made-up angle", () => {
    const collapsed = Array.from({ length: 21 }, () => [0.1, 0.1, 0.5] as const);
    expect(handAxes(collapsed, "right")).toBeNull();
  });
});
