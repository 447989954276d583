import { describe, expect, it } from "vitest";
import { CORRECTION_MODEL } from "./correction";
import {
  applyFingerFit,
  designRow,
  ESTIMATOR_FEATURES,
  estimateFingerJointDeg,
  FINGER_FEATURES,
  fingerFitFor,
  FINGER_JOINTS,
  fingerFeatures,
  inTrainingDomain,
  modelFingerFeatures,
  quadraticTerms,
  standardize,
  type FingerJointFit,
} from "./estimator";
import { BONES_MM, neutralPose, pinholeFingerPicture, poseHand, type Placement } from "./testing/synthetic-hand";

// A right hand held up, little-finger side toward the camera (ulnar view); z points away from the camera.
const ULNAR_VIEW: Placement = { forearmDistal: [0, -1, 0], forearmRadial: [0, 0, 1], wrist: [0, 0, 0.5] };
// The same hand seen from the thumb side.
const RADIAL_VIEW: Placement = { forearmDistal: [0, -1, 0], forearmRadial: [0, 0, -1], wrist: [0, 0, 0.5] };
// The same hand seen from the palm: the palm normal points at the camera (-z) for a right hand.
const PALM_VIEW: Placement = { forearmDistal: [0, -1, 0], forearmRadial: [1, 0, 0], wrist: [0, 0, 0.5] };

// The middle finger: its metacarpal runs along the hand's long axis, so its flexion plane is the hand's own.
function handWith(pip: number, dip: number, placement: Placement, mcp = 0) {
  const pose = neutralPose();
  pose.fingers.middle = { mcpFlexionDeg: mcp, radialAbductionDeg: 0, pipFlexionDeg: pip, dipFlexionDeg: dip };
  return poseHand(pose, "right", placement).landmarks;
}

/** The frame as the tracker gives it: landmarks plus their picture points (an exact pinhole). */
const pictureOf = pinholeFingerPicture;

const feature = (values: number[], name: (typeof FINGER_FEATURES)[number]) => values[FINGER_FEATURES.indexOf(name)];

describe("finger features", () => {
  it("reads a straight finger as straight and fully reaching", () => {
    const f = fingerFeatures(handWith(0, 0, ULNAR_VIEW), "right", "middle")!;
    expect(f).toHaveLength(FINGER_FEATURES.length);
    for (const name of ["mcpDeg", "pipDeg", "dipDeg"] as const) expect(feature(f, name)).toBeCloseTo(0, 6);
    expect(feature(f, "tipToMcp")).toBeCloseTo(1, 9);
  });

  it("gives the tip-to-MCP distance the law of cosines gives for a flexed PIP", () => {
    // Only the PIP bends: the tip sits at distance sqrt(a^2 + d^2 + 2ad cos(theta)) from the MCP, with a the proximal
    // phalanx and d the middle plus distal ones in line [law of cosines, common practice].
    const [a, b, c] = BONES_MM.middle.phalanges;
    for (const pipDeg of [30, 60, 90]) {
      const f = fingerFeatures(handWith(pipDeg, 0, ULNAR_VIEW), "right", "middle")!;
      const d = b + c;
      const expected = Math.sqrt(a * a + d * d + 2 * a * d * Math.cos((pipDeg * Math.PI) / 180)) / (a + b + c);
      expect(feature(f, "tipToMcp")).toBeCloseTo(expected, 9);
      expect(feature(f, "pipDeg")).toBeCloseTo(pipDeg, 6);
    }
  });

  it("reads foreshortening: a phalanx across the line of sight is whole in the image, one bent toward the camera shrinks by cos", () => {
    // Ulnar view: the finger flexes in the image plane, so every phalanx keeps its full length in the image.
    const side = fingerFeatures(handWith(60, 30, ULNAR_VIEW), "right", "middle")!;
    for (const name of ["proximalInImage", "middleInImage", "distalInImage"] as const) expect(feature(side, name)).toBeCloseTo(1, 6);
    // Palm view, MCP flexed 40 degrees toward the camera: the proximal phalanx shows cos(40) of its length.
    const palm = fingerFeatures(handWith(0, 0, PALM_VIEW, 40), "right", "middle")!;
    expect(feature(palm, "palmTowardCamera")).toBeCloseTo(1, 6);
    expect(feature(fingerFeatures(handWith(0, 0, PALM_VIEW), "right", "middle")!, "proximalInImage")).toBeCloseTo(1, 6);
    expect(feature(palm, "proximalInImage")).toBeCloseTo(Math.cos((40 * Math.PI) / 180), 6);
  });
});

describe("the polynomial basis and a fit's arithmetic", () => {
  it("has every feature and every pairwise product once: p + p(p+1)/2 terms", () => {
    for (const p of [1, 3, 16]) expect(quadraticTerms(p)).toHaveLength(p + (p * (p + 1)) / 2);
    expect(quadraticTerms(2)).toEqual([[0], [1], [0, 0], [0, 1], [1, 1]]);
    expect(designRow(quadraticTerms(2), [2, 3])).toEqual([1, 2, 3, 4, 6, 9]);
  });

  const fit: FingerJointFit = {
    means: [10, 1],
    sds: [5, 2],
    zMin: [-2, -3],
    zMax: [2, 3],
    domainLowZ: [-1.5, -2],
    domainHighZ: [1.5, 2],
    terms: quadraticTerms(2),
    // 40 + 10 z0 + 0 z1 + 1 z0^2 + 2 z0 z1 + 0 z1^2
    coefficients: [40, 10, 0, 1, 2, 0],
    outputRangeDeg: [-10, 110],
    ridgeLambda: 1,
    trainingSamples: 100,
    trainingMaeDeg: 1,
  };

  it("takes a view fit for the views it holds and the general fit elsewhere, or where the view fit lacks the joint", () => {
    const ulnarFit = { ...fit, coefficients: [70, 10, 0, 1, 2, 0] };
    const model = {
      features: ["a", "b"],
      fits: { lite: { pip: fit, mcp: fit } },
      viewFits: [{ views: ["ulnar" as const], fits: { lite: { pip: ulnarFit } }, trainingSets: ["clips"] }],
    };
    expect(fingerFitFor(model, "lite", "pip", "ulnar")).toBe(ulnarFit);
    expect(fingerFitFor(model, "lite", "pip", "radial")).toBe(fit);
    expect(fingerFitFor(model, "lite", "pip", null)).toBe(fit);
    expect(fingerFitFor(model, "lite", "mcp", "ulnar")).toBe(fit);
    expect(fingerFitFor(model, "full", "pip", "ulnar")).toBeUndefined();
  });

  it("standardises, holds each feature to the training range and evaluates the polynomial", () => {
    expect(standardize(fit, [15, 3])).toEqual([1, 1]);
    expect(applyFingerFit(fit, [15, 3])).toBeCloseTo(40 + 10 + 1 + 2, 12);
    // z0 = 10 is far past training's 2: held at 2, so the estimate is the polynomial at the range's edge.
    expect(standardize(fit, [60, 1])).toEqual([2, 0]);
    expect(applyFingerFit(fit, [60, 1])).toBeCloseTo(40 + 20 + 4, 12);
  });

  it("speaks only inside the training domain: each feature within its 1st-99th percentile range plus the margin", () => {
    // z = (x - mean) / sd: [15, 3] -> [1, 1], inside; [25, 1] -> z0 = 3, past 1.5 + 1.
    expect(inTrainingDomain(fit, [15, 3], 1)).toBe(true);
    expect(inTrainingDomain(fit, [25, 1], 1)).toBe(false);
    expect(inTrainingDomain(fit, [25, 1], 2)).toBe(true);
  });

  it("never leaves the output range and refuses a base of the wrong width", () => {
    expect(applyFingerFit({ ...fit, coefficients: [500, 0, 0, 0, 0, 0] }, [10, 1])).toBe(110);
    expect(() => applyFingerFit(fit, [1, 2, 3])).toThrow(/expected 2 base features, got 3/);
  });
});

describe("the committed estimator (vision/correction-coefficients.json)", () => {
  const estimator = CORRECTION_MODEL.fingerEstimator!;

  it("has a fit for MCP, PIP and DIP of both hand models, sized to its feature list, trained off the validation seed", () => {
    expect(estimator.features).toEqual([...ESTIMATOR_FEATURES]);
    for (const fits of [estimator.fits, ...(estimator.viewFits ?? []).map((v) => v.fits)]) {
      for (const model of ["lite", "full"]) {
        for (const joint of FINGER_JOINTS) {
          const fit = fits[model]![joint]!;
          expect(fit.means).toHaveLength(ESTIMATOR_FEATURES.length);
          expect(fit.coefficients).toHaveLength(quadraticTerms(ESTIMATOR_FEATURES.length).length + 1);
        }
      }
    }
    for (const set of estimator.trainingSets) expect(set).not.toContain("20261202");
  });

  it("reads frames seen from either side with that side's clip-trained fit", () => {
    const viewFits = estimator.viewFits ?? [];
    // The little-finger side from clips against gravity, the thumb side from clips with gravity minimized.
    expect(viewFits.map((v) => v.views)).toEqual([["ulnar"], ["radial"]]);
    for (const viewFit of viewFits) {
      for (const model of ["lite", "full"]) for (const joint of FINGER_JOINTS) expect(viewFit.fits[model]?.[joint]).toBeDefined();
      // Training seeds only: the clip seeds start at 77 000 000, the held-out ones are 2026120x.
      expect(viewFit.trainingSets.some((set) => /^finger-clips-(gm-)?77\d{6}-/.test(set))).toBe(true);
      for (const set of viewFit.trainingSets) expect(set).not.toMatch(/2026120\d/);
    }
    const pipOf = (placement: Placement) => handWith(60, 30, placement);
    const read = (placement: Placement) => estimateFingerJointDeg(estimator, "lite", "pip", pipOf(placement), "right", "middle", undefined, pictureOf(pipOf(placement)));
    const features = (placement: Placement) => modelFingerFeatures(estimator, pipOf(placement), "right", "middle", null, pictureOf(pipOf(placement)))!;
    expect(read(ULNAR_VIEW)).toBeCloseTo(applyFingerFit(viewFits[0].fits.lite!.pip!, features(ULNAR_VIEW)), 9);
    expect(read(RADIAL_VIEW)).toBeCloseTo(applyFingerFit(viewFits[1].fits.lite!.pip!, features(RADIAL_VIEW)), 9);
    expect(read(RADIAL_VIEW)).not.toBeCloseTo(applyFingerFit(estimator.fits.lite!.pip!, features(RADIAL_VIEW)), 3);
  });

  it("reads an MCP test position (fingers straight) but declines a curled finger, which its test motion never shows", () => {
    const read = (hand: ReturnType<typeof handWith>) => estimateFingerJointDeg(estimator, "lite", "mcp", hand, "right", "middle", undefined, pictureOf(hand));
    const mcpOnly = read(handWith(0, 0, ULNAR_VIEW, 60));
    expect(mcpOnly).not.toBeNull();
    const fist = read(handWith(100, 80, ULNAR_VIEW, 85));
    expect(fist).toBeNull();
  });

  it("is deterministic and reads more PIP flexion for a more bent PIP in a side view", () => {
    const at = (pip: number) => {
      const hand = handWith(pip, pip * 0.5, ULNAR_VIEW);
      return estimateFingerJointDeg(estimator, "lite", "pip", hand, "right", "middle", undefined, pictureOf(hand))!;
    };
    expect(at(40)).toBe(at(40));
    expect(at(70)).toBeGreaterThan(at(10));
  });
});
