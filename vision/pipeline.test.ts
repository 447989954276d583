import { describe, expect, it } from "vitest";
import { DIGIT_CHAIN, LANDMARK_COUNT } from "./landmarks";
import { createLivePipeline, measurementMethodWords } from "./pipeline";
import { UNCERTAINTY_TABLE } from "./uncertainty";
import { neutralPose, poseHand, withMotionAngle } from "./testing/synthetic-hand";

// Forearm level along x, palm up for a right hand (see plane.test.ts): PIP flexion here works against gravity.
const palmUp = { forearmDistal: [1, 0, 0] as const, forearmRadial: [0, 0, -1] as const, wrist: [0, 0, 0.5] as const };
const handAt = (deg: number) => poseHand(withMotionAngle(neutralPose(), "pip.flexion", "ring", deg), "right", palmUp).landmarks;

describe("live pipeline, frame by frame", () => {
  it("returns the angle, smoothed angle, plane and repetition state of a usable frame", () => {
    const pipeline = createLivePipeline({ motion: "pip.flexion", side: "right", digit: "ring", condition: "against_gravity", correction: "off" });
    const update = pipeline.push({ t: 0, score: 0.9, hand: handAt(30) });
    expect(update.quality).toBe("ok");
    expect(update.angleDeg).toBeCloseTo(30, 6);
    expect(update.smoothedDeg).toBeCloseTo(30, 6);
    expect(update.plane).toEqual({ verdict: "against_gravity", axisToGravityDeg: expect.closeTo(90, 3), travelAlongGravity: expect.any(Number) });
    expect(update.planeMatchesCondition).toBe(true);
    expect(update.rep).toEqual({ phase: "rest", count: 0, currentTopDeg: null });
    expect(update.method).toBe("world3d");
    expect(update.correctionVersion).toBeNull();
    // With the correction off the uncertainty is still the raw 3-D method's validation figure for this joint and view
    // (score 0.9: no widening), read from the table the derivation script wrote.
    const cell = UNCERTAINTY_TABLE.cells.find((c) => c.group === "PIP flexion" && c.model === "lite" && c.view === update.view)!;
    expect(update.uncertaintyDeg).toBeCloseTo(1.645 * Math.sqrt(Math.PI / 2) * cell.rawMaeDeg, 1);
  });

  it("skips frames with no hand, a low score, 20 landmarks or a NaN, and says why", () => {
    const pipeline = createLivePipeline({ motion: "pip.flexion", side: "right", digit: "ring", condition: "against_gravity", correction: "off" });
    const good = handAt(30);
    const withNaN = good.map((p, i) => (i === 14 ? ([Number.NaN, p[1], p[2]] as const) : p));
    expect(pipeline.push({ t: 0, score: 0.9, hand: null }).quality).toBe("no_hand");
    expect(pipeline.push({ t: 33, score: 0.2, hand: good }).quality).toBe("low_score");
    expect(pipeline.push({ t: 66, score: 0.9, hand: good.slice(0, 20) }).quality).toBe("bad_landmarks");
    expect(pipeline.push({ t: 99, score: 0.9, hand: withNaN }).quality).toBe("bad_landmarks");
    const summary = pipeline.summary();
    expect(summary.frames).toBe(4);
    expect(summary.usableFrames).toBe(0);
  });

  it("restarts the smoother after a long gap instead of gliding across it", () => {
    const pipeline = createLivePipeline({ motion: "pip.flexion", side: "right", digit: "ring", condition: "against_gravity", correction: "off" });
    for (let i = 0; i < 10; i++) pipeline.push({ t: i * 33, score: 0.9, hand: handAt(10) });
    const after = pipeline.push({ t: 5000, score: 0.9, hand: handAt(70) });
    expect(after.smoothedDeg).toBeCloseTo(70, 6);
  });

  it("the landmark chains name every point but the wrist exactly once", () => {
    const all = Object.values(DIGIT_CHAIN).flat().sort((a, b) => a - b);
    expect(all).toEqual(Array.from({ length: LANDMARK_COUNT - 1 }, (_, i) => i + 1));
  });
});

describe("view quality of the frames and the capture", () => {
  // Hand upright in front of the camera (fingers up the picture), seen from its little-finger side, thumb side and palm.
  const placements = {
    ulnar: { forearmDistal: [0, -1, 0], forearmRadial: [0, 0, 1], wrist: [0, 0.05, 0.45] },
    radial: { forearmDistal: [0, -1, 0], forearmRadial: [0, 0, -1], wrist: [0, 0.05, 0.45] },
    palm: { forearmDistal: [0, -1, 0], forearmRadial: [1, 0, 0], wrist: [0, 0.05, 0.45] },
  } as const;

  function captureIn(view: keyof typeof placements) {
    const pipeline = createLivePipeline({ motion: "pip.flexion", side: "right", digit: "index", condition: "against_gravity", correction: "off" });
    const updates = [0, 20, 40, 60, 40, 20, 0].map((deg, i) =>
      pipeline.push({ t: i * 100, score: 0.95, hand: poseHand(withMotionAngle(neutralPose(), "pip.flexion", "index", deg), "right", placements[view]).landmarks }),
    );
    return { updates, summary: pipeline.summary() };
  }

  it("marks each frame and the capture with the measured view and how it serves the motion", () => {
    const ulnar = captureIn("ulnar");
    expect(ulnar.updates.map((u) => u.viewQuality)).toEqual(Array(7).fill("recommended"));
    expect(ulnar.summary).toMatchObject({ view: "ulnar", viewQuality: "recommended", recommendedViews: ["ulnar"], forearmSource: null });
    expect(ulnar.summary.warnings.join(" ")).not.toMatch(/view:/);
    const radial = captureIn("radial");
    expect(radial.summary).toMatchObject({ view: "radial", viewQuality: "usable" });
    expect(radial.summary.warnings.join(" ")).toMatch(/view: a thumb-side view; the little-finger-side view measures more truly/);
    const palm = captureIn("palm");
    expect(palm.summary).toMatchObject({ view: "palm", viewQuality: "poor" });
    expect(palm.summary.warnings.join(" ")).toMatch(/poor view/);
  });

  it("a poorer view states a wider uncertainty, the figure grading reads (vision/uncertainty.ts, report.md by view)", () => {
    const [ulnar, radial, palm] = (["ulnar", "radial", "palm"] as const).map((v) => captureIn(v).summary.uncertaintyDeg!);
    expect(ulnar).toBeLessThan(radial);
    expect(radial).toBeLessThan(palm);
  });
});

describe("a stored attempt's method in words", () => {
  it("says whether the angle came from 3-D landmarks, the correction (with its version) or the picture", () => {
    expect(measurementMethodWords("image_plane")).toMatch(/in the picture.*side-on/);
    expect(measurementMethodWords("world3d")).toMatch(/raw angles, no correction/);
    expect(measurementMethodWords("world3d+kinarc-correction-7")).toBe("hand landmarks, corrected (kinarc-correction-7)");
    expect(measurementMethodWords("image_plane+kinarc-correction-8")).toBe("read in the picture, the hand seen side-on, scaled by its fitted gain (kinarc-correction-8)");
    expect(measurementMethodWords(null)).toBe("—");
  });
});
