import { describe, expect, it } from "vitest";
import { uniformFloat64 } from "pure-rand/distribution/uniformFloat64";
import { xoroshiro128plus } from "pure-rand/generator/xoroshiro128plus";
import { analyzeCapture } from "./analyze-capture";
import { analyzeCapturePair, combineFrame, PEAK_DISAGREEMENT_DEG } from "./model-pair";
import { pairPeakUncertaintyDeg, pairUncertaintyDeg, trackingFactor, UNCERTAINTY_TABLE, VALIDATION_VIEWS, type UncertaintyTable } from "./uncertainty";
import type { LiveUpdate } from "./pipeline";
import { buildSyntheticCapture, neutralPose, PINHOLE_ASPECT, pinholePicture, poseHand, randomPlacement, SeededRandom, type SyntheticCaptureSpec } from "./testing/synthetic-hand";

// Synthetic hands have exact landmarks, so these run with the correction off (as vision/analyze-capture.test.ts).
const RAW = { correction: "off" } as const;

function pipSpec(peakDeg: number, seed: number, extra: Partial<SyntheticCaptureSpec> = {}): SyntheticCaptureSpec {
  return {
    motion: "pip.flexion",
    side: "left",
    digit: "index",
    condition: "against_gravity",
    placement: randomPlacement(new SeededRandom(4242)),
    restDeg: 0,
    reps: [{ peakDeg }, { peakDeg }, { peakDeg }],
    noiseMm: 1,
    dropRate: 0,
    seed,
    ...extra,
  };
}

describe("combining two hand models' readings of a frame", () => {
  it("takes the mean where both read, with an interval holding both models' intervals", () => {
    const a = { angleDeg: 40, uncertaintyDeg: 6 };
    const b = { angleDeg: 70, uncertaintyDeg: 9 };
    const both = combineFrame(a, b);
    expect(both.angleDeg).toBe(55);
    // The larger stated half-width (9) plus half the difference (15).
    expect(both.uncertaintyDeg).toBe(24);
    for (const one of [a, b]) {
      expect(both.angleDeg! - both.uncertaintyDeg!).toBeLessThanOrEqual(one.angleDeg - one.uncertaintyDeg);
      expect(both.angleDeg! + both.uncertaintyDeg!).toBeGreaterThanOrEqual(one.angleDeg + one.uncertaintyDeg);
    }
  });

  it("keeps the one reading where the other model found no hand, and nothing where neither did", () => {
    const a = { angleDeg: 31, uncertaintyDeg: 7 };
    const none = { angleDeg: null, uncertaintyDeg: null };
    expect(combineFrame(a, none)).toEqual(a);
    expect(combineFrame(none, a)).toEqual(a);
    expect(combineFrame(none, none)).toEqual(none);
  });

  it("with a measured two-model figure, states it where the models agree and half their difference where they do not", () => {
    const a = { angleDeg: 40, uncertaintyDeg: 6 };
    expect(combineFrame(a, { angleDeg: 44, uncertaintyDeg: 9 }, 5)).toEqual({ angleDeg: 42, uncertaintyDeg: 5 });
    // 30° apart: the interval still reaches both models' readings.
    expect(combineFrame(a, { angleDeg: 70, uncertaintyDeg: 9 }, 5)).toEqual({ angleDeg: 55, uncertaintyDeg: 15 });
    // One model alone keeps its own interval.
    expect(combineFrame(a, { angleDeg: null, uncertaintyDeg: null }, 5)).toEqual(a);
  });

  it("shrinks the error of two independent readings of equal spread by √2, as the law of propagation of uncertainty says", () => {
    // JCGM 100:2008 (GUM) 5.1.2: for y = (x1 + x2) / 2 with uncorrelated inputs, u²(y) = (u²(x1) + u²(x2)) / 4, so equal
    // spreads give u(y) = u(x) / √2. Checked by simulation: normal errors (Box-Muller), sd 5°, 20,000 frames.
    const rng = xoroshiro128plus(77000407);
    const normal = () => Math.sqrt(-2 * Math.log(1 - uniformFloat64(rng))) * Math.cos(2 * Math.PI * uniformFloat64(rng));
    let single = 0;
    let combined = 0;
    const n = 20_000;
    for (let i = 0; i < n; i++) {
      const a = 5 * normal();
      const b = 5 * normal();
      single += a * a;
      combined += combineFrame({ angleDeg: a, uncertaintyDeg: 1 }, { angleDeg: b, uncertaintyDeg: 1 }).angleDeg! ** 2;
    }
    expect(Math.sqrt(combined / n) / Math.sqrt(single / n)).toBeCloseTo(1 / Math.SQRT2, 1);
  });
});

describe("one clip read by two hand models", () => {
  it("reads two agreeing captures like one: same repetitions, the true peak, no disagreement", () => {
    const one = buildSyntheticCapture(pipSpec(90, 1));
    const two = buildSyntheticCapture(pipSpec(90, 2));
    const pair = analyzeCapturePair({ capture: one, handModel: "lite" }, { capture: two, handModel: "full" }, RAW);
    expect(pair.reps).toBe(3);
    expect(Math.abs(pair.peakDeg! - 90)).toBeLessThan(3);
    expect(pair.modelsDisagree).toBe(false);
    expect(pair.bothFrames).toBe(one.frames.filter((f) => f.hand).length);
    expect(pair.handModels).toEqual(["lite", "full"]);
    expect(pair.byModel[0].peakDeg).toBeCloseTo(analyzeCapture(one, { ...RAW, handModel: "lite" }).peakDeg!, 9);
  });

  it("warns when one model loses the bend, and states an interval that reaches both peaks", () => {
    // A model that reads a 90° PIP bend as 40° in the same frames (the failure seen once in held-out clips).
    const seen = buildSyntheticCapture(pipSpec(90, 3));
    const lost = buildSyntheticCapture(pipSpec(40, 4));
    const pair = analyzeCapturePair({ capture: lost, handModel: "lite" }, { capture: seen, handModel: "full" }, RAW);
    expect(90 - 40).toBeGreaterThan(PEAK_DISAGREEMENT_DEG);
    expect(pair.modelsDisagree).toBe(true);
    expect(pair.reps).toBe(3);
    expect(pair.peakDeg!).toBeGreaterThan(60);
    expect(pair.peakDeg!).toBeLessThan(70);
    expect(pair.peakDeg! - pair.uncertaintyDeg!).toBeLessThanOrEqual(pair.byModel[0].peakDeg!);
    expect(pair.peakDeg! + pair.uncertaintyDeg!).toBeGreaterThanOrEqual(pair.byModel[1].peakDeg!);
    expect(pair.warnings.join(" ")).toMatch(/two hand models disagree.*\(lite\).*\(full\)/);
  });

  it("warns when the combined peak falls far from both models' own, though those two agree", () => {
    // Each model loses the bend in a different cycle: their own best peaks (90°, 84°) agree within 20°, but no cycle
    // reads high in both, so the combined best peak lies far below either.
    const one = buildSyntheticCapture({ ...pipSpec(90, 9), reps: [{ peakDeg: 90 }, { peakDeg: 30 }, { peakDeg: 30 }] });
    const two = buildSyntheticCapture({ ...pipSpec(90, 10), reps: [{ peakDeg: 30 }, { peakDeg: 84 }, { peakDeg: 30 }] });
    const pair = analyzeCapturePair({ capture: one, handModel: "lite" }, { capture: two, handModel: "full" }, RAW);
    const [a, b] = pair.byModel.map((m) => m.peakDeg!);
    expect(Math.abs(a - b)).toBeLessThan(PEAK_DISAGREEMENT_DEG);
    expect(Math.max(a, b) - pair.peakDeg!).toBeGreaterThan(PEAK_DISAGREEMENT_DEG);
    expect(pair.modelsDisagree).toBe(true);
    expect(pair.warnings.join(" ")).toMatch(/read together/);
    // The stated interval still reaches both models' own peaks.
    expect(pair.peakDeg! + pair.uncertaintyDeg!).toBeGreaterThanOrEqual(Math.max(a, b));
  });

  it("reads a frame from whichever model found the hand", () => {
    const one = buildSyntheticCapture(pipSpec(80, 5, { noHandRate: 0.3 }));
    const two = buildSyntheticCapture(pipSpec(80, 6, { noHandRate: 0.3 }));
    const pair = analyzeCapturePair({ capture: one, handModel: "lite" }, { capture: two, handModel: "full" }, RAW);
    const either = one.frames.filter((f, i) => f.hand || two.frames[i].hand).length;
    expect(pair.usableFrames).toBe(either);
    expect(pair.usableFrames).toBeGreaterThan(Math.max(pair.byModel[0].usableFrames, pair.byModel[1].usableFrames));
  });

  it("takes the measured two-model figure, widened by the lower tracking score, where both models saw the frame from the same view", () => {
    // A table whose PIP cell for both models together is 3.3° in every view (the committed table has the little-finger side only).
    const table: UncertaintyTable = { ...UNCERTAINTY_TABLE, pairs: VALIDATION_VIEWS.map((view) => ({ group: "PIP flexion", view, models: ["lite", "full"], seeds: 1, clipMaeDeg: 1.6, uncertaintyDeg: 3.3 })) };
    const one = buildSyntheticCapture(pipSpec(80, 11));
    const two = buildSyntheticCapture(pipSpec(80, 12));
    const options = { uncertaintyTable: table };
    const updates = (capture: typeof one, handModel: "lite" | "full") => {
      const out: LiveUpdate[] = [];
      analyzeCapture(capture, { ...options, handModel, onUpdate: (u) => out.push(u) });
      return out;
    };
    const [u, v] = [updates(one, "lite"), updates(two, "full")];
    const pair = analyzeCapturePair({ capture: one, handModel: "lite" }, { capture: two, handModel: "full" }, options);
    let checked = 0;
    pair.frameReadings.forEach((reading, i) => {
      if (u[i].angleDeg === null || v[i].angleDeg === null || u[i].view !== v[i].view) return;
      const measured = Math.round(3.3 * trackingFactor(Math.min(u[i].score, v[i].score)) * 10) / 10;
      expect(reading.uncertaintyDeg).toBeCloseTo(Math.max(measured, Math.abs(u[i].angleDeg! - v[i].angleDeg!) / 2), 9);
      checked += 1;
    });
    expect(checked).toBeGreaterThan(100);
    // Narrower than the one-model rule (the larger stated interval plus half the difference) in those frames.
    const oneModelRule = analyzeCapturePair({ capture: one, handModel: "lite" }, { capture: two, handModel: "full" }, { uncertaintyTable: { ...table, pairs: [] } });
    const mean = (r: typeof pair) => r.frameReadings.reduce((sum, f) => sum + (f.uncertaintyDeg ?? 0), 0) / r.frameReadings.length;
    expect(mean(pair)).toBeLessThan(mean(oneModelRule));
    // The peak: the measured figure at the lower mean score, at least as far as the further model's own peak.
    const reach = Math.max(...pair.byModel.map((m) => Math.abs(pair.peakDeg! - m.peakDeg!)));
    const peakMeasured = Math.round(3.3 * trackingFactor(Math.min(pair.byModel[0].meanScore, pair.byModel[1].meanScore)) * 10) / 10;
    expect(pair.uncertaintyDeg).toBeCloseTo(Math.max(peakMeasured, reach), 9);
    // Where the held-out two-model peaks missed by more (their P90, here 20°), the peak takes that, widened alike.
    const withPeaks: UncertaintyTable = { ...table, pairs: table.pairs!.map((c) => ({ ...c, clipPeakP90Deg: 20 })) };
    const wide = analyzeCapturePair({ capture: one, handModel: "lite" }, { capture: two, handModel: "full" }, { uncertaintyTable: withPeaks });
    const lower = Math.min(pair.byModel[0].meanScore, pair.byModel[1].meanScore);
    expect(wide.uncertaintyDeg).toBeCloseTo(Math.max(Math.round(20 * trackingFactor(lower) * 10) / 10, reach), 9);
    expect(pairPeakUncertaintyDeg("pip.flexion", "index", "ulnar", 0.95, withPeaks)).toBe(20);
    expect(pairPeakUncertaintyDeg("pip.flexion", "index", "ulnar", 0.95, table)).toBeNull();
    // The frames keep the measured frame figure.
    expect(wide.frameReadings).toEqual(pair.frameReadings);
    // A finger tested on its own was not measured that way: the one-model rule stands.
    const alone = analyzeCapturePair({ capture: { ...one, oneFinger: true }, handModel: "lite" }, { capture: { ...two, oneFinger: true }, handModel: "full" }, options);
    const aloneRule = analyzeCapturePair({ capture: { ...one, oneFinger: true }, handModel: "lite" }, { capture: { ...two, oneFinger: true }, handModel: "full" }, { uncertaintyTable: { ...table, pairs: [] } });
    expect(alone.frameReadings).toEqual(aloneRule.frameReadings);
  });

  it("does not stand the test motions' two-model figure for frames the side-view estimator declined (a fist seen side-on)", () => {
    // A right fist, little-finger side toward the camera: outside the side-view estimator's domain.
    const pose = neutralPose();
    for (const f of ["index", "middle", "ring", "little"] as const) pose.fingers[f] = { ...pose.fingers[f], mcpFlexionDeg: 90, pipFlexionDeg: 100, dipFlexionDeg: 80 };
    const fist = poseHand(pose, "right", { forearmDistal: [0, -1, 0], forearmRadial: [0, 0, 1], wrist: [0, 0, 0.5] }).landmarks;
    const picture = pinholePicture(fist).map(([x, y]) => [x, y] as [number, number]);
    const base = buildSyntheticCapture({ ...pipSpec(80, 13), side: "right", digit: "middle" });
    const capture = { ...base, imageAspect: PINHOLE_ASPECT, frames: base.frames.slice(0, 30).map((f) => ({ ...f, score: 0.95, hand: fist, image: picture })) };
    // Every PIP cell: a measured two-model figure of 3.3°, and declined frames whose raw figure is 70° (the side-on fit not used).
    const table: UncertaintyTable = {
      ...UNCERTAINTY_TABLE,
      cells: UNCERTAINTY_TABLE.cells.map((c) =>
        c.group === "PIP flexion" && (c.view === "ulnar" || c.view === "radial")
          ? { ...c, declinedBySideFit: { samples: 100, rawMaeDeg: 30, rawP90Deg: 70, sideOnFitMaeDeg: null, sideOnFitP90Deg: null, sideOnFitHelps: false, rawUncertaintyDeg: 70, sideOnFitUncertaintyDeg: null } }
          : c,
      ),
      pairs: VALIDATION_VIEWS.map((view) => ({ group: "PIP flexion", view, models: ["lite", "full"], seeds: 1, clipMaeDeg: 1.6, uncertaintyDeg: 3.3 })),
    };
    const out: LiveUpdate[] = [];
    analyzeCapture(capture, { uncertaintyTable: table, handModel: "lite", onUpdate: (u) => out.push(u) });
    expect(out.every((u) => u.intervalMethod === "declined, raw")).toBe(true);
    const pair = analyzeCapturePair({ capture, handModel: "lite" }, { capture, handModel: "full" }, { uncertaintyTable: table });
    for (const reading of pair.frameReadings) expect(reading.uncertaintyDeg).toBeGreaterThanOrEqual(70);
    expect(pair.uncertaintyDeg).toBeGreaterThanOrEqual(70);
  });

  it("takes a finger's own two-model figure where the cell is split by finger (thumb side)", () => {
    const cell = { group: "MCP flexion", view: "radial" as const, models: ["lite", "full"] as ["lite", "full"], seeds: 1, clipMaeDeg: 5, uncertaintyDeg: 10.3 };
    const byDigit = [
      { digit: "index" as const, clipMaeDeg: 3, uncertaintyDeg: 6.2 },
      { digit: "little" as const, clipMaeDeg: 9, uncertaintyDeg: 18.6 },
    ];
    const table: UncertaintyTable = { ...UNCERTAINTY_TABLE, pairs: [{ ...cell, byDigit }] };
    expect(pairUncertaintyDeg("mcp.flexion", "index", "radial", 0.95, table)).toBe(6.2);
    expect(pairUncertaintyDeg("mcp.flexion", "little", "radial", 0.95, table)).toBe(18.6);
    // A finger the split does not name takes the cell's figure; at a score of 0.7 every figure is widened by half.
    expect(pairUncertaintyDeg("mcp.flexion", "ring", "radial", 0.95, table)).toBe(10.3);
    expect(pairUncertaintyDeg("mcp.flexion", "index", "radial", 0.7, table)).toBe(9.3);
    // No cell for the view, or for the joint: none.
    expect(pairUncertaintyDeg("mcp.flexion", "index", "ulnar", 0.95, table)).toBeNull();
    expect(pairUncertaintyDeg("pip.flexion", "index", "radial", 0.95, table)).toBeNull();
  });

  it("judges framing and the test plane once for the pair, not once per model", () => {
    // From the thumb side (gravity minimized, gravity along the hand's x axis: the synthetic placement's table plane)
    // the synthetic pinhole picture already fills about 68% of the height, past the band's 60%; the second model's
    // picture points are spread 10% wider about their centre, so each model alone would state its own percentage.
    const spec = pipSpec(80, 11, { condition: "gravity_minimized", gravity: [-9.8, 0, 0] });
    const one = buildSyntheticCapture(spec);
    const wider = buildSyntheticCapture({ ...spec, seed: 12 });
    for (const frame of wider.frames) {
      if (!frame.image) continue;
      const cx = frame.image.reduce((sum, p) => sum + p[0], 0) / frame.image.length;
      const cy = frame.image.reduce((sum, p) => sum + p[1], 0) / frame.image.length;
      frame.image = frame.image.map(([x, y]): [number, number] => [cx + (x - cx) * 1.1, cy + (y - cy) * 1.1]);
    }
    const pair = analyzeCapturePair({ capture: one, handModel: "lite" }, { capture: wider, handModel: "full" }, RAW);
    const filled = (warnings: readonly string[]) => warnings.filter((w) => /hand filled/.test(w));
    const percent = (w: string) => Number(/filled (\d+)%/.exec(w)![1]);
    const own = pair.byModel.map((m) => filled(m.warnings));
    expect(own.map((w) => w.length)).toEqual([1, 1]);
    expect(percent(own[0][0])).toBeLessThan(percent(own[1][0]));
    expect(filled(pair.warnings)).toHaveLength(1);
    const shared = percent(filled(pair.warnings)[0]);
    expect(shared).toBeGreaterThanOrEqual(percent(own[0][0]));
    expect(shared).toBeLessThanOrEqual(percent(own[1][0]));

    // Declared gravity minimized with gravity along the depth axis: the plane reads otherwise, said once, with the
    // combined reading's own axis, whatever each model's axis read alone.
    const tilted = { ...spec, gravity: [0, 0, -9.8] as [number, number, number] };
    const level = analyzeCapturePair(
      { capture: buildSyntheticCapture(tilted), handModel: "lite" },
      { capture: buildSyntheticCapture({ ...tilted, seed: 13 }), handModel: "full" },
      RAW,
    );
    const declared = level.warnings.filter((w) => w.startsWith("declared gravity_minimized"));
    expect(level.planeAgrees).toBe(false);
    expect(declared).toHaveLength(1);
    expect(declared[0]).toContain(`reads ${level.plane!.verdict} (axis ${level.plane!.axisToGravityDeg.toFixed(0)} deg`);
  });

  it("keeps one note on a finger tested on its own, the wider-interval model's, where each model quotes its own figures", () => {
    const lone = (seed: number) => ({ ...buildSyntheticCapture(pipSpec(70, seed)), oneFinger: true });
    const pair = analyzeCapturePair({ capture: lone(14), handModel: "lite" }, { capture: lone(15), handModel: "full" }, RAW);
    const notes = (warnings: readonly string[]) => warnings.filter((w) => w.startsWith("one finger tested on its own"));
    const [lite, full] = pair.byModel;
    expect(notes(lite.warnings)).toHaveLength(1);
    expect(notes(full.warnings)).toHaveLength(1);
    expect(notes(pair.warnings)).toEqual(notes((full.uncertaintyDeg ?? -1) > (lite.uncertaintyDeg ?? -1) ? full.warnings : lite.warnings));
  });

  it("refuses captures of different attempts, of different frames, or twice the same model", () => {
    const one = buildSyntheticCapture(pipSpec(80, 7));
    const other = buildSyntheticCapture({ ...pipSpec(80, 8), digit: "middle" });
    const shorter = { ...one, frames: one.frames.slice(1) };
    expect(() => analyzeCapturePair({ capture: one, handModel: "lite" }, { capture: other, handModel: "full" })).toThrow(/different attempts/);
    expect(() => analyzeCapturePair({ capture: one, handModel: "lite" }, { capture: shorter, handModel: "full" })).toThrow(/not of the same frames/);
    expect(() => analyzeCapturePair({ capture: one, handModel: "full" }, { capture: one, handModel: "full" })).toThrow(/two hand models expected/);
  });
});
