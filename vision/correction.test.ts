import { describe, expect, it } from "vitest";
import { MOTIONS, type Digit, type MotionId } from "@/lib/motions/catalog";
import { handAxes, readMotion } from "./angles";
import COEFFICIENTS from "./correction-coefficients.json";
import { CORRECTION_FEATURES, CORRECTION_MODEL, CORRECTION_VERSION, correctGroupAngle, correctionGroupFor, correctMotionAngle, wristPictureGain, type RawAngleFeatures } from "./correction";
import { estimateFingerJointDeg } from "./estimator";
import { createLivePipeline } from "./pipeline";
import { neutralPose, PINHOLE_ASPECT, pinholeFingerPicture, pinholePicture, poseHand, withMotionAngle, type Placement } from "./testing/synthetic-hand";
import { UNCERTAINTY_TABLE, type UncertaintyTable } from "./uncertainty";

/** A feature named in the file ("deg*facing") evaluated from its parts: an independent reading of the file's form. */
function featureValue(name: string, f: RawAngleFeatures): number {
  const part: Record<string, number> = { "1": 1, deg: f.deg, imagePlaneDeg: f.imagePlaneDeg, facing: f.planeFacing, radial: f.radialTowardCamera, palm: f.palmTowardCamera };
  return name.split("*").reduce((product, p) => {
    if (!(p in part)) throw new Error(`unknown feature part ${p}`);
    return product * part[p];
  }, 1);
}

const SAMPLE: RawAngleFeatures = { deg: 41, imagePlaneDeg: 38, planeFacing: 0.8, radialTowardCamera: 0.9, palmTowardCamera: -0.2 };

describe("the committed correction (vision/correction-coefficients.json)", () => {
  it("is version kinarc-correction-11 with the engine's feature list, ten coefficients per linear fit and the finger estimator", () => {
    expect(COEFFICIENTS.version).toBe(CORRECTION_VERSION);
    expect(CORRECTION_VERSION).toBe("kinarc-correction-11");
    expect(COEFFICIENTS.features).toEqual([...CORRECTION_FEATURES]);
    for (const groups of Object.values(CORRECTION_MODEL.groups)) for (const fit of Object.values(groups)) expect(fit.coefficients).toHaveLength(10);
    // Finger flexion is the estimator's alone: a linear fit beside it would never be read.
    for (const groups of Object.values(CORRECTION_MODEL.groups)) for (const group of ["MCP flexion", "PIP flexion", "DIP flexion"]) expect(groups[group]).toBeUndefined();
    expect(Object.keys(CORRECTION_MODEL.fingerEstimator!.fits).sort()).toEqual(["full", "lite"]);
  });

  it("applies each fit as the dot product of the file's coefficients and its named features", () => {
    let checked = 0;
    for (const [model, groups] of Object.entries(COEFFICIENTS.groups)) {
      for (const [group, fit] of Object.entries(groups as Record<string, { coefficients: number[] }>)) {
        const expected = COEFFICIENTS.features.reduce((sum, name, i) => sum + fit.coefficients[i] * featureValue(name, SAMPLE), 0);
        expect(correctGroupAngle(CORRECTION_MODEL, model, group, SAMPLE)).toBeCloseTo(expected, 9);
        checked++;
      }
    }
    // Wrist flexion, wrist deviation and finger abduction, for both hand models.
    expect(checked).toBeGreaterThanOrEqual(6);
  });

  it("reads extension, ulnar deviation and adduction as the negatives of the fitted directions", () => {
    const negated = { ...SAMPLE, deg: -SAMPLE.deg, imagePlaneDeg: -SAMPLE.imagePlaneDeg };
    const pairs: Array<[MotionId, MotionId, Digit | null]> = [
      ["wrist.extension", "wrist.flexion", null],
      ["wrist.ulnar_deviation", "wrist.radial_deviation", null],
      ["finger.adduction", "finger.abduction", "ring"],
    ];
    for (const [reverse, forward, digit] of pairs) {
      const forwardValue = correctMotionAngle(CORRECTION_MODEL, "lite", forward, digit, negated)!;
      expect(correctMotionAngle(CORRECTION_MODEL, "lite", reverse, digit, SAMPLE)).toBeCloseTo(-forwardValue, 9);
    }
    // The finger estimator reads flexion from the hand itself; MCP extension is its negative on the same hand.
    const withHand = withFrame(frameAt(40, RADIAL_VIEW));
    const flexion = correctMotionAngle(CORRECTION_MODEL, "lite", "mcp.flexion", "index", withHand)!;
    expect(flexion).not.toBeNull();
    expect(correctMotionAngle(CORRECTION_MODEL, "lite", "mcp.extension", "index", withHand)).toBeCloseTo(-flexion, 9);
  });

  it("reads finger flexion only with the hand's landmarks and picture: without them the raw angle stands, never another model", () => {
    expect(correctMotionAngle(CORRECTION_MODEL, "lite", "pip.flexion", "index", SAMPLE)).toBeNull();
    const withHand = withFrame(frameAt(40, RADIAL_VIEW));
    expect(correctMotionAngle(CORRECTION_MODEL, "lite", "pip.flexion", "index", { ...withHand, picture: null })).toBeNull();
    expect(correctMotionAngle(CORRECTION_MODEL, "lite", "pip.flexion", "index", withHand)).toBeCloseTo(
      estimateFingerJointDeg(CORRECTION_MODEL.fingerEstimator!, "lite", "pip", withHand.hand, "right", "index", undefined, withHand.picture)!,
      12,
    );
  });

  it("reads a finger with the fit of the frame's view as the engine names it, not the 3-D axes' view", () => {
    // The little-finger side faces the camera by the 3-D axes; the pipeline's view (the picture decides, viewOfHand) may
    // still name the frame thumb side, and then the thumb-side fit reads it, as the fit's choice of estimator does.
    const ulnarByAxes = withFrame(poseHand(withMotionAngle(neutralPose(), "dip.flexion", "ring", 50), "right", { ...RADIAL_VIEW, forearmRadial: [0, 0, 1] }).landmarks);
    const estimator = CORRECTION_MODEL.fingerEstimator!;
    const read = (view?: "radial" | "ulnar") => estimateFingerJointDeg(estimator, "full", "dip", ulnarByAxes.hand, "right", "ring", undefined, ulnarByAxes.picture, view);
    expect(read()).not.toBeNull();
    expect(read()).toBeCloseTo(read("ulnar")!, 12);
    expect(Math.abs(read("radial")! - read("ulnar")!)).toBeGreaterThan(0.5);
    expect(correctMotionAngle(CORRECTION_MODEL, "full", "dip.flexion", "ring", { ...ulnarByAxes, view: "radial" })).toBeCloseTo(read("radial")!, 12);
    expect(correctMotionAngle(CORRECTION_MODEL, "full", "dip.flexion", "ring", { ...ulnarByAxes, view: "ulnar" })).toBeCloseTo(read("ulnar")!, 12);
  });

  it("has no fit for the thumb or the middle finger's spread, so those stay raw", () => {
    expect(correctMotionAngle(CORRECTION_MODEL, "lite", "mcp.flexion", "thumb", SAMPLE)).toBeNull();
    expect(correctionGroupFor("finger.abduction", "middle")).toBeNull();
    // Every motion of the catalog maps somewhere or is the middle finger's spread.
    for (const id of Object.keys(MOTIONS) as MotionId[]) {
      for (const digit of MOTIONS[id].digits.length ? MOTIONS[id].digits : [null]) {
        if (!(id.startsWith("finger.") && digit === "middle")) expect(correctionGroupFor(id, digit), `${id} ${digit}`).not.toBeNull();
      }
    }
  });
});

// A right hand held up, thumb side toward the camera (radial view) or away from it (ulnar view); z points away.
const RADIAL_VIEW: Placement = { forearmDistal: [0, -1, 0], forearmRadial: [0, 0, -1], wrist: [0, 0, 0.5] };

function frameAt(deg: number, placement: Placement) {
  return poseHand(withMotionAngle(neutralPose(), "pip.flexion", "index", deg), "right", placement).landmarks;
}

/** SAMPLE with a right hand's landmarks and their picture points (an exact pinhole), as the finger estimator reads. */
function withFrame(hand: ReturnType<typeof frameAt>) {
  return { ...SAMPLE, hand, side: "right" as const, picture: pinholeFingerPicture(hand) };
}

describe("the live pipeline with the correction", () => {
  it("reports the estimator's angle, the method and the version where validation shows the correction helps", () => {
    // The cell's policy comes from the report; here it is set to "helps" so the check is of the engine's path.
    const table: UncertaintyTable = {
      ...UNCERTAINTY_TABLE,
      cells: UNCERTAINTY_TABLE.cells.map((c) => (c.group === "PIP flexion" ? { ...c, correctionHelps: true, correctedMaeDeg: c.correctedMaeDeg ?? c.rawMaeDeg } : c)),
    };
    const hand = frameAt(60, RADIAL_VIEW);
    const update = createLivePipeline({ motion: "pip.flexion", side: "right", digit: "index", condition: "against_gravity", uncertaintyTable: table }).push({
      t: 0,
      score: 0.95,
      hand,
      image: pinholePicture(hand),
      imageAspect: PINHOLE_ASPECT,
    });
    expect(update.view).toBe("radial");
    // Independently: the estimator on the same landmarks, through the group API.
    const axes = handAxes(hand, "right")!;
    const raw = readMotion("pip.flexion", "index", hand, axes, null)!;
    const expected = correctGroupAngle(CORRECTION_MODEL, "lite", "PIP flexion", { ...withFrame(hand), deg: raw.deg, imagePlaneDeg: raw.imagePlaneDeg, planeFacing: 1, radialTowardCamera: 1, palmTowardCamera: 0 }, "index")!;
    expect(update.angleDeg).toBeCloseTo(expected, 9);
    expect(Math.abs(update.angleDeg! - raw.deg)).toBeGreaterThan(0.1);
    expect(update.method).toBe("world3d+kinarc-correction-11");
    expect(update.correctionVersion).toBe("kinarc-correction-11");
    const cell = table.cells.find((c) => c.group === "PIP flexion" && c.model === "lite" && c.view === "radial")!;
    // The index finger's own figure where the held-out clips split the cell by finger.
    expect(update.uncertaintyDeg).toBeCloseTo(cell.byDigit?.find((f) => f.digit === "index")?.uncertaintyDeg ?? cell.uncertaintyDeg, 6);
  });

  it("leaves the raw angle where the validation table says the correction makes things worse", () => {
    const table: UncertaintyTable = {
      ...UNCERTAINTY_TABLE,
      cells: UNCERTAINTY_TABLE.cells.map((c) => (c.group === "PIP flexion" ? { ...c, correctionHelps: false } : c)),
    };
    const hand = frameAt(60, RADIAL_VIEW);
    const update = createLivePipeline({ motion: "pip.flexion", side: "right", digit: "index", condition: "against_gravity", uncertaintyTable: table }).push({ t: 0, score: 0.95, hand });
    expect(update.angleDeg).toBeCloseTo(60, 6);
    expect(update.method).toBe("world3d");
    expect(update.correctionVersion).toBeNull();
  });
});

describe("the picture-read wrist's gain (kinarc-correction-8)", () => {
  it("takes the hand model's pooled fit, and none for a model without a usable fit", () => {
    const fit = (gain: number) => ({ slope: 1 / gain, interceptDeg: 0, gain, frames: 100 });
    const model = { ...CORRECTION_MODEL, wristPictureGains: { lite: { ...fit(0.9), bySide: { ulnar: fit(0.95) } } } };
    expect(wristPictureGain(model, "lite")).toBe(0.9);
    expect(wristPictureGain(model, "full")).toBeNull();
    expect(wristPictureGain({ ...model, wristPictureGains: { lite: fit(-1) } }, "lite")).toBeNull();
  });

  it("the committed model carries a gain for both hand models", () => {
    for (const handModel of ["lite", "full"]) expect(wristPictureGain(CORRECTION_MODEL, handModel)).toBeGreaterThan(0.85);
  });
});
