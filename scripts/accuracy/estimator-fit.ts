/**
 * Fitting of the finger-joint estimator (vision/estimator.ts) on tracked training stills. The estimator's form and
 * how it is applied live in the engine; fitting stays here with the renders.
 */
import { handAxes } from "@/vision/angles";
import {
  designRow,
  ESTIMATOR_FEATURES,
  ESTIMATOR_FINGERS,
  FINGER_JOINTS,
  modelFingerFeatures,
  quadraticTerms,
  type FingerJoint,
  type FingerJointFit,
} from "@/vision/estimator";
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { Matrix, solve } from "ml-matrix";
import { HUBER_DEG } from "./correction";
import { FINGER_FLEXION_SET } from "./motion-sets";
import { getPoseAngle, type PoseKey } from "./hand-pose";
import { RENDER_OUTPUT_ROOT } from "./renderer";
import { stillPicture, type TrackedStill } from "./report";
import { VALIDATION_SEED, withMovingKeys } from "./run-accuracy";
import { singleFingerMotionSetFrame, type TrackedSet } from "./tracked-set";

/** A tracked set saved by track-training.ts or an earlier fit, by name (`motions-77000001-600`); never the validation seed. */
export function loadTrackedSet(name: string): TrackedSet {
  if (name.includes(String(VALIDATION_SEED))) throw new Error(`${name}: the validation seed is never used for fitting or selection`);
  const file = path.join(RENDER_OUTPUT_ROOT, "tracked", `set-${name}-lite-full.json`);
  if (!existsSync(file)) throw new Error(`${file}: no such tracked set; render it with scripts/accuracy/track-training.ts`);
  const set = JSON.parse(readFileSync(file, "utf8")) as TrackedSet;
  return name.startsWith("single-finger-motions") ? withMovingKeys(set, singleFingerMotionSetFrame()) : set;
}

/** The feature list samples are built for: the committed estimator's (world, then picture features). */
export const ESTIMATOR_MODEL_FEATURES = { features: ESTIMATOR_FEATURES };

export interface FingerSample {
  model: string;
  /** Which still it came from: folds of a cross-validation keep a still's fingers together. */
  stillId: string;
  motion: string | null;
  view: string;
  finger: string;
  /** In a single-finger still: whether this finger is the one moving (null in other stills). */
  moving: boolean | null;
  base: number[];
  truthDeg: Record<FingerJoint, number>;
}

const JOINT_KEY: Record<FingerJoint, "mcpFlexionDeg" | "pipFlexionDeg" | "dipFlexionDeg"> = {
  mcp: "mcpFlexionDeg",
  pip: "pipFlexionDeg",
  dip: "dipFlexionDeg",
};

export function fingerPoseKey(finger: string, joint: FingerJoint): PoseKey {
  return `${finger}.${JOINT_KEY[joint]}` as PoseKey;
}

/**
 * One sample per finger of every tracked still (untracked stills and unreadable fingers give none). A set lists its
 * stills once per hand model, in the same order, so still i of every model shares the id `name#i`.
 */
export function fingerSamples(set: { stills: readonly TrackedStill[]; count: number }, setName: string): FingerSample[] {
  const samples: FingerSample[] = [];
  set.stills.forEach((still, index) => {
    if (!still.hand) return;
    for (const finger of ESTIMATOR_FINGERS) {
      const base = modelFingerFeatures(ESTIMATOR_MODEL_FEATURES, still.hand, still.truth.side, finger, handAxes(still.hand, still.truth.side), stillPicture(still));
      if (!base) continue;
      samples.push({
        model: still.model,
        stillId: `${setName}#${index % set.count}`,
        motion: still.motion ?? null,
        view: still.truth.view,
        finger,
        moving: still.movingKeys ? still.movingKeys.some((key) => key.startsWith(`${finger}.`)) : null,
        base,
        truthDeg: Object.fromEntries(FINGER_JOINTS.map((joint) => [joint, getPoseAngle(still.truth.commandedDeg, fingerPoseKey(finger, joint))])) as Record<
          FingerJoint,
          number
        >,
      });
    }
  });
  return samples;
}

const TESTED_JOINT: Record<string, FingerJoint> = { "mcp.flexion": "mcp", "pip.flexion": "pip", "dip.flexion": "dip" };

/**
 * How much a sample counts in the fit of `joint`: a still of that joint's test motion counts 1; a still of the
 * fingers-flexed-together set counts `togetherWeight`; a resting finger of a single-finger still counts
 * `restingWeight`; anything else 0. A test motion moves one joint with the others
 * near rest, which is how the app asks a client to move, and the estimator is fitted to read that motion (measured
 * on training seeds: pooling the together set at full weight doubled held-out PIP error on the test motions).
 */
export function sampleWeight(sample: Pick<FingerSample, "motion" | "moving">, joint: FingerJoint, togetherWeight: number, restingWeight = 1): number {
  if (sample.motion && sample.motion in TESTED_JOINT) return TESTED_JOINT[sample.motion] === joint ? (sample.moving === false ? restingWeight : 1) : 0;
  return sample.motion === FINGER_FLEXION_SET ? togetherWeight : 0;
}

export interface FingerFitOptions {
  ridgeLambda: number;
  /** Residuals beyond this count linearly (Huber); see HUBER_DEG in ./correction. */
  huberDeg: number;
  /** Room above and below the training truth's range that estimates may take. */
  outputMarginDeg?: number;
  /** One weight per row (default 1): how much a kind of training still counts. */
  weights?: readonly number[];
  /**
   * One source label per row (e.g. stills and clips): the training domain is the union of each source's 1st-99th
   * percentile range, so a source with many rows (every clip frame) does not push a smaller one (side views only
   * stills show) into the tails, where the estimator would decline it.
   */
  sources?: readonly string[];
}

function meanOf(values: readonly number[]): number {
  return values.reduce((a, b) => a + b, 0) / values.length;
}

/**
 * Weighted ridge least squares, (X'WX + lambda*I') b = X'Wy with the intercept (column 0) unpenalised: the same
 * normal equations as ./correction ridgeFit, with X'WX summed in one pass over typed arrays because the quadratic
 * basis has ~150 columns and thousands of rows (ml-matrix's general product was ~10x slower here).
 */
export function weightedRidge(rows: readonly number[][], targets: readonly number[], lambda: number, weights?: readonly number[]): number[] {
  const n = rows.length;
  const p = rows[0].length;
  const xtx = new Float64Array(p * p);
  const xty = new Float64Array(p);
  for (let r = 0; r < n; r++) {
    const row = rows[r];
    const w = weights ? weights[r] : 1;
    const wy = w * targets[r];
    for (let i = 0; i < p; i++) {
      const wxi = w * row[i];
      if (wxi === 0) continue;
      xty[i] += row[i] * wy;
      const offset = i * p;
      for (let j = i; j < p; j++) xtx[offset + j] += wxi * row[j];
    }
  }
  const normal = Matrix.zeros(p, p);
  for (let i = 0; i < p; i++) for (let j = i; j < p; j++) {
    normal.set(i, j, xtx[i * p + j]);
    normal.set(j, i, xtx[i * p + j]);
  }
  for (let i = 1; i < p; i++) normal.set(i, i, normal.get(i, i) + lambda);
  return solve(normal, Matrix.columnVector([...xty])).getColumn(0);
}

/** Huber's M-estimate by reweighted ridge (as ./correction huberFit), fixed iteration count: deterministic. */
export function huberRidge(
  rows: readonly number[][],
  targets: readonly number[],
  lambda: number,
  huberDeg: number = HUBER_DEG,
  iterations = 12,
  sampleWeights?: readonly number[],
): number[] {
  let coefficients = weightedRidge(rows, targets, lambda, sampleWeights);
  for (let iteration = 0; iteration < iterations; iteration++) {
    const weights = rows.map((row, i) => {
      const residual = Math.abs(targets[i] - row.reduce((sum, value, k) => sum + value * coefficients[k], 0));
      return (sampleWeights?.[i] ?? 1) * (residual <= huberDeg ? 1 : huberDeg / residual);
    });
    coefficients = weightedRidge(rows, targets, lambda, weights);
  }
  return coefficients;
}

/**
 * Standardises each base feature on the training rows, expands to the quadratic basis and fits ridge coefficients
 * with Huber weights. Deterministic: no random starts, a fixed iteration count.
 */
export function fitFingerJoint(baseRows: readonly number[][], targets: readonly number[], options: FingerFitOptions): FingerJointFit {
  if (baseRows.length !== targets.length) throw new Error(`fitFingerJoint: expected one target per row, got ${baseRows.length} rows and ${targets.length} targets`);
  if (baseRows.length < 10) throw new Error(`fitFingerJoint: expected at least 10 rows, got ${baseRows.length}`);
  if (options.weights && options.weights.length !== baseRows.length) throw new Error(`fitFingerJoint: expected one weight per row, got ${options.weights.length}`);
  const width = baseRows[0].length;
  const means = Array.from({ length: width }, (_, i) => meanOf(baseRows.map((r) => r[i])));
  const sds = Array.from({ length: width }, (_, i) => {
    const sd = Math.sqrt(meanOf(baseRows.map((r) => (r[i] - means[i]) ** 2)));
    // A constant feature carries nothing; a unit scale keeps it harmless instead of dividing by zero.
    return sd > 1e-9 ? sd : 1;
  });
  const zRows = baseRows.map((r) => r.map((x, i) => (x - means[i]) / sds[i]));
  const zMin = Array.from({ length: width }, (_, i) => Math.min(...zRows.map((r) => r[i])));
  const zMax = Array.from({ length: width }, (_, i) => Math.max(...zRows.map((r) => r[i])));
  if (options.sources && options.sources.length !== baseRows.length) throw new Error(`fitFingerJoint: expected one source per row, got ${options.sources.length}`);
  const sourceRows = options.sources
    ? [...new Set(options.sources)].map((source) => zRows.filter((_, r) => options.sources![r] === source))
    : [zRows];
  const percentile = (rows: readonly number[][], i: number, q: number) => {
    const sorted = rows.map((r) => r[i]).sort((a, b) => a - b);
    return sorted[Math.min(sorted.length - 1, Math.max(0, Math.round(q * (sorted.length - 1))))];
  };
  const domainLowZ = Array.from({ length: width }, (_, i) => Math.min(...sourceRows.map((rows) => percentile(rows, i, 0.01))));
  const domainHighZ = Array.from({ length: width }, (_, i) => Math.max(...sourceRows.map((rows) => percentile(rows, i, 0.99))));
  const terms = quadraticTerms(width);
  const design = zRows.map((z) => designRow(terms, z));
  const coefficients = huberRidge(design, targets, options.ridgeLambda, options.huberDeg, 12, options.weights);
  const margin = options.outputMarginDeg ?? 10;
  const outputRangeDeg: [number, number] = [Math.min(...targets) - margin, Math.max(...targets) + margin];
  const predictions = design.map((row) => Math.min(outputRangeDeg[1], Math.max(outputRangeDeg[0], row.reduce((s, x, i) => s + x * coefficients[i], 0))));
  return {
    means,
    sds,
    zMin,
    zMax,
    domainLowZ,
    domainHighZ,
    terms,
    coefficients,
    outputRangeDeg,
    ridgeLambda: options.ridgeLambda,
    trainingSamples: baseRows.length,
    trainingMaeDeg: meanOf(predictions.map((p, i) => Math.abs(p - targets[i]))),
  };
}

/** Six decimals: the fit as the engine's JSON file keeps it (smaller files, the same estimates to well under 0.01 degree). */
export function roundedFit(fit: FingerJointFit): FingerJointFit {
  const round = (value: number) => Math.round(value * 1e6) / 1e6;
  return {
    ...fit,
    means: fit.means.map(round),
    sds: fit.sds.map(round),
    zMin: fit.zMin.map(round),
    zMax: fit.zMax.map(round),
    domainLowZ: fit.domainLowZ.map(round),
    domainHighZ: fit.domainHighZ.map(round),
    coefficients: fit.coefficients.map(round),
    outputRangeDeg: [round(fit.outputRangeDeg[0]), round(fit.outputRangeDeg[1])],
    trainingMaeDeg: round(fit.trainingMaeDeg),
  };
}
