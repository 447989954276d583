import { describe, expect, it } from "vitest";
import { leastSquares, nearestRankPercentile, pearson, summarizeErrors } from "./stats";

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

describe("Pearson's correlation", () => {
  it("gives Anscombe's first data set r = 0.816", () => {
    // Anscombe 1973 (as above): the four sets share the correlation 0.816 [from memory].
    const x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
    const y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
    expect(pearson(x, y)).toBeCloseTo(0.816, 3);
    expect(pearson(x, y.map((v) => -2 * v + 1))).toBeCloseTo(-0.816, 3);
  });

  it("is null when either side does not vary, and refuses mismatched lengths", () => {
    expect(pearson([1, 2, 3], [4, 4, 4])).toBeNull();
    expect(pearson([1], [1])).toBeNull();
    expect(() => pearson([1, 2], [1])).toThrow(/equal length/);
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

describe("nearest-rank percentile", () => {
  // Worked example of the nearest-rank method (Wikipedia, "Percentile", from memory): for 15, 20, 35, 40, 50 the 30th
  // percentile is 20, the 40th 20, the 50th 35 and the 100th 50.
  it("reads the worked example", () => {
    const values = [50, 15, 40, 20, 35];
    expect(nearestRankPercentile(values, 0.3)).toBe(20);
    expect(nearestRankPercentile(values, 0.4)).toBe(20);
    expect(nearestRankPercentile(values, 0.5)).toBe(35);
    expect(nearestRankPercentile(values, 1)).toBe(50);
  });

  it("keeps at least p of the values at or below it, and refuses an empty list's figure or p outside (0, 1]", () => {
    const values = Array.from({ length: 40 }, (_, i) => (i * 7) % 40);
    const p90 = nearestRankPercentile(values, 0.9)!;
    expect(values.filter((v) => v <= p90).length / values.length).toBeGreaterThanOrEqual(0.9);
    expect(values.filter((v) => v < p90).length / values.length).toBeLessThan(0.9);
    expect(nearestRankPercentile([], 0.9)).toBeNull();
    expect(() => nearestRankPercentile(values, 0)).toThrow(/p in \(0, 1\]/);
    expect(() => nearestRankPercentile(values, 1.5)).toThrow(/p in \(0, 1\]/);
  });
});
