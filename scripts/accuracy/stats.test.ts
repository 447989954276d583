import { describe, expect, it } from "vitest";
import { leastSquares, summarizeErrors } from "./stats";

describe("least squares", () => {
  it("fits Anscombe's first data set to y = 3.00 + 0.500 x", () => {
    // Anscombe, "Graphs in Statistical Analysis", The American Statistician 1973;27(1):17-21: all four sets share
    // the fit y = 3.00 + 0.500 x. Data values of set I [from memory].
    const x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
    const y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
    const fit = leastSquares(x, y)!;
    expect(fit.slope).toBeCloseTo(0.5, 3);
    expect(fit.intercept).toBeCloseTo(3.0, 2);
  });

  it("has no slope when the truth does not vary, and refuses mismatched lengths", () => {
    expect(leastSquares([5, 5, 5], [1, 2, 3])).toBeNull();
    expect(() => leastSquares([1, 2], [1])).toThrow(/equal length/);
  });
});

describe("error summary", () => {
  it("counts misses against detection only and reads bias, MAE and the 5/10 degree shares from the rest", () => {
    const truths = [0, 20, 40, 60, 80];
    // An estimate that reads 60% of the change plus 4 degrees, as raw landmarks under-read flexion.
    const samples = [
      ...truths.map((t) => ({ truthDeg: t, estimateDeg: 4 + 0.6 * t })),
      { truthDeg: 30, estimateDeg: null },
    ];
    const summary = summarizeErrors(samples);
    expect(summary.samples).toBe(6);
    expect(summary.detected).toBe(5);
    expect(summary.detectionRate).toBeCloseTo(5 / 6, 12);
    // Errors: 4, -4, -12, -20, -28 -> bias -12, MAE 13.6; within 5: two of five; within 10: two of five.
    expect(summary.biasDeg).toBeCloseTo(-12, 9);
    expect(summary.meanAbsoluteErrorDeg).toBeCloseTo(13.6, 9);
    expect(summary.slope).toBeCloseTo(0.6, 9);
    expect(summary.intercept).toBeCloseTo(4, 9);
    expect(summary.within5).toBeCloseTo(0.4, 12);
    expect(summary.within10).toBeCloseTo(0.4, 12);
  });

  it("reports nothing but the detection rate when nothing was detected", () => {
    const summary = summarizeErrors([{ truthDeg: 10, estimateDeg: null }]);
    expect(summary.detectionRate).toBe(0);
    expect(summary.meanAbsoluteErrorDeg).toBeNull();
    expect(summary.slope).toBeNull();
  });
});
