import { describe, expect, it } from "vitest";
import { createLivePipeline, type PipelineFrame } from "../pipeline";
import { neutralPose, poseHand, withMotionAngle } from "../testing/synthetic-hand";
import { handFrame, type PointLike } from "./landmark-results";
import type { TrackedFrame } from "./types";

// The live stream feeds the measurement engine as it is: a TrackedFrame is a PipelineFrame (checked by the compiler).
const asPipelineFrame = (frame: TrackedFrame): PipelineFrame => frame;

describe("tracking stream to measurement engine", () => {
  it("a frame built from landmarker-shaped results reads the pose it was made from", () => {
    const placement = { forearmDistal: [0, -1, 0] as const, forearmRadial: [-1, 0, 0] as const, wrist: [0, 0.05, 0.4] as const };
    const posed = poseHand(withMotionAngle(neutralPose(), "pip.flexion", "index", 60), "right", placement);
    const world: PointLike[] = posed.landmarks.map(([x, y, z]) => ({ x, y, z }));
    // Image landmarks are not used by the engine's 3-D reading; any 21 points keep the record complete.
    const image: PointLike[] = world.map(({ x, y }) => ({ x: 0.5 + x, y: 0.5 + y, z: 0 }));
    const frame = handFrame(0, { landmarks: [image], worldLandmarks: [world], handedness: [[{ categoryName: "Right", score: 0.95 }]] }, false);
    // An exact synthetic hand reads its pose raw; a correction fitted on tracked renders (seen from the back: the
    // whole-hand-shape estimator) would move it, and this check is of the seam, not the correction.
    const pipeline = createLivePipeline({ motion: "pip.flexion", side: "right", digit: "index", condition: "gravity_minimized", correction: "off" });
    const update = pipeline.push(asPipelineFrame(frame));
    expect(update.quality).toBe("ok");
    expect(update.angleDeg!).toBeCloseTo(60, 6);
    expect(pipeline.push(asPipelineFrame({ t: 33, score: 0, handedness: null, hand: null, image: null })).quality).toBe("no_hand");
  });
});
