import { Matrix, pseudoInverse } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { applyFingerFit, inTrainingDomain } from "@/vision/estimator";
import { ridgeFit } from "./correction";
import { fitFingerJoint, huberRidge, weightedRidge } from "./estimator-fit";
import { makeRng } from "./scene";
import { uniformFloat64 } from "pure-rand/distribution/uniformFloat64";

/** Rows of a seeded design: an intercept column and `width` uniform features in [-1, 1]. */
function design(seed: number, rows: number, width: number): number[][] {
  const rng = makeRng(seed);
  return Array.from({ length: rows }, () => [1, ...Array.from({ length: width }, () => 2 * uniformFloat64(rng) - 1)]);
}

describe("weighted ridge", () => {
  it("matches ml-matrix's closed form (X'WX + lambda I')^-1 X'Wy, intercept unpenalised", () => {
    const x = design(3, 200, 6);
    const y = x.map((r, i) => 2 + 3 * r[1] - r[4] + 0.5 * r[2] * r[3] + Math.sin(i));
    const w = x.map((_, i) => 0.5 + (i % 3));
    for (const lambda of [0, 0.5, 10]) {
      const fast = weightedRidge(x, y, lambda, w);
      const reference = ridgeFit(x, y, lambda, w);
      fast.forEach((b, i) => expect(b).toBeCloseTo(reference[i], 9));
    }
  });

  it("with no penalty is ordinary least squares: the Moore-Penrose solution pinv(X) y", () => {
    const x = design(4, 120, 4);
    const y = x.map((r) => 1 - 2 * r[1] + 4 * r[3] + 0.1 * r[2] * r[2]);
    const ols = pseudoInverse(new Matrix(x)).mmul(Matrix.columnVector(y)).getColumn(0);
    weightedRidge(x, y, 0).forEach((b, i) => expect(b).toBeCloseTo(ols[i], 9));
  });

  it("keeps Huber's estimate on the bulk of the data when a few rows are gross misreadings", () => {
    const x = design(5, 300, 2);
    const clean = x.map((r) => 10 + 5 * r[1] - 3 * r[2]);
    const spoiled = clean.map((v, i) => (i % 25 === 0 ? v + 150 : v));
    const robust = huberRidge(x, spoiled, 0, 10, 30);
    const plain = weightedRidge(x, spoiled, 0);
    expect(Math.abs(robust[0] - 10)).toBeLessThan(0.5);
    expect(Math.abs(plain[0] - 10)).toBeGreaterThan(4);
  });
});

describe("fitting one finger joint", () => {
  it("recovers a target that is exactly a quadratic in the standardised features", () => {
    const raw = design(6, 400, 3).map((r) => [20 + 30 * r[1], 0.5 + 0.2 * r[2], -r[3]]);
    const y = raw.map(([a, b, c]) => 5 + 0.8 * a - 40 * b * b + 0.02 * a * c);
    const fit = fitFingerJoint(raw, y, { ridgeLambda: 1e-9, huberDeg: 10, outputMarginDeg: 1000 });
    expect(fit.trainingMaeDeg).toBeLessThan(1e-6);
    // A point inside the training range that the fit never saw.
    const probe = [27, 0.61, 0.3];
    expect(applyFingerFit(fit, probe)).toBeCloseTo(5 + 0.8 * 27 - 40 * 0.61 * 0.61 + 0.02 * 27 * 0.3, 6);
  });

  it("is deterministic: the same rows give the same coefficients, bit for bit", () => {
    const raw = design(7, 150, 4).map((r) => r.slice(1));
    const y = raw.map((r, i) => 30 * r[0] + 10 * r[1] * r[2] + (i % 7));
    expect(fitFingerJoint(raw, y, { ridgeLambda: 10, huberDeg: 10 })).toEqual(fitFingerJoint(raw, y, { ridgeLambda: 10, huberDeg: 10 }));
  });

  it("refuses mismatched or too few rows, naming what it expected", () => {
    expect(() => fitFingerJoint([[1], [2]], [1], { ridgeLambda: 1, huberDeg: 10 })).toThrow(/one target per row/);
    expect(() => fitFingerJoint([[1], [2]], [1, 2], { ridgeLambda: 1, huberDeg: 10 })).toThrow(/at least 10 rows/);
  });
});

describe("the estimator's training domain with two sources of rows", () => {
  it("is the union of each source's 1st-99th percentile range, so many rows of one source do not push the other into the tails", () => {
    // 990 clip-like rows in [-1, 1] and 8 still-like rows at 10-10.7: pooled, the stills sit above the 99th percentile.
    const rows = [...Array.from({ length: 990 }, (_, i) => [((i % 30) - 15) / 15]), ...Array.from({ length: 8 }, (_, i) => [10 + i / 10])];
    const targets = rows.map((r) => 3 * r[0] + 1);
    const pooled = fitFingerJoint(rows, targets, { ridgeLambda: 0, huberDeg: 10 });
    const sources = rows.map((_, i) => (i < 990 ? "clips" : "stills"));
    const bySource = fitFingerJoint(rows, targets, { ridgeLambda: 0, huberDeg: 10, sources });
    const still = [10.5];
    expect(inTrainingDomain(pooled, still, 0)).toBe(false);
    expect(inTrainingDomain(bySource, still, 0)).toBe(true);
    // Far outside both sources' ranges is still refused.
    expect(inTrainingDomain(bySource, [40], 0)).toBe(false);
    expect(() => fitFingerJoint(rows, targets, { ridgeLambda: 0, huberDeg: 10, sources: sources.slice(1) })).toThrow(/one source per row/);
  });
});

