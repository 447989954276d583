import { Matrix, solve } from "ml-matrix";
import type { Digit } from "@/lib/motions/catalog";
import type { AngleEstimate } from "./estimates";
import type { PoseKey } from "./hand-pose";
import { JOINT_GROUPS } from "./joint-groups";
import { CORRECTION_FEATURES, CORRECTION_VERSION, correctGroupAngle, correctionFeatures, type CorrectionModel } from "@/vision/correction";

// The model's form, its coefficients and how it is applied live in the engine (vision/correction.ts), so the app and
// this report use one copy; fitting stays here with the training renders.
export {
  CORRECTION_FEATURES,
  CORRECTION_VERSION,
  correctionFeatures,
  type CorrectionGroupFit,
  type CorrectionModel,
} from "@/vision/correction";

/** Residuals beyond this count linearly in the fit: about twice a goniometer's error in the hand [common practice]. */
export const HUBER_DEG = 10;

export interface CorrectionSample {
  model: string;
  key: PoseKey;
  estimate: AngleEstimate;
  truthDeg: number;
}

const GROUP_OF = new Map<PoseKey, string>(JOINT_GROUPS.flatMap((group) => group.keys.map((key) => [key, group.label] as const)));

export function jointGroupOf(key: PoseKey): string | null {
  return GROUP_OF.get(key) ?? null;
}

/**
 * Weighted ridge least squares: (X'WX + lambda*I') b = X'Wy, the intercept left unpenalised. Weights default to 1
 * (plain ridge).
 */
export function ridgeFit(rows: number[][], targets: number[], lambda: number, weights?: readonly number[]): number[] {
  if (rows.length !== targets.length) throw new Error(`ridgeFit: expected one target per row, got ${rows.length} rows and ${targets.length} targets`);
  if (rows.length === 0) throw new Error("ridgeFit: expected at least one row");
  if (weights && weights.length !== rows.length) throw new Error(`ridgeFit: expected one weight per row, got ${weights.length}`);
  const x = new Matrix(rows);
  const xtw = x.transpose();
  if (weights) xtw.mulRowVector(weights);
  const normal = xtw.mmul(x);
  for (let i = 1; i < normal.columns; i++) normal.set(i, i, normal.get(i, i) + lambda);
  const rhs = xtw.mmul(Matrix.columnVector(targets));
  return solve(normal, rhs).getColumn(0);
}

/**
 * Huber's M-estimate by iteratively reweighted least squares (Huber, Ann Math Stat 1964;35:73-101): residuals
 * beyond `huberDeg` count linearly, not squared, so the tracker's gross misreadings (a palm normal flipped in an
 * edge-on view reads a wrist 180 degrees off) cannot drag the map. Fixed iteration count: deterministic.
 */
export function huberFit(rows: number[][], targets: number[], lambda: number, huberDeg: number, iterations = 20): number[] {
  let coefficients = ridgeFit(rows, targets, lambda);
  for (let iteration = 0; iteration < iterations; iteration++) {
    const weights = rows.map((row, i) => {
      const residual = Math.abs(targets[i] - row.reduce((sum, value, k) => sum + value * coefficients[k], 0));
      return residual <= huberDeg ? 1 : huberDeg / residual;
    });
    coefficients = ridgeFit(rows, targets, lambda, weights);
  }
  return coefficients;
}

/** Fits every joint group of every hand model found in `samples`. */
export function fitCorrection(
  samples: readonly CorrectionSample[],
  { trainingSeed, trainingStills, ridgeLambda = 1 }: { trainingSeed: number; trainingStills: number; ridgeLambda?: number },
): CorrectionModel {
  const groups: CorrectionModel["groups"] = {};
  const byCell = new Map<string, CorrectionSample[]>();
  for (const sample of samples) {
    const group = jointGroupOf(sample.key);
    if (!group) continue;
    const cell = `${sample.model}\u0000${group}`;
    byCell.set(cell, [...(byCell.get(cell) ?? []), sample]);
  }
  for (const [cell, cellSamples] of [...byCell].sort(([a], [b]) => a.localeCompare(b))) {
    const [model, group] = cell.split("\u0000");
    // Ten coefficients need clearly more than ten samples; a thin cell stays uncorrected rather than overfitted.
    if (cellSamples.length < 30) continue;
    const rows = cellSamples.map((s) => correctionFeatures(s.estimate));
    const targets = cellSamples.map((s) => s.truthDeg);
    const coefficients = huberFit(rows, targets, ridgeLambda, HUBER_DEG);
    const predictions = rows.map((row) => row.reduce((sum, value, i) => sum + value * coefficients[i], 0));
    const trainingMaeDeg = predictions.reduce((sum, p, i) => sum + Math.abs(p - targets[i]), 0) / predictions.length;
    groups[model] ??= {};
    groups[model][group] = { coefficients, trainingSamples: cellSamples.length, trainingMaeDeg };
  }
  return { version: CORRECTION_VERSION, features: CORRECTION_FEATURES, trainingSeed, trainingStills, ridgeLambda, groups };
}

/** The corrected angle, or null when the model has no fit for this joint and hand model. */
export function applyCorrection(model: CorrectionModel, handModel: string, key: PoseKey, estimate: AngleEstimate): number | null {
  const group = jointGroupOf(key);
  return group ? correctGroupAngle(model, handModel, group, estimate, key.split(".")[0] as Digit) : null;
}
