import { describe, expect, it } from "vitest";
import { DIGIT_CHAIN, LANDMARK_COUNT } from "./landmarks";
import { createLivePipeline, measurementMethodWords } from "./pipeline";
import { handAxes, readMotion } from "./angles";
import { CORRECTION_MODEL, CORRECTION_VERSION, correctGroupReading } from "./correction";
import { UNCERTAINTY_TABLE, type UncertaintyTable } from "./uncertainty";
import { neutralPose, pinholeFingerPicture, poseHand, withMotionAngle } from "./testing/synthetic-hand";

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

describe("a whole-hand shape seen side-on that the side-view estimator declines", () => {
  // A right fist held with its little-finger side toward the camera (scripts/accuracy/scene.ts `ulnar`).
  const ulnarSide = { forearmDistal: [0, -1, 0] as const, forearmRadial: [0, 0, 1] as const, wrist: [0, 0, 0.5] as const };
  const fist = (() => {
    const pose = neutralPose();
    for (const f of ["index", "middle", "ring", "little"] as const) pose.fingers[f] = { ...pose.fingers[f], mcpFlexionDeg: 90, pipFlexionDeg: 100, dipFlexionDeg: 80 };
    return poseHand(pose, "right", ulnarSide).landmarks;
  })();
  const picture = pinholeFingerPicture(fist);
  const cellOf = (table: UncertaintyTable) => table.cells.find((c) => c.group === "PIP flexion" && c.model === "lite" && c.view === "ulnar")!;
  /** The committed table with the ulnar PIP cell given declined-frame figures (hypothetical ones, wide enough to show). */
  function tableWith(sideOnFitHelps: boolean): UncertaintyTable {
    const cells = UNCERTAINTY_TABLE.cells.map((c) =>
      c === cellOf(UNCERTAINTY_TABLE)
        ? { ...c, declinedBySideFit: { samples: 400, rawMaeDeg: 30, rawP90Deg: 70, sideOnFitMaeDeg: 10, sideOnFitP90Deg: 35, sideOnFitHelps, rawUncertaintyDeg: 70, sideOnFitUncertaintyDeg: sideOnFitHelps ? 35 : null } }
        : c,
    );
    return { ...UNCERTAINTY_TABLE, cells };
  }
  const read = (uncertaintyTable: UncertaintyTable) =>
    createLivePipeline({ motion: "pip.flexion", side: "right", digit: "middle", condition: "against_gravity", handModel: "lite", uncertaintyTable }).push({
      t: 0,
      score: 0.95,
      hand: fist,
      image: picture.image,
      imageAspect: picture.aspect,
    });
  const sideOnReading = () => {
    const axes = handAxes(fist, "right")!;
    const raw = readMotion("pip.flexion", "middle", fist, axes, null)!;
    return correctGroupReading(
      CORRECTION_MODEL,
      "lite",
      "PIP flexion",
      { deg: raw.deg, imagePlaneDeg: raw.imagePlaneDeg, planeFacing: 1, radialTowardCamera: -axes.radialAxis[2], palmTowardCamera: -axes.palmarNormal[2], hand: fist, side: "right", axes, picture },
      "middle",
    );
  };

  it("is read by the side-on whole-hand-shape fit where held-out shapes showed it helps, with that fit's interval", () => {
    const reading = sideOnReading();
    expect(reading?.reader).toBe("side-on hand shape");
    const update = read(tableWith(true));
    expect(update.view).toBe("ulnar");
    expect(update.angleDeg).toBeCloseTo(reading!.deg, 9);
    expect(update.correctionVersion).toBe(CORRECTION_VERSION);
    // Never narrower than the cell's own figure, and 35 here is wider.
    expect(update.uncertaintyDeg).toBe(Math.max(35, cellOf(UNCERTAINTY_TABLE).uncertaintyDeg));
  });

  it("stays raw where it did not help, and then carries the declined frames' raw figure, not a test motion's", () => {
    const update = read(tableWith(false));
    const off = createLivePipeline({ motion: "pip.flexion", side: "right", digit: "middle", condition: "against_gravity", handModel: "lite", correction: "off" }).push({
      t: 0,
      score: 0.95,
      hand: fist,
      image: picture.image,
      imageAspect: picture.aspect,
    });
    expect(update.correctionVersion).toBeNull();
    expect(update.angleDeg).toBeCloseTo(off.angleDeg!, 9);
    expect(update.uncertaintyDeg).toBe(70);
    expect(off.uncertaintyDeg!).toBeLessThan(70);
  });

  it("a capture of such frames states the widest interval its frames carried", () => {
    const pipeline = createLivePipeline({ motion: "pip.flexion", side: "right", digit: "middle", condition: "against_gravity", handModel: "lite", uncertaintyTable: tableWith(false) });
    for (let i = 0; i < 10; i++) pipeline.push({ t: i * 33, score: 0.95, hand: fist, image: picture.image, imageAspect: picture.aspect });
    expect(pipeline.summary().uncertaintyDeg).toBeGreaterThanOrEqual(70);
  });
});
