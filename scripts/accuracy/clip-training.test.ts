import { describe, expect, it } from "vitest";
import { FINGER_FEATURES, PICTURE_FEATURES } from "@/vision/estimator";
import { neutralPose, PINHOLE_ASPECT, pinholePicture, poseHand, type Placement } from "@/vision/testing/synthetic-hand";
import type { TrackedFrame } from "@/vision/live/types";
import { clipFingerSamples, clipFrameSamples, clipShapeOf, clipShapeOfName } from "./clip-training";
import { restPose, setPoseAngle } from "./hand-pose";
import type { FrameTruth } from "./scene";

/** Seen from the little-finger side (camera looking along the radial axis), as the clips are rendered. */
const ULNAR_VIEW: Placement = { forearmDistal: [0, -1, 0], forearmRadial: [0, 0, 1], wrist: [0, 0, 0.5] };
const FINGERS = ["index", "middle", "ring", "little"] as const;

/** A clip of synthetic frames: the four PIPs at `pipDeg[i]` in frame i, with the render's truth beside it. */
function clip(pipDeg: readonly number[]) {
  const frames: TrackedFrame[] = pipDeg.map((deg, i) => {
    const pose = neutralPose();
    for (const finger of FINGERS) pose.fingers[finger].pipFlexionDeg = deg;
    const hand = poseHand(pose, "right", ULNAR_VIEW).landmarks;
    return { t: (i * 1000) / 30, score: 0.95, handedness: "right", hand: hand.map(([x, y, z]) => [x, y, z]), image: pinholePicture(hand), imageAspect: PINHOLE_ASPECT };
  });
  const truth = {
    frameCount: pipDeg.length,
    frames: pipDeg.map((deg, index) => {
      const commandedDeg = restPose();
      for (const finger of FINGERS) setPoseAngle(commandedDeg, `${finger}.pipFlexionDeg`, deg);
      return { index, truth: { side: "right", view: "ulnar", commandedDeg } as unknown as FrameTruth };
    }),
  };
  return { frames, truth };
}

describe("finger estimator training samples from tracked clips", () => {
  it("gives one sample per finger per kept frame, its truth the frame's commanded angles and its features the frame's own", () => {
    const { frames, truth } = clip([0, 20, 40, 60, 80, 60, 40]);
    const samples = clipFrameSamples("pip.flexion-77000401-0-123", "lite", frames, truth, 3);
    // Frames 0, 3 and 6 kept, four fingers each.
    expect(samples.map((s) => s.stillId)).toEqual(
      ["0", "3", "6"].flatMap((i) => FINGERS.map(() => `clip:pip.flexion-77000401-0-123#${i}`)),
    );
    expect(samples.every((s) => s.motion === "pip.flexion" && s.view === "ulnar" && s.model === "lite")).toBe(true);
    expect(samples.filter((s) => s.finger === "middle").map((s) => s.truthDeg.pip)).toEqual([0, 60, 40]);
    // The synthetic hand's landmarks are exact, so the features' 3-D PIP reading is the truth; the middle finger bends
    // square to the camera, so its picture reading (a similarity of its plane under the pinhole) is the truth too.
    for (const s of samples) {
      expect(s.base).toHaveLength(FINGER_FEATURES.length + PICTURE_FEATURES.length);
      expect(s.base[FINGER_FEATURES.indexOf("pipDeg")]).toBeCloseTo(s.truthDeg.pip, 6);
      if (s.finger === "middle") expect(s.base[FINGER_FEATURES.length + PICTURE_FEATURES.indexOf("pipPictureDeg")]).toBeCloseTo(s.truthDeg.pip, 6);
    }
  });

  it("gives no samples for frames without their picture points (the estimator reads them)", () => {
    const { frames, truth } = clip([10, 20, 30]);
    expect(clipFrameSamples("pip.flexion-77000401-0-1", "lite", frames.map((f) => ({ ...f, image: null })), truth, 1)).toEqual([]);
  });

  it("skips frames without a hand and refuses a clip whose tracking does not match its frames", () => {
    const { frames, truth } = clip([10, 20, 30]);
    const gappy = frames.map((frame, i) => (i === 0 ? { ...frame, hand: null } : frame));
    expect(clipFrameSamples("pip.flexion-77000401-0-1", "lite", gappy, truth, 1).map((s) => s.stillId)).not.toContain("clip:pip.flexion-77000401-0-1#0");
    expect(() => clipFrameSamples("pip.flexion-77000401-0-1", "lite", frames.slice(1), truth, 1)).toThrow(/tracked 2 frames, the clip has 3/);
    expect(() => clipFrameSamples("wrist.flexion-77000401-0-1", "lite", frames, truth, 1)).toThrow(/expected a finger clip/);
  });

  it("tells a PIP clip whose DIP bends along from one bent alone, by the name clip-validation gives it", () => {
    expect(clipShapeOfName("pip.flexion-77000401-0-123")).toBe("alone");
    expect(clipShapeOfName("pip.flexion-gm-77000401-0-123")).toBe("alone");
    expect(clipShapeOfName("pip.flexion-dip70-77000401-0-123")).toBe("dip-follows");
    expect(clipShapeOfName("pip.flexion-gm-dip70-77000401-0-123")).toBe("dip-follows");
    expect(clipShapeOfName("pip.flexion-palm-77000501-0-123")).toBeNull();
    const { frames, truth } = clip([0, 30, 60]);
    const samples = clipFrameSamples("pip.flexion-dip70-77000401-0-9", "lite", frames, truth, 1);
    expect(samples.length).toBe(12);
    expect(samples.every((s) => s.motion === "pip.flexion" && clipShapeOf(s) === "dip-follows")).toBe(true);
    expect(clipShapeOf({ stillId: "motions-77000001-600#4" })).toBeNull();
  });

  it("never reads a held-out seed", () => {
    expect(() => clipFingerSamples([20_261_207], "lite")).toThrow(/expected a training seed/);
  });
});
