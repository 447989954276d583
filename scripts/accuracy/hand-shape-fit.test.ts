import { describe, expect, it } from "vitest";
import { handAxes, readMotion } from "@/vision/angles";
import { HAND_SHAPE_MODEL } from "@/vision/correction";
import { correctionClearlyHelps } from "./derive-uncertainty";
import { getPoseAngle } from "./hand-pose";
import { assertTrainingSet, scoreHoldout } from "./hand-shape-fit";
import { handShapeFrame } from "./motion-sets";
import { loadHandRig } from "./rig-files";
import { frameSeeds } from "./scene";
import type { TrackedSet } from "./tracked-set";

const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };

describe("the whole-hand-shape fit's guards and held-out scoring", () => {
  it("refuses held-out seeds for fitting and selection and names the rule", () => {
    expect(() => assertTrainingSet("hand-shapes-20261206-300")).toThrow(/2026120x are held out.*77000xxx/);
    expect(() => assertTrainingSet("motions-20261202-360")).toThrow(/held out/);
    expect(() => assertTrainingSet("hand-shapes-77000102-600")).not.toThrow();
  });

  it("scores raw and estimated angles per joint, view and model, and applies the two-standard-error rule", () => {
    // A perfect tracker: the rendered rig's own landmark positions (metres, camera axes) stand in for the tracked ones.
    const count = 24;
    const frames = frameSeeds(5, count).map((seed, i) => handShapeFrame(rigs, seed, i));
    const set: TrackedSet = {
      seed: 5,
      count,
      renderer: "none",
      msPerFrame: 0,
      stills: frames.map((f) => ({ truth: f.truth, motion: f.motion, model: "lite", hand: f.truth.landmarksCameraM, score: 1 })),
    };
    const cells = scoreHoldout(set, { ...HAND_SHAPE_MODEL, fits: { lite: HAND_SHAPE_MODEL.fits.lite } });
    expect(cells).toHaveLength(9);
    const palmPip = cells.find((c) => c.group === "PIP flexion" && c.view === "palm")!;
    // Independently: the engine's raw 3-D reading of each finger against the commanded angle.
    const errors = frames
      .filter((f) => f.truth.view === "palm")
      .flatMap((f) =>
        (["index", "middle", "ring", "little"] as const).map((finger) => {
          const axes = handAxes(f.truth.landmarksCameraM, f.truth.side)!;
          return Math.abs(readMotion("pip.flexion", finger, f.truth.landmarksCameraM, axes, null)!.deg - getPoseAngle(f.truth.commandedDeg, `${finger}.pipFlexionDeg`));
        }),
      );
    expect(palmPip.samples).toBe(errors.length);
    expect(palmPip.detectionRate).toBe(1);
    expect(palmPip.rawMaeDeg).toBeCloseTo(errors.reduce((a, b) => a + b, 0) / errors.length, 1);
    for (const c of cells) {
      expect(c.correctionHelps).toBe(correctionClearlyHelps(c.rawMaeDeg, c.correctedMaeDeg, c.samples));
      expect(c.estimatorShare).toBeGreaterThanOrEqual(0);
      expect(c.estimatorShare).toBeLessThanOrEqual(1);
    }
  });
});
