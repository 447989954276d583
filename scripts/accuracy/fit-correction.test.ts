import { describe, expect, it } from "vitest";
import { clipShapeOf } from "./clip-training";
import { ESTIMATOR_CLIP_SEEDS, ESTIMATOR_VIEW_FITS, refitViewJoint } from "./fit-correction";
import committed from "@/vision/correction-coefficients.json";
import type { FingerEstimatorModel } from "@/vision/estimator";

const estimator = committed.fingerEstimator as unknown as FingerEstimatorModel & { trainingSets: string[] };

describe("the finger estimator's view fits as committed", () => {
  it("fit each side view's PIP on the DIP-along PIP clips of every training clip seed in that view's condition", () => {
    expect(ESTIMATOR_VIEW_FITS.map((plan) => [plan.views, plan.dipFollowsWeight > 0])).toEqual([
      [["ulnar"], true],
      [["radial"], true],
    ]);
    // The committed file records what each view fit was fitted on (fit-correction.ts viewFitTrainingSets).
    ESTIMATOR_VIEW_FITS.forEach((plan, index) => {
      const gm = plan.condition === "gravity_minimized" ? "gm-" : "";
      expect(estimator.viewFits![index].views).toEqual(plan.views);
      expect(estimator.viewFits![index].trainingSets).toEqual(expect.arrayContaining(ESTIMATOR_CLIP_SEEDS.map((seed) => `pip-clips-dip70-${gm}${seed}-every-3`)));
    });
  });

  it("refuses to refit a view no plan names, before reading any render", () => {
    expect(() => refitViewJoint(estimator, "palm", "pip", ["lite"])).toThrow(/no view fit for 'palm'/);
  });

  it("reads a training sample's clip shape only from clip frames", () => {
    expect(clipShapeOf({ stillId: "clip:pip.flexion-dip70-77000401-0-9#12" })).toBe("dip-follows");
    expect(clipShapeOf({ stillId: "clip:pip.flexion-77000401-0-9#12" })).toBe("alone");
  });
});
