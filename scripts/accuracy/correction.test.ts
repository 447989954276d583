import { describe, expect, it } from "vitest";
import { applyCorrection, fitCorrection, huberFit, ridgeFit, type CorrectionSample } from "./correction";

describe("ridge least squares", () => {
  it("with no penalty is ordinary least squares: Anscombe's set I gives y = 3.00 + 0.500 x", () => {
    // Anscombe, The American Statistician 1973;27(1):17-21. Data values of set I [from memory].
    const x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
    const y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
    const [intercept, slope] = ridgeFit(x.map((v) => [1, v]), y, 0);
    expect(slope).toBeCloseTo(0.5, 3);
    expect(intercept).toBeCloseTo(3.0, 2);
  });

  it("shrinks the slope toward zero as the penalty grows (Hoerl & Kennard, Technometrics 1970;12:55-67)", () => {
    const rows = [1, 2, 3, 4, 5, 6].map((v) => [1, v]);
    const targets = [2, 4, 6, 8, 10, 12];
    const slopes = [0, 1, 10, 100].map((lambda) => ridgeFit(rows, targets, lambda)[1]);
    expect(slopes[0]).toBeCloseTo(2, 9);
    for (let i = 1; i < slopes.length; i++) expect(slopes[i]).toBeLessThan(slopes[i - 1]);
  });

  it("with Huber weights ignores a gross misreading that drags plain least squares (Huber, Ann Math Stat 1964)", () => {
    // y = 2x on 0..19, but one reading is 180 degrees off, as a flipped palm normal gives.
    const rows = Array.from({ length: 20 }, (_, i) => [1, i]);
    const targets = rows.map(([, x]) => 2 * x);
    targets[10] += 180;
    const plain = ridgeFit(rows, targets, 0);
    const robust = huberFit(rows, targets, 0, 10);
    expect(Math.abs(plain[1] - 2)).toBeGreaterThan(0.1);
    expect(robust[1]).toBeCloseTo(2, 1);
    expect(Math.abs(robust[0])).toBeLessThan(1);
  });

  it("names the problem when rows and targets disagree", () => {
    expect(() => ridgeFit([[1, 2]], [1, 2], 0)).toThrow(/one target per row/);
  });
});

describe("correction model", () => {
  // Raw readings that under-read a PIP by 40% with a 5 degree offset: a fitted correction must undo that.
  const samples: CorrectionSample[] = Array.from({ length: 80 }, (_, i) => {
    const truthDeg = (i * 97) % 100;
    const facing = (i % 10) / 9;
    return {
      model: "lite",
      key: i % 2 ? "index.pipFlexionDeg" : "ring.pipFlexionDeg",
      truthDeg,
      estimate: { deg: 5 + 0.6 * truthDeg, imagePlaneDeg: 0.9 * truthDeg * facing, planeFacing: facing, radialTowardCamera: i % 3 ? 0.8 : -0.8, palmTowardCamera: 0.1 * (i % 4) },
    };
  });

  it("recovers the truth from readings that follow a linear law in its features", () => {
    const model = fitCorrection(samples, { trainingSeed: 1, trainingStills: 80, ridgeLambda: 0 });
    expect(model.groups.lite["PIP flexion"].trainingSamples).toBe(80);
    expect(model.groups.lite["PIP flexion"].trainingMaeDeg).toBeLessThan(1e-6);
    const corrected = applyCorrection(model, "lite", "middle.pipFlexionDeg", {
      deg: 5 + 0.6 * 70,
      imagePlaneDeg: 0,
      planeFacing: 0,
      radialTowardCamera: 0.8,
      palmTowardCamera: 0.2,
    });
    expect(corrected).toBeCloseTo(70, 6);
  });

  it("leaves joints and models without enough training samples uncorrected", () => {
    const model = fitCorrection(samples.slice(0, 20), { trainingSeed: 1, trainingStills: 20 });
    expect(model.groups.lite).toBeUndefined();
    expect(applyCorrection(model, "lite", "index.pipFlexionDeg", samples[0].estimate)).toBeNull();
    const full = fitCorrection(samples, { trainingSeed: 1, trainingStills: 80 });
    expect(applyCorrection(full, "full", "index.pipFlexionDeg", samples[0].estimate)).toBeNull();
  });
});

describe("a correction file of another form", () => {
  it("is refused with the expected coefficient count named", () => {
    const model = fitCorrection(
      Array.from({ length: 40 }, (_, i) => ({
        model: "lite",
        key: "index.pipFlexionDeg" as const,
        truthDeg: i,
        estimate: { deg: i, imagePlaneDeg: i, planeFacing: (i % 5) / 4, radialTowardCamera: (i % 3) - 1, palmTowardCamera: (i % 7) / 7 },
      })),
      { trainingSeed: 1, trainingStills: 40 },
    );
    model.groups.lite["PIP flexion"].coefficients = [1, 2, 3, 4, 5, 6];
    expect(() =>
      applyCorrection(model, "lite", "index.pipFlexionDeg", { deg: 1, imagePlaneDeg: 1, planeFacing: 1, radialTowardCamera: 0, palmTowardCamera: 0 }),
    ).toThrow(/expected 10 coefficients/);
  });
});
