import { Matrix, solve } from "ml-matrix";
import type { AngleEstimate } from "./estimates";
import type { PoseKey } from "./hand-pose";
import { JOINT_GROUPS } from "./joint-groups";

/**
 * Kinarc's angle correction, version 1: per joint group and hand model, a linear map from what the raw landmarks
 * give to the joint angle,
 *
 *   angle = b . [1, deg, ip, facing, deg*facing, ip*facing, radial, deg*radial, palm, deg*palm]
 *
 * where `deg` is the engine's 3-D reading, `ip` its image-plane counterpart, `facing` how squarely the joint's plane
 * faces the camera (1 = in the image), and `radial` / `palm` which side of the hand faces the camera (cosines, from
 * the landmarks' own hand axes). The products let the fit lean on the image-plane angle when the plane faces the
 * camera, and let the under-reading differ between a thumb-side and a little-finger-side view. Fitted by ridge
 * regression (a small penalty keeps the map tame where one view dominates) with Huber weights against gross
 * misreadings; deterministic for a given training set.
 */
export const CORRECTION_FEATURES = [
  "1",
  "deg",
  "imagePlaneDeg",
  "facing",
  "deg*facing",
  "imagePlaneDeg*facing",
  "radial",
  "deg*radial",
  "palm",
  "deg*palm",
] as const;

export interface CorrectionGroupFit {
  coefficients: number[];
  trainingSamples: number;
  /** Mean absolute error of the fit on its own training samples (not a validation figure). */
  trainingMaeDeg: number;
}

export interface CorrectionModel {
  version: string;
  features: readonly string[];
  trainingSeed: number;
  trainingStills: number;
  ridgeLambda: number;
  /** By hand model ("lite", "full"), then joint group label. */
  groups: Record<string, Record<string, CorrectionGroupFit>>;
}

export const CORRECTION_VERSION = "kinarc-correction-1";

/** Residuals beyond this count linearly in the fit: about twice a goniometer's error in the hand [common practice]. */
export const HUBER_DEG = 10;

export function correctionFeatures(estimate: AngleEstimate): number[] {
  const { deg, imagePlaneDeg: ip, planeFacing: c, radialTowardCamera: r, palmTowardCamera: p } = estimate;
  return [1, deg, ip, c, deg * c, ip * c, r, deg * r, p, deg * p];
}

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
  const fit = group ? model.groups[handModel]?.[group] : undefined;
  if (!fit) return null;
  if (fit.coefficients.length !== CORRECTION_FEATURES.length) {
    throw new Error(`correction ${handModel} ${group}: expected ${CORRECTION_FEATURES.length} coefficients (${CORRECTION_FEATURES.join(", ")}), got ${fit.coefficients.length}; refit`);
  }
  return correctionFeatures(estimate).reduce((sum, value, i) => sum + value * fit.coefficients[i], 0);
}
