import { describe, expect, it } from "vitest";
import { clipShapeOf } from "./clip-training";
import { ESTIMATOR_CLIP_SEEDS, ESTIMATOR_VIEW_FITS, refitViewJoint } from "./fit-correction";
import committed from "@/vision/correction-coefficients.json";
import type { FingerEstimatorModel } from "@/vision/estimator";

const estimator = committed.fingerEstimator as unknown as FingerEstimatorModel & { trainingSets: string[] };

describe("the finger estimator's view fits as committed", () => {
  it("fit the little-finger side's PIP on the DIP-along PIP clips of every training clip seed, and no other view", () => {
    const ulnar = ESTIMATOR_VIEW_FITS.find((plan) => plan.views.includes("ulnar"))!;
    expect(ulnar.dipFollowsWeight).toBeGreaterThan(0);
    expect(ESTIMATOR_VIEW_FITS.filter((plan) => plan.dipFollowsWeight > 0).map((plan) => plan.views)).toEqual([["ulnar"]]);
    const index = ESTIMATOR_VIEW_FITS.indexOf(ulnar);
    // The committed file records what it was fitted on (fit-correction.ts viewFitTrainingSets).
    expect(estimator.viewFits![index].trainingSets).toEqual(expect.arrayContaining(ESTIMATOR_CLIP_SEEDS.map((seed) => `pip-clips-dip70-${seed}-every-3`)));
    expect(estimator.viewFits!.filter((_, i) => i !== index).every((fit) => fit.trainingSets.every((name) => !name.includes("dip70")))).toBe(true);
  });

  it("refuses to refit a view no plan names, before reading any render", () => {
    expect(() => refitViewJoint(estimator, "palm", "pip", ["lite"])).toThrow(/no view fit for 'palm'/);
  });

  it("reads a training sample's clip shape only from clip frames", () => {
    expect(clipShapeOf({ stillId: "clip:pip.flexion-dip70-77000401-0-9#12" })).toBe("dip-follows");
    expect(clipShapeOf({ stillId: "clip:pip.flexion-77000401-0-9#12" })).toBe("alone");
  });
});
