import { describe, expect, it } from "vitest";
import { handAxes, readMotion } from "@/vision/angles";
import { HAND_SHAPE_MODEL, HAND_SHAPE_SIDE_MODEL } from "@/vision/correction";
import { UNCERTAINTY_TABLE } from "@/vision/uncertainty";
import { correctionClearlyHelps } from "./derive-uncertainty";
import { getPoseAngle } from "./hand-pose";
import { FINGER_FEATURES } from "@/vision/estimator";
import type { TrackedFrame } from "@/vision/live/types";
import { neutralPose, pinholePicture, PINHOLE_ASPECT, poseHand } from "@/vision/testing/synthetic-hand";
import { fingerSpreads, isWholeHandShape, WHOLE_HAND_FEATURES } from "@/vision/correction-hand-shape";
import { assertTrainingSet, handShapeClipFrameSamples, handShapeClipNames, handSpreadRange, type HandShapeSample, scoreHoldout, scoreSideHoldout, type ShapeClipTruth } from "./hand-shape-fit";
import { restPose, setPoseAngle } from "./hand-pose";
import { HAND_SHAPE_SIDE_VIEWS, handShapeFrame } from "./motion-sets";
import { loadHandRig } from "./rig-files";
import { frameSeeds, IMAGE_HEIGHT_PX, IMAGE_WIDTH_PX } from "./scene";
import type { TrackedSet } from "./tracked-set";

const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };

describe("the whole-hand-shape fit's guards and held-out scoring", () => {
  it("refuses held-out seeds for fitting and selection and names the rule", () => {
    expect(() => assertTrainingSet("hand-shapes-20261206-300")).toThrow(/202612xx .*held out.*77000xxx/);
    expect(() => assertTrainingSet("hand-shapes-20261212-300")).toThrow(/held out/);
    expect(() => assertTrainingSet("motions-20261202-360")).toThrow(/held out/);
    expect(() => assertTrainingSet("hand-shapes-side-20261237-300")).toThrow(/held out/);
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

describe("the side-on fit's held-out scoring (scoreSideHoldout)", () => {
  it("reads, through the live pipeline, only frames the side-view estimator declines, and measures the fit on them", async () => {
    // A perfect tracker again: the rig's own landmarks and picture points, side-on whole-hand shapes.
    const count = 40;
    const frames = frameSeeds(11, count).map((seed, i) => handShapeFrame(rigs, seed, i, HAND_SHAPE_SIDE_VIEWS));
    const set: TrackedSet = {
      seed: 11,
      count,
      renderer: "none",
      msPerFrame: 0,
      stills: frames.map((f) => ({
        truth: f.truth,
        motion: f.motion,
        model: "lite",
        hand: f.truth.landmarksCameraM,
        image: f.truth.landmarksImagePx.map(([x, y]) => [x / IMAGE_WIDTH_PX, y / IMAGE_HEIGHT_PX, 0] as [number, number, number]),
        score: 1,
      })),
    };
    // Against a table that has no declined-frame figures yet (as before the first held-out run): the fit must still be measured.
    const before = { ...UNCERTAINTY_TABLE, cells: UNCERTAINTY_TABLE.cells.map((c) => ({ ...c, declinedBySideFit: undefined })) };
    const cells = await scoreSideHoldout(set, { ...HAND_SHAPE_SIDE_MODEL, fits: { lite: HAND_SHAPE_SIDE_MODEL.fits.lite } }, before);
    expect(cells).toHaveLength(6);
    for (const c of cells) {
      expect(c.declined.samples).toBeLessThanOrEqual(c.samples);
      if (c.declined.rawMaeDeg !== null && c.declined.afterMaeDeg !== null) {
        expect(c.declined.correctionHelps).toBe(correctionClearlyHelps(c.declined.rawMaeDeg, c.declined.afterMaeDeg, c.declined.samples));
      }
    }
    // Curled shapes lie outside the side-view estimator's domain, so some frames are declined, and the fit reads them.
    const declined = cells.reduce((n, c) => n + c.declined.samples, 0);
    expect(declined).toBeGreaterThan(0);
    expect(cells.some((c) => c.declined.readShare > 0)).toBe(true);
  });
});

describe("whole-hand-shape training samples from tracked clips", () => {
  const FINGERS = ["index", "middle", "ring", "little"] as const;
  /** A right hand seen from the palm (camera looking at the palm), its four MCPs at `mcpDeg[i]` in frame i. */
  function clip(mcpDeg: readonly number[]) {
    const frames: TrackedFrame[] = mcpDeg.map((deg, i) => {
      const pose = neutralPose();
      for (const finger of FINGERS) pose.fingers[finger].mcpFlexionDeg = deg;
      const hand = poseHand(pose, "right", { forearmDistal: [0, -1, 0], forearmRadial: [1, 0, 0], wrist: [0, 0, 0.5] }).landmarks;
      return { t: (i * 1000) / 30, score: 0.95, handedness: "right", hand: hand.map(([x, y, z]) => [x, y, z]), image: pinholePicture(hand), imageAspect: PINHOLE_ASPECT };
    });
    const truth: ShapeClipTruth = {
      frameCount: mcpDeg.length,
      frames: mcpDeg.map((deg) => {
        const commandedDeg = restPose();
        for (const finger of FINGERS) setPoseAngle(commandedDeg, `${finger}.mcpFlexionDeg`, deg);
        return { truth: { side: "right", view: "palm", commandedDeg } };
      }),
    };
    return { frames, truth };
  }

  it("gives one sample per finger per kept frame with the frame's truth, its raw reading and the hand's mean curl", () => {
    const { frames, truth } = clip([0, 15, 30, 45, 60, 75, 60]);
    const samples = handShapeClipFrameSamples("mcp.flexion-palm-77000501-0-1", "lite", frames, truth, { everyNth: 3, stillBase: 5000, wholeHand: true });
    expect(samples.map((s) => s.still)).toEqual([5000, 5003, 5006].flatMap((id) => FINGERS.map(() => id)));
    expect(samples.every((s) => s.source === "clips" && s.view === "palm" && s.model === "lite")).toBe(true);
    expect(samples.filter((s) => s.finger === "ring").map((s) => s.truthDeg.mcp)).toEqual([0, 45, 60]);
    for (const s of samples) {
      const row = s.handRows[s.fingerIndex];
      expect(row).toHaveLength(FINGER_FEATURES.length + WHOLE_HAND_FEATURES.length);
      // Exact synthetic landmarks: the 3-D MCP reading is the commanded angle (law of cosines in the finger's plane).
      expect(row[FINGER_FEATURES.indexOf("mcpDeg")]).toBeCloseTo(s.truthDeg.mcp, 6);
      // The whole-hand features are the four fingers' mean of tip-to-MCP (3-D), the same in every finger's row.
      const mean = s.handRows.reduce((sum, r) => sum + r[FINGER_FEATURES.indexOf("tipToMcp")], 0) / 4;
      expect(row[FINGER_FEATURES.length + WHOLE_HAND_FEATURES.indexOf("handTipToMcp")]).toBeCloseTo(mean, 9);
    }
  });

  it("skips frames without a hand and refuses a clip whose tracking does not match its frames", () => {
    const { frames, truth } = clip([10, 20, 30]);
    const gappy = frames.map((frame, i) => (i === 1 ? { ...frame, hand: null } : frame));
    const samples = handShapeClipFrameSamples("x", "full", gappy, truth, { everyNth: 1, stillBase: 0, wholeHand: false });
    expect([...new Set(samples.map((s) => s.still))]).toEqual([0, 2]);
    expect(() => handShapeClipFrameSamples("x", "full", frames.slice(1), truth, { everyNth: 1, stillBase: 0, wholeHand: false })).toThrow(/tracked 2 frames, the clip has 3/);
  });

  it("never reads clips of held-out seeds", () => {
    expect(() => handShapeClipNames(20261211, "lite", ["palm"])).toThrow(/held-out seeds are never fitted on/);
  });
});

describe("the whole-hand-shape guard's training range", () => {
  const FINGERS = ["index", "middle", "ring", "little"] as const;
  /** One sample per still: four finger rows whose curl features (indexes 6-9) are `offsets[i]` from a common curl. */
  function still(id: number, offsets: readonly number[], source?: "clips"): HandShapeSample {
    const handRows = offsets.map((d) => Array.from({ length: 10 }, (_, k) => (k >= 6 ? 0.1 + d : 0)));
    const truthDeg = { mcp: 0, pip: 0, dip: 0 };
    return { model: "lite", still: id, view: "palm", finger: "index", handRows, fingerIndex: 0, truthDeg, ...(source ? { source } : {}) };
  }
  // Stills: fingers apart by up to +-0.02; clip frames (many): fingers exactly together.
  const stills = Array.from({ length: 100 }, (_, i) => still(i, [0.02 * Math.sin(i), -0.02 * Math.sin(i), 0.02 * Math.cos(i), -0.02 * Math.cos(i)]));
  const clips = Array.from({ length: 2000 }, (_, i) => still(10_000 + i, [0, 0, 0, 0], "clips"));
  const rows = (s: HandShapeSample) => Object.fromEntries(FINGERS.map((f, i) => [f, s.handRows[i]])) as Parameters<typeof fingerSpreads>[0];

  it("is the union of the stills' and the clips' ranges, so many tight clip frames never narrow it", () => {
    const alone = handSpreadRange(stills);
    const both = handSpreadRange([...stills, ...clips]);
    expect(both).toEqual(alone);
    // Every training still stays a whole-hand shape under the joint range, as under the stills' own.
    expect(stills.filter((s) => isWholeHandShape(both, rows(s))).length).toBe(stills.filter((s) => isWholeHandShape(alone, rows(s))).length);
    // Pooled as one source (no source labels) the clip frames would have narrowed it: the motivating failure.
    const pooled = handSpreadRange([...stills, ...clips.map((s) => ({ ...s, source: undefined }))]);
    expect(pooled.highest[0][0]).toBeLessThan(alone.highest[0][0]);
  });
});
