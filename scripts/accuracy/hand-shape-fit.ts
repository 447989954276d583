/**
 * The whole-hand-shape estimator (vision/correction-hand-shape.ts): selection, fit and its one held-out check.
 *
 *   npx tsx scripts/accuracy/hand-shape-fit.ts select [--sets a,b] [--lambdas 3,10,30] [--models lite,full]
 *     3-fold cross-validation over training stills only (grouped by still): ridge penalty, whole-hand features or
 *     not, with or without the palm/back/oblique stills of the fingers-together set.
 *   npx tsx scripts/accuracy/hand-shape-fit.ts select-clips --clip-seeds S1[,S2] --clip-holdout S3 [--clip-views palm,back]
 *       [--clip-weights 1] [--lambda 10] [--picture] [--still-folds]
 *     stills alone against stills plus the whole-hand-shape clips of training seeds (clip-validation.ts --view V),
 *     scored as the engine applies them on every third frame of another training seed's clips and, with
 *     --still-folds, on the training stills by 3-fold cross-validation (the clips always in training).
 *   npx tsx scripts/accuracy/hand-shape-fit.ts fit --sets a,b --lambda L [--whole-hand] [--picture]
 *       [--clip-seeds S1,S2 --clip-views V [--clip-joints mcp] [--clip-weight 0.3]]
 *     fits on training sets (and training clips) and writes vision/correction-hand-shape.json.
 *   npx tsx scripts/accuracy/hand-shape-fit.ts holdout [--count 300] [--reuse]
 *     renders and tracks the held-out set (seed HAND_SHAPE_HOLDOUT_SEED, never used for fitting or selection), scores
 *     raw and the estimator as the engine applies it, and writes vision/correction-hand-shape-validation.json.
 *   npx tsx scripts/accuracy/hand-shape-fit.ts side-check
 *     through the engine's live pipeline, without and with the hand-shape estimator and its table cells: the
 *     side-view test motions of the validation set (motions-20261202-360; the side views must read as before) and
 *     the held-out whole-hand shapes (as the app would read them, depth mirror and measured view included).
 *
 * `--family down` (select, fit, holdout) works on the second fit instead: the same shapes seen from above the back of
 * a hand lying on a table (view `down`), trained on hand-shapes-down-77000103-300, held out on seed 20261213 (was 20261208), written to
 * vision/correction-hand-shape-down.json and its -validation.json. The first fit (`front`: palm, back, oblique) is
 * left as it was, so its held-out figures stand. `--family side` works on the third: the same shapes seen side-on
 * (thumb side, little-finger side), trained on hand-shapes-side-77000411-400, held out on seed 20261237, written to
 * vision/correction-hand-shape-side.json and its -validation.json; it reads only frames the side-view estimator
 * declines, and its holdout scores it that way through the live pipeline (scoreSideHoldout).
 *
 * Training sets must come from training seeds (77000xxx); any set of a held-out seed (202612xx) is refused here except by holdout.
 */
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { parseArgs } from "node:util";
import type { Side } from "@/lib/motions/catalog";
import { handAxes } from "@/vision/angles";
import type { TrackedFrame } from "@/vision/live/types";
import type { ValidationView } from "@/vision/correction-views";
import type { UncertaintyTable } from "@/vision/uncertainty";
import {
  CURL_FEATURE_INDEXES,
  estimateHandShapeJointDeg,
  fingerSpreads,
  HAND_SHAPE_VIEWS,
  handShapeFeatureRows,
  isWholeHandShape,
  WHOLE_HAND_FEATURES,
  type HandShapeEstimatorModel,
  type HandSpreadRange,
} from "@/vision/correction-hand-shape";
import {
  applyFingerFit,
  ESTIMATOR_FINGERS,
  FINGER_FEATURES,
  FINGER_JOINTS,
  inTrainingDomain,
  PICTURE_FEATURES,
  type Finger,
  type FingerJoint,
  type FingerJointFit,
} from "@/vision/estimator";
import { HUBER_DEG } from "./correction";
import {
  correctionClearlyHelps,
  HAND_SHAPE_DOWN_VALIDATION_FILE,
  HAND_SHAPE_SIDE_FILE,
  HAND_SHAPE_SIDE_VALIDATION_FILE,
  HAND_SHAPE_VALIDATION_FILE,
} from "./derive-uncertainty";
import { fingerPoseKey, fitFingerJoint, loadTrackedSet, roundedFit } from "./estimator-fit";
import { getPoseAngle } from "./hand-pose";
import { HAND_SHAPE_DOWN_VIEWS, HAND_SHAPE_SIDE_VIEWS, handShapeFrame } from "./motion-sets";
import { clipFolder, FIRST_TRAINING_SEED, mirroredClipFrames, trackedClipNames } from "./clip-training";
import { IMAGE_HEIGHT_PX, IMAGE_WIDTH_PX, type FrameTruth } from "./scene";
import { loadHandRig } from "./rig-files";
import { parseCount, parseModels } from "./run-accuracy";
import { nearestRankPercentile, summarizeErrors, type ErrorSummary } from "./stats";
import { trackRenderedSet, type TrackedSet } from "./tracked-set";
import { stillPicture, type TrackedStill } from "./report";

const HERE = path.dirname(fileURLToPath(import.meta.url));
export const HAND_SHAPE_FILE = path.join(HERE, "..", "..", "vision", "correction-hand-shape.json");
/** The one held-out seed of the whole-hand shapes: scored once, never fitted or selected on. */
/**
 * Held-out seeds, each scored once per fit it checks: 20261206 and 20261208 served kinarc-correction-3 to -6 and
 * were read twice while kinarc-correction-7 was chosen (scripts/accuracy/README.md, "Whole-hand shapes in motion"),
 * so kinarc-correction-7 is checked on fresh ones.
 */
export const HAND_SHAPE_HOLDOUT_SEED = 20_261_212;

/**
 * The two whole-hand-shape fits: `front` (palm, back, oblique; kinarc-correction-3) and `down` (from above the back of
 * a hand on a table; kinarc-correction-4). Each has its own training set, held-out seed and files.
 */
export interface HandShapeFamily {
  name: "front" | "down" | "side";
  views: readonly ValidationView[];
  trainingSet: string;
  holdoutSeed: number;
  holdoutCount: number;
  file: string;
  validationFile: string;
}
export const HAND_SHAPE_FAMILIES: Record<HandShapeFamily["name"], HandShapeFamily> = {
  front: {
    name: "front",
    views: HAND_SHAPE_VIEWS,
    trainingSet: "hand-shapes-77000102-600",
    holdoutSeed: HAND_SHAPE_HOLDOUT_SEED,
    holdoutCount: 300,
    file: HAND_SHAPE_FILE,
    validationFile: HAND_SHAPE_VALIDATION_FILE,
  },
  down: {
    name: "down",
    views: HAND_SHAPE_DOWN_VIEWS,
    trainingSet: "hand-shapes-down-77000103-300",
    holdoutSeed: 20_261_213,
    holdoutCount: 300,
    file: path.join(HERE, "..", "..", "vision", "correction-hand-shape-down.json"),
    validationFile: HAND_SHAPE_DOWN_VALIDATION_FILE,
  },
  side: {
    name: "side",
    views: HAND_SHAPE_SIDE_VIEWS,
    trainingSet: "hand-shapes-side-77000411-400",
    holdoutSeed: 20_261_237,
    holdoutCount: 300,
    file: HAND_SHAPE_SIDE_FILE,
    validationFile: HAND_SHAPE_SIDE_VALIDATION_FILE,
  },
};

function familyOf(value: string | boolean | undefined): HandShapeFamily {
  const name = String(value ?? "front");
  if (name !== "front" && name !== "down" && name !== "side") throw new Error(`--family: expected front, down or side; got '${name}'`);
  return HAND_SHAPE_FAMILIES[name];
}
const FOLDS = 3;
/** Hand-shape stills take the three views in turn by index, so fold by index / 3 to keep every view in every fold. */
const foldOf = (s: HandShapeSample) => Math.floor(s.still / 3) % FOLDS;

export interface HandShapeSample {
  model: string;
  still: number;
  view: string;
  finger: string;
  /** The rows of all four fingers of the still (the engine's domain check reads them all), and this finger's index. */
  handRows: number[][];
  fingerIndex: number;
  truthDeg: Record<FingerJoint, number>;
  /** Where the row came from: a still of a training set, or a frame of a tracked training clip. */
  source?: "stills" | "clips";
}

/** Refuses sets of the held-out and validation seeds (2026120x, 2026121x) for fitting and selection. */
export function assertTrainingSet(name: string): void {
  if (/202612\d\d/.test(name)) throw new Error(`${name}: seeds 202612xx (2026120x-2026123x so far) are held out; fit and select on training seeds (77000xxx) only`);
}

/** One sample per finger of every tracked still seen from one of `views` (the front fit's palm, back and oblique). */
export function handShapeSamples(
  set: { stills: readonly TrackedStill[]; count: number },
  wholeHand: boolean,
  views: readonly string[] = HAND_SHAPE_VIEWS,
  picture = false,
): HandShapeSample[] {
  const samples: HandShapeSample[] = [];
  set.stills.forEach((still, index) => {
    if (!still.hand || !views.includes(still.truth.view)) return;
    const axes = handAxes(still.hand, still.truth.side);
    const inPicture = picture ? stillPicture(still) : undefined;
    const rows = axes ? handShapeFeatureRows(still.hand, still.truth.side, axes, wholeHand, inPicture) : null;
    if (!rows) return;
    const handRows = ESTIMATOR_FINGERS.map((f) => rows[f]);
    ESTIMATOR_FINGERS.forEach((finger, fingerIndex) =>
      samples.push({
        model: still.model,
        still: index % set.count,
        view: still.truth.view,
        finger,
        handRows,
        fingerIndex,
        truthDeg: Object.fromEntries(FINGER_JOINTS.map((j) => [j, getPoseAngle(still.truth.commandedDeg, fingerPoseKey(finger, j))])) as Record<FingerJoint, number>,
      }),
    );
  });
  return samples;
}

/**
 * How many standard deviations widen the finger-spread range: chosen as the side-view estimator's domain margin was
 * (vision/estimator.ts DOMAIN_MARGIN_SD), the smallest that keeps the estimator on at least 95% of the held-out folds'
 * stills in every view and model (`select`, training seed 77000102 only).
 */
export const HAND_SPREAD_MARGIN_SD = 1.5;

/**
 * The training range of each finger's curl minus the four fingers' mean (vision/correction-hand-shape.ts
 * HandSpreadRange): 1st-99th percentile, widened by `marginSd` standard deviations. Stills and clip frames are
 * ranged apart and the range is their union: clip frames (four fingers moving exactly together) outnumber the
 * stills, and pooled they would narrow the percentiles until the guard turned away the stills' own shapes.
 */
export function handSpreadRange(samples: readonly HandShapeSample[], marginSd: number = HAND_SPREAD_MARGIN_SD): HandSpreadRange {
  const sources = [...new Set(samples.map((s) => s.source ?? "stills"))];
  if (sources.length > 1) {
    const ranges = sources.map((source) => sourceSpreadRange(samples.filter((s) => (s.source ?? "stills") === source), marginSd));
    return {
      lowest: ranges[0].lowest.map((row, i) => row.map((_, k) => Math.min(...ranges.map((r) => r.lowest[i][k])))),
      highest: ranges[0].highest.map((row, i) => row.map((_, k) => Math.max(...ranges.map((r) => r.highest[i][k])))),
    };
  }
  return sourceSpreadRange(samples, marginSd);
}

function sourceSpreadRange(samples: readonly HandShapeSample[], marginSd: number): HandSpreadRange {
  const perStill = new Map<string, number[][]>();
  for (const s of samples) if (s.fingerIndex === 0) perStill.set(`${s.still}`, s.handRows);
  const spreads = [...perStill.values()].map((handRows) => fingerSpreads(Object.fromEntries(ESTIMATOR_FINGERS.map((f, i) => [f, handRows[i]])) as Record<Finger, number[]>));
  const range = (finger: Finger, k: number): [number, number] => {
    const values = spreads.map((d) => d[finger][k]).sort((a, b) => a - b);
    const at = (q: number) => values[Math.min(values.length - 1, Math.max(0, Math.round(q * (values.length - 1))))];
    const mean = values.reduce((a, b) => a + b, 0) / values.length;
    const sd = Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / values.length);
    return [round(at(0.01) - marginSd * sd), round(at(0.99) + marginSd * sd)];
  };
  const ranges = ESTIMATOR_FINGERS.map((finger) => CURL_FEATURE_INDEXES.map((_, k) => range(finger, k)));
  const lowest = ranges.map((perFeature) => perFeature.map(([low]) => low));
  const highest = ranges.map((perFeature) => perFeature.map(([, high]) => high));
  return { lowest, highest };
}

function handRowsOf(s: HandShapeSample): Record<Finger, number[]> {
  return Object.fromEntries(ESTIMATOR_FINGERS.map((f, i) => [f, s.handRows[i]])) as Record<Finger, number[]>;
}

function fitJoint(rows: readonly HandShapeSample[], joint: FingerJoint, lambda: number, clipWeight = 1): FingerJointFit {
  const weights = clipWeight === 1 ? undefined : rows.map((s) => (s.source === "clips" ? clipWeight : 1));
  // Clip frames and stills form separate training-domain sources (as the side-view estimator's): the many clip frames
  // must not push the stills' shapes into the tails, where the estimator would decline them.
  const sources = rows.some((s) => s.source === "clips") ? rows.map((s) => s.source ?? "stills") : undefined;
  return fitFingerJoint(rows.map((s) => s.handRows[s.fingerIndex]), rows.map((s) => s.truthDeg[joint]), { ridgeLambda: lambda, huberDeg: HUBER_DEG, sources, weights });
}

/**
 * Finger test motions rendered as clips from a whole-hand-shape view: `clip-validation.ts --view palm|back|down|oblique`
 * names them `<mcp|pip|dip>.flexion-<view>-<seed>-<i>-<clipSeed>`. All four fingers move together, so every frame
 * is a whole-hand shape (open hand at the start of each repetition, the tested joint bent at its end).
 */
const SHAPE_CLIP_NAME = /^(mcp|pip|dip)\.flexion-(palm|back|down|oblique)-(\d+)-\d+-\d+$/;

/** The names of a training seed's tracked whole-hand-shape clips from `views`, for one hand model. */
export function handShapeClipNames(seed: number, model: string, views: readonly string[]): string[] {
  if (!Number.isInteger(seed) || seed < FIRST_TRAINING_SEED) throw new Error(`clip training seed ${seed}: expected a training seed (${FIRST_TRAINING_SEED} or above); held-out seeds are never fitted on`);
  return trackedClipNames(seed, model, (name) => views.includes(SHAPE_CLIP_NAME.exec(name)?.[2] ?? ""));
}

/** A clip's commanded angles per frame, as clip-validation.ts writes them beside the video. */
export interface ShapeClipTruth {
  frameCount: number;
  frames: { truth: Pick<FrameTruth, "side" | "view" | "commandedDeg"> }[];
}

/**
 * One sample per finger of every `everyNth` frame of one tracked clip, read as the engine reads a clip: each tracked
 * frame through the depth mirror (vision/depth-mirror.ts), then the four fingers' rows. Every sample of a frame gets
 * the still id `stillBase + frame index`.
 */
export function handShapeClipFrameSamples(
  name: string,
  model: string,
  frames: readonly TrackedFrame[],
  truth: ShapeClipTruth,
  options: { everyNth: number; stillBase: number; wholeHand: boolean; picture?: boolean },
): HandShapeSample[] {
  if (frames.length !== truth.frameCount) throw new Error(`${name} (${model}): tracked ${frames.length} frames, the clip has ${truth.frameCount}`);
  const side = truth.frames[0].truth.side as Side;
  const samples: HandShapeSample[] = [];
  for (const frame of mirroredClipFrames(frames, side, options.everyNth)) {
    const { index, hand, axes } = frame;
    const rows = handShapeFeatureRows(hand, side, axes, options.wholeHand, options.picture ? frame.picture : undefined);
    if (!rows) continue;
    const handRows = ESTIMATOR_FINGERS.map((f) => rows[f]);
    const commanded = truth.frames[index].truth.commandedDeg;
    ESTIMATOR_FINGERS.forEach((finger, fingerIndex) =>
      samples.push({
        model,
        still: options.stillBase + index,
        view: truth.frames[index].truth.view,
        finger,
        handRows,
        fingerIndex,
        truthDeg: Object.fromEntries(FINGER_JOINTS.map((j) => [j, getPoseAngle(commanded, fingerPoseKey(finger, j))])) as Record<FingerJoint, number>,
        source: "clips",
      }),
    );
  }
  return samples;
}

/**
 * Samples from every tracked whole-hand-shape clip of the training seeds from `views` (every `everyNth` frame). Still
 * ids are unique per clip frame and group by clip, so folds never split a clip.
 */
export function handShapeClipSamples(
  seeds: readonly number[],
  models: readonly string[],
  views: readonly string[],
  wholeHand: boolean,
  everyNth = 3,
  picture = false,
): HandShapeSample[] {
  return seeds.flatMap((seed, seedIndex) =>
    models.flatMap((model) => {
      const folder = clipFolder(seed);
      const names = handShapeClipNames(seed, model, views);
      if (!names.length) throw new Error(`${folder}: no tracked whole-hand-shape clips (${views.join(", ")}) for ${model}; render them with clip-validation.ts --seeds ${seed} --view V`);
      return names.flatMap((name, clipIndex) => {
        const frames = JSON.parse(readFileSync(path.join(folder, `${name}-${model}.tracked.json`), "utf8")) as TrackedFrame[];
        const truth = JSON.parse(readFileSync(path.join(folder, `${name}.json`), "utf8")) as ShapeClipTruth;
        return handShapeClipFrameSamples(name, model, frames, truth, { everyNth, wholeHand, picture, stillBase: CLIP_STILL_BASE + (seedIndex * 1000 + clipIndex) * CLIP_FRAME_SPAN });
      });
    }),
  );
}
/** Clip-frame still ids start here (set stills sit below 1 000 000 per set) and leave room for a clip's frames. */
const CLIP_STILL_BASE = 1_000_000_000;
const CLIP_FRAME_SPAN = 10_000;


/** The estimate as the engine makes it from a fit: the estimator where the hand's shape lies in its domain, else raw. */
function engineEstimate(fit: FingerJointFit, spread: HandSpreadRange, s: HandShapeSample, joint: FingerJoint): { deg: number; applied: boolean } {
  const applied = isWholeHandShape(spread, handRowsOf(s)) && s.handRows.every((row) => inTrainingDomain(fit, row));
  return { deg: applied ? applyFingerFit(fit, s.handRows[s.fingerIndex]) : rawDeg(s, joint), applied };
}

function rawDeg(s: HandShapeSample, joint: FingerJoint): number {
  return s.handRows[s.fingerIndex][FINGER_FEATURES.indexOf(`${joint}Deg` as (typeof FINGER_FEATURES)[number])];
}

const fmt = (x: number | null | undefined, digits = 1) => (x === null || x === undefined ? "-" : x.toFixed(digits));

function loadSets(names: readonly string[], wholeHand: boolean, views: readonly string[], picture = false): HandShapeSample[] {
  return names.flatMap((name, setIndex) => {
    assertTrainingSet(name);
    // Still ids must not collide across sets: folds group by still. Other sets add their palm/back/oblique stills too.
    const setViews = setIndex === 0 ? views : [...new Set([...views, ...HAND_SHAPE_VIEWS])];
    return handShapeSamples(loadTrackedSet(name), wholeHand, setViews, picture).map((s) => ({ ...s, still: s.still + setIndex * 1_000_000 }));
  });
}

function select(values: Record<string, string | boolean | undefined>): void {
  const lambdas = String(values.lambdas ?? "3,10,30").split(",").map(Number);
  const models = parseModels(values.models as string | undefined);
  const family = familyOf(values.family);
  const shapeSet = family.trainingSet;
  const variants = String(values.sets ?? `${shapeSet};${shapeSet},fingers-77000101-600`).split(";").map((v) => v.split(","));
  for (const model of models) {
    const own = loadSets([shapeSet], true, family.views).filter((s) => s.model === model);
    const kept = [0, 0.5, 1, 1.5, 2].map((margin) => {
      const shares = family.views.map((view) => {
        const results = Array.from({ length: FOLDS }, (_, fold) => {
          const spread = handSpreadRange(own.filter((s) => foldOf(s) !== fold), margin);
          return own.filter((s) => foldOf(s) === fold && s.view === view && s.fingerIndex === 0).map((s) => isWholeHandShape(spread, handRowsOf(s)));
        }).flat();
        return `${view} ${Math.round((results.filter(Boolean).length / Math.max(1, results.length)) * 100)}%`;
      });
      return `margin ${margin} sd: ${shares.join(", ")}`;
    });
    console.log(`${model} whole-hand-shape guard, share of held-out-fold stills kept: ${kept.join(" | ")}`);
  }
  if (values["spread-only"]) return;
  for (const wholeHand of [false, true]) {
    for (const sets of variants) {
      const all = loadSets(sets, wholeHand, family.views, Boolean(values.picture));
      // Scored on the hand-shape stills only, the kind the held-out set holds; other sets only add training rows.
      const scoredSet = 0;
      for (const model of models) {
        for (const joint of FINGER_JOINTS) {
          for (const lambda of lambdas) {
            const own = all.filter((s) => s.model === model);
            const results = Array.from({ length: FOLDS }, (_, fold) => {
              const train = own.filter((s) => foldOf(s) !== fold);
              const fit = fitJoint(train, joint, lambda);
              const spread = handSpreadRange(train);
              return own
                .filter((s) => foldOf(s) === fold && Math.floor(s.still / 1_000_000) === scoredSet)
                .map((s) => ({ view: s.view, truthDeg: s.truthDeg[joint], raw: rawDeg(s, joint), ...engineEstimate(fit, spread, s, joint) }));
            }).flat();
            const cells = family.views.map((view) => cellSummary(view, results.filter((x) => x.view === view)));
            const overall = summarizeErrors(results.map((x) => ({ truthDeg: x.truthDeg, estimateDeg: x.deg }))).meanAbsoluteErrorDeg;
            console.log(`${model} ${joint} λ ${lambda} ${wholeHand ? "whole-hand" : "finger"} features, sets ${sets.join("+")}: ${cells.join(" | ")} | all ${fmt(overall)}`);
          }
        }
      }
    }
  }
}

/**
 * Selection with training clips (training seeds only): fitted on the family's training stills alone and on the stills
 * plus the whole-hand-shape clips of `--clip-seeds`, each scored as the engine applies it on every third frame of the
 * clips of `--clip-holdout` (another training seed), per view.
 */
function selectClips(values: Record<string, string | boolean | undefined>): void {
  const family = familyOf(values.family);
  const models = parseModels(values.models as string | undefined);
  const lambda = parseCount("lambda", (values.lambda as string | undefined) ?? "10", Number.NaN);
  const views = String(values["clip-views"] ?? (family.name === "down" ? "down" : "palm,back")).split(",");
  const trainSeeds = String(values["clip-seeds"] ?? "").split(",").filter(Boolean).map((raw) => parseCount("clip-seeds", raw, 0));
  const holdoutSeed = parseCount("clip-holdout", values["clip-holdout"] as string | undefined, Number.NaN);
  // `--clip-weights none`: the stills-only variant alone (e.g. to compare feature sets quickly).
  const weights = values["clip-weights"] === "none" ? [] : String(values["clip-weights"] ?? "1").split(",").map(parseClipWeight);
  const picture = Boolean(values.picture);
  const stillFolds = Boolean(values["still-folds"]);
  const stills = loadSets([family.trainingSet], true, family.views, picture);
  const clips = handShapeClipSamples(trainSeeds, models, views, true, 3, picture);
  const scored = handShapeClipSamples([holdoutSeed], models, views, true, 3, picture);
  console.log(`${picture ? "with picture features; " : ""}stills ${family.trainingSet}; training clips ${trainSeeds.join(",")} (${views.join(", ")}); scored on clips ${holdoutSeed}; λ ${lambda}`);
  for (const model of models) {
    for (const joint of FINGER_JOINTS) {
      const variants: { label: string; rows: HandShapeSample[]; weight: number }[] = [
        { label: "stills only", rows: stills.filter((s) => s.model === model), weight: 1 },
        ...weights.map((weight) => ({ label: `+ clips (weight ${weight})`, rows: [...stills, ...clips].filter((s) => s.model === model), weight })),
      ];
      for (const { label, rows, weight } of variants) {
        const fit = fitJoint(rows, joint, lambda, weight);
        const spread = handSpreadRange(rows);
        const cells = views.map((view) => cellSummary(view, scored.filter((s) => s.model === model && s.view === view).map((s) => ({ truthDeg: s.truthDeg[joint], raw: rawDeg(s, joint), ...engineEstimate(fit, spread, s, joint) }))));
        console.log(`${model} ${joint} ${label}, clips ${holdoutSeed}: ${cells.join(" | ")}`);
        if (!stillFolds) continue;
        // The same variant scored on the training stills too (folds grouped by still, clips always in training): a fit
        // that reads clips well must not lose the stills' random whole-hand shapes.
        const own = stills.filter((s) => s.model === model);
        const extra = rows.filter((s) => s.source === "clips");
        const results = Array.from({ length: FOLDS }, (_, fold) => {
          const train = [...own.filter((s) => foldOf(s) !== fold), ...extra];
          const foldFit = fitJoint(train, joint, lambda, weight);
          const foldSpread = handSpreadRange(train);
          return own.filter((s) => foldOf(s) === fold).map((s) => ({ view: s.view, truthDeg: s.truthDeg[joint], raw: rawDeg(s, joint), ...engineEstimate(foldFit, foldSpread, s, joint) }));
        }).flat();
        const stillCells = family.views.map((view) => cellSummary(view, results.filter((x) => x.view === view)));
        console.log(`${model} ${joint} ${label}, stills (${FOLDS}-fold): ${stillCells.join(" | ")}`);
      }
    }
  }
}

function parseClipWeight(raw: string): number {
  const weight = Number(raw);
  if (!raw || !Number.isFinite(weight) || weight <= 0) throw new Error(`--clip-weights: expected positive numbers, comma-separated, or none; got '${raw}'`);
  return weight;
}

/** One view's cell of a selection line: raw and engine MAE, the engine's slope and the share of samples it read. */
function cellSummary(view: string, r: readonly { truthDeg: number; raw: number; deg: number; applied: boolean }[]): string {
  const after = summarizeErrors(r.map((x) => ({ truthDeg: x.truthDeg, estimateDeg: x.deg })));
  const raw = summarizeErrors(r.map((x) => ({ truthDeg: x.truthDeg, estimateDeg: x.raw })));
  const kept = r.filter((x) => x.applied).length / Math.max(1, r.length);
  return `${view} raw ${fmt(raw.meanAbsoluteErrorDeg)} -> ${fmt(after.meanAbsoluteErrorDeg)} slope ${fmt(after.slope, 2)} on ${Math.round(kept * 100)}%`;
}

function round(value: number): number {
  return Math.round(value * 1e6) / 1e6;
}

/** Training clips for a fit: seeds and views, and optionally only some joints (default all) at a weight (default 1). */
export interface ClipTraining {
  seeds: readonly number[];
  views: readonly string[];
  joints?: readonly FingerJoint[];
  weight?: number;
}

export function fitHandShapeEstimator(
  sets: readonly string[],
  lambda: number,
  wholeHand: boolean,
  models: readonly string[],
  views: readonly ValidationView[] = HAND_SHAPE_VIEWS,
  clips?: ClipTraining,
  picture = false,
): HandShapeEstimatorModel {
  const all = [...loadSets(sets, wholeHand, views, picture), ...(clips?.seeds.length ? handShapeClipSamples(clips.seeds, models, clips.views, wholeHand, 3, picture) : [])];
  const clipJoints = clips?.joints ?? FINGER_JOINTS;
  const fits: HandShapeEstimatorModel["fits"] = {};
  const handSpread: HandShapeEstimatorModel["handSpread"] = {};
  for (const model of models) {
    fits[model] = {};
    handSpread[model] = handSpreadRange(all.filter((s) => s.model === model));
    for (const joint of FINGER_JOINTS) {
      // Clip frames train only the joints selection gave them (select-clips --still-folds), at their weight.
      const rows = all.filter((s) => s.model === model && (s.source !== "clips" || clipJoints.includes(joint)));
      const fit = fitJoint(rows, joint, lambda, clips?.weight ?? 1);
      fits[model][joint] = roundedFit(fit);
      console.log(`${model} ${joint}: ${fit.trainingSamples} samples, training MAE ${fit.trainingMaeDeg.toFixed(1)} deg`);
    }
  }
  return {
    features: [...FINGER_FEATURES, ...(wholeHand ? WHOLE_HAND_FEATURES : []), ...(picture ? PICTURE_FEATURES : [])],
    wholeHandFeatures: wholeHand,
    handSpread,
    views,
    trainingSets: [...sets, ...(clips?.seeds.length ? clips.seeds.map((seed) => `clips-${seed}-${clips.views.join("+")}${clips.joints ? `-${clips.joints.join("+")}` : ""}${clips.weight !== undefined && clips.weight !== 1 ? `-weight-${clips.weight}` : ""}`) : [])],
    fits,
  };
}

export interface HandShapeValidationCell {
  group: "MCP flexion" | "PIP flexion" | "DIP flexion";
  view: string;
  model: string;
  samples: number;
  detectionRate: number;
  rawMaeDeg: number;
  rawSlope: number | null;
  correctedMaeDeg: number;
  correctedSlope: number | null;
  /** Share of detected samples the estimator read (the rest kept the raw angle: outside its domain or view). */
  estimatorShare: number;
  correctionHelps: boolean;
}

const GROUP_OF: Record<FingerJoint, HandShapeValidationCell["group"]> = { mcp: "MCP flexion", pip: "PIP flexion", dip: "DIP flexion" };

/** Scores raw and the estimator (as the engine applies it, measured view included) on a tracked held-out set. */
export function scoreHoldout(set: TrackedSet, model: HandShapeEstimatorModel): HandShapeValidationCell[] {
  const cells: HandShapeValidationCell[] = [];
  for (const handModel of Object.keys(model.fits)) {
    for (const joint of FINGER_JOINTS) {
      for (const view of model.views) {
        const stills = set.stills.filter((s) => s.model === handModel && s.truth.view === view);
        const raw: { truthDeg: number; estimateDeg: number | null }[] = [];
        const after: { truthDeg: number; estimateDeg: number | null }[] = [];
        let applied = 0;
        for (const still of stills) {
          for (const finger of ESTIMATOR_FINGERS) {
            const truthDeg = getPoseAngle(still.truth.commandedDeg, fingerPoseKey(finger, joint));
            const axes = still.hand ? handAxes(still.hand, still.truth.side) : null;
            const rows = still.hand && axes ? handShapeFeatureRows(still.hand, still.truth.side, axes, false) : null;
            if (!still.hand || !axes || !rows) {
              raw.push({ truthDeg, estimateDeg: null });
              after.push({ truthDeg, estimateDeg: null });
              continue;
            }
            const rawValue = rows[finger][FINGER_JOINTS.indexOf(joint)];
            const estimate = estimateHandShapeJointDeg(model, handModel, joint, still.hand, still.truth.side, finger, axes, stillPicture(still));
            if (estimate !== null) applied += 1;
            raw.push({ truthDeg, estimateDeg: rawValue });
            after.push({ truthDeg, estimateDeg: estimate ?? rawValue });
          }
        }
        const r: ErrorSummary = summarizeErrors(raw);
        const a: ErrorSummary = summarizeErrors(after);
        if (r.meanAbsoluteErrorDeg === null || a.meanAbsoluteErrorDeg === null) continue;
        cells.push({
          group: GROUP_OF[joint],
          view,
          model: handModel,
          samples: r.detected,
          detectionRate: round(r.detectionRate),
          rawMaeDeg: Math.round(r.meanAbsoluteErrorDeg * 10) / 10,
          rawSlope: r.slope === null ? null : Math.round(r.slope * 100) / 100,
          correctedMaeDeg: Math.round(a.meanAbsoluteErrorDeg * 10) / 10,
          correctedSlope: a.slope === null ? null : Math.round(a.slope * 100) / 100,
          estimatorShare: Math.round((applied / Math.max(1, r.detected)) * 1000) / 1000,
          correctionHelps: correctionClearlyHelps(r.meanAbsoluteErrorDeg, a.meanAbsoluteErrorDeg, r.detected),
        });
      }
    }
  }
  return cells;
}

/**
 * One cell of the side-on fit's held-out check (`holdout --family side`), read through the live pipeline as the app
 * reads a capture: `before` is the engine without the side-on fit (the side-view estimator, or the raw angle where it
 * declines), `after` with it. `declined` holds the frames the side-view estimator declined (read raw before), the
 * only frames the side-on fit may read: their raw error and their error with the fit.
 */
export interface SideHandShapeCell {
  group: HandShapeValidationCell["group"];
  view: string;
  model: string;
  samples: number;
  detectionRate: number;
  beforeMaeDeg: number;
  beforeSlope: number | null;
  afterMaeDeg: number;
  afterSlope: number | null;
  declined: {
    samples: number;
    rawMaeDeg: number | null;
    rawSlope: number | null;
    afterMaeDeg: number | null;
    afterSlope: number | null;
    /** 90th percentile of the absolute error there, raw and with the fit. */
    rawP90Deg: number | null;
    afterP90Deg: number | null;
    /** Share of the declined frames the side-on fit read (the rest stay raw: not a whole-hand shape, or outside its domain). */
    readShare: number;
    correctionHelps: boolean;
  };
}

/** Scores a tracked held-out set of side-on whole-hand shapes with and without the side-on fit, through the live pipeline. */
export async function scoreSideHoldout(set: TrackedSet, sideModel: HandShapeEstimatorModel, baseTable?: UncertaintyTable): Promise<SideHandShapeCell[]> {
  const { createLivePipeline } = await import("@/vision/pipeline");
  const { CORRECTION_MODEL } = await import("@/vision/correction");
  const UNCERTAINTY_TABLE = baseTable ?? (await import("@/vision/uncertainty")).UNCERTAINTY_TABLE;
  const others = (CORRECTION_MODEL.handShapeEstimators ?? []).filter((m) => !m.onlyWhereSideFitDeclines);
  // The engine reads a declined frame with the side-on fit only where the table says it helps (sideOnFitHelps); to
  // measure the fit, "after" opens that gate in every side-on cell (the interval figures are not read here).
  const gateOpen = {
    ...UNCERTAINTY_TABLE,
    cells: UNCERTAINTY_TABLE.cells.map((c) =>
      sideModel.views.includes(c.view)
        ? { ...c, declinedBySideFit: { samples: 0, rawMaeDeg: 0, rawP90Deg: 0, sideOnFitMaeDeg: null, sideOnFitP90Deg: null, sideOnFitHelps: true, rawUncertaintyDeg: 0, sideOnFitUncertaintyDeg: null } }
        : c,
    ),
  };
  const engines = {
    before: { correctionModel: { ...CORRECTION_MODEL, handShapeEstimators: others }, uncertaintyTable: UNCERTAINTY_TABLE },
    after: { correctionModel: { ...CORRECTION_MODEL, handShapeEstimators: [...others, sideModel] }, uncertaintyTable: gateOpen },
  };
  const cells: SideHandShapeCell[] = [];
  for (const handModel of Object.keys(sideModel.fits)) {
    for (const joint of FINGER_JOINTS) {
      const motion = `${joint}.flexion` as "mcp.flexion" | "pip.flexion" | "dip.flexion";
      for (const view of sideModel.views) {
        const stills = set.stills.filter((s) => s.model === handModel && s.truth.view === view);
        const before: { truthDeg: number; estimateDeg: number | null }[] = [];
        const after: { truthDeg: number; estimateDeg: number | null }[] = [];
        const declinedRaw: { truthDeg: number; estimateDeg: number | null }[] = [];
        const declinedAfter: { truthDeg: number; estimateDeg: number | null }[] = [];
        let read = 0;
        for (const still of stills) {
          for (const digit of ESTIMATOR_FINGERS) {
            const truthDeg = getPoseAngle(still.truth.commandedDeg, fingerPoseKey(digit, joint));
            const push = (engine: (typeof engines)["before"]) =>
              createLivePipeline({ motion, side: still.truth.side, digit, condition: "against_gravity", handModel: handModel as "lite" | "full", ...engine }).push({
                t: 0,
                score: still.score ?? 0,
                hand: still.hand ?? null,
                image: still.image,
                imageAspect: IMAGE_WIDTH_PX / IMAGE_HEIGHT_PX,
              });
            const b = push(engines.before);
            const a = push(engines.after);
            before.push({ truthDeg, estimateDeg: b.angleDeg });
            after.push({ truthDeg, estimateDeg: a.angleDeg });
            if (b.angleDeg !== null && !b.correctionVersion) {
              declinedRaw.push({ truthDeg, estimateDeg: b.angleDeg });
              declinedAfter.push({ truthDeg, estimateDeg: a.angleDeg });
              if (a.correctionVersion) read += 1;
            }
          }
        }
        const b = summarizeErrors(before);
        const a = summarizeErrors(after);
        if (b.meanAbsoluteErrorDeg === null || a.meanAbsoluteErrorDeg === null) continue;
        const dr = summarizeErrors(declinedRaw);
        const da = summarizeErrors(declinedAfter);
        const abs = (rows: typeof before) => rows.flatMap((r) => (r.estimateDeg === null ? [] : [Math.abs(r.estimateDeg - r.truthDeg)]));
        const r1 = (x: number | null) => (x === null ? null : Math.round(x * 10) / 10);
        const r2 = (x: number | null) => (x === null ? null : Math.round(x * 100) / 100);
        cells.push({
          group: GROUP_OF[joint],
          view,
          model: handModel,
          samples: b.detected,
          detectionRate: round(b.detectionRate),
          beforeMaeDeg: r1(b.meanAbsoluteErrorDeg)!,
          beforeSlope: r2(b.slope),
          afterMaeDeg: r1(a.meanAbsoluteErrorDeg)!,
          afterSlope: r2(a.slope),
          declined: {
            samples: declinedRaw.length,
            rawMaeDeg: r1(dr.meanAbsoluteErrorDeg),
            rawSlope: r2(dr.slope),
            afterMaeDeg: r1(da.meanAbsoluteErrorDeg),
            afterSlope: r2(da.slope),
            rawP90Deg: r1(nearestRankPercentile(abs(declinedRaw), 0.9)),
            afterP90Deg: r1(nearestRankPercentile(abs(declinedAfter), 0.9)),
            readShare: Math.round((read / Math.max(1, declinedRaw.length)) * 1000) / 1000,
            correctionHelps:
              dr.meanAbsoluteErrorDeg !== null && da.meanAbsoluteErrorDeg !== null && correctionClearlyHelps(dr.meanAbsoluteErrorDeg, da.meanAbsoluteErrorDeg, declinedRaw.length),
          },
        });
      }
    }
  }
  return cells;
}

async function sideHoldout(values: Record<string, string | boolean | undefined>, model: HandShapeEstimatorModel, family: HandShapeFamily): Promise<void> {
  const count = parseCount("count", values.count as string | undefined, family.holdoutCount);
  const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };
  const set = await trackRenderedSet({
    name: "hand-shapes-side",
    seed: family.holdoutSeed,
    count,
    models: parseModels(values.models as string | undefined),
    makeFrame: (frameSeed, index) => handShapeFrame(rigs, frameSeed, index, family.views),
    reuse: Boolean(values.reuse),
  });
  const cells = await scoreSideHoldout(set, model);
  const pct = (x: number) => `${Math.round(x * 100)}%`;
  const lines = [
    "| joint | view | model | samples | detected | engine MAE ° before → after | slope before → after | declined by the side fit | their raw MAE ° (slope, P90) | with the side-on fit (slope, P90) | read by it | clearly helps |",
    "| --- | --- | --- | ---: | ---: | --- | --- | ---: | --- | --- | ---: | --- |",
    ...cells.map(
      (c) =>
        `| ${c.group} | ${c.view} | ${c.model} | ${c.samples} | ${pct(c.detectionRate)} | ${fmt(c.beforeMaeDeg)} → ${fmt(c.afterMaeDeg)} | ${fmt(c.beforeSlope, 2)} → ${fmt(c.afterSlope, 2)} | ${c.declined.samples} | ${fmt(c.declined.rawMaeDeg)} (${fmt(c.declined.rawSlope, 2)}, ${fmt(c.declined.rawP90Deg)}) | ${fmt(c.declined.afterMaeDeg)} (${fmt(c.declined.afterSlope, 2)}, ${fmt(c.declined.afterP90Deg)}) | ${pct(c.declined.readShare)} | ${c.declined.correctionHelps ? "yes" : "no"} |`,
    ),
  ];
  console.log(lines.join("\n"));
  writeFileSync(
    family.validationFile,
    `${JSON.stringify({ seed: family.holdoutSeed, stills: count, trainingSets: model.trainingSets, rule: "declined.correctionHelps: on the frames the side-view estimator declines, held-out MAE with the side-on fit below raw by more than two standard errors (scripts/accuracy/derive-uncertainty.ts correctionClearlyHelps)", cells }, null, 2)}\n`,
  );
  console.error(`held-out cells -> ${family.validationFile}`);
}

async function holdout(values: Record<string, string | boolean | undefined>, model: HandShapeEstimatorModel, family: HandShapeFamily): Promise<void> {
  if (family.name === "side") return sideHoldout(values, model, family);
  const count = parseCount("count", values.count as string | undefined, family.holdoutCount);
  const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };
  const set = await trackRenderedSet({
    name: family.name === "front" ? "hand-shapes" : "hand-shapes-down",
    seed: family.holdoutSeed,
    count,
    models: parseModels(values.models as string | undefined),
    makeFrame: (frameSeed, index) => handShapeFrame(rigs, frameSeed, index, family.views),
    reuse: Boolean(values.reuse),
  });
  const cells = scoreHoldout(set, model);
  const lines = [
    "| joint | view | model | samples | detected | raw MAE ° | raw slope | estimator MAE ° | slope | estimator on | clearly helps |",
    "| --- | --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | --- |",
    ...cells.map(
      (c) =>
        `| ${c.group} | ${c.view} | ${c.model} | ${c.samples} | ${Math.round(c.detectionRate * 100)}% | ${fmt(c.rawMaeDeg)} | ${fmt(c.rawSlope, 2)} | ${fmt(c.correctedMaeDeg)} | ${fmt(c.correctedSlope, 2)} | ${Math.round(c.estimatorShare * 100)}% | ${c.correctionHelps ? "yes" : "no"} |`,
    ),
  ];
  console.log(lines.join("\n"));
  writeFileSync(
    family.validationFile,
    `${JSON.stringify({ seed: family.holdoutSeed, stills: count, trainingSets: model.trainingSets, rule: "correctionHelps: held-out MAE below raw by more than two standard errors (scripts/accuracy/derive-uncertainty.ts correctionClearlyHelps)", cells }, null, 2)}\n`,
  );
  console.error(`held-out cells -> ${family.validationFile}`);
}

/**
 * The finger test motions of the validation set, each finger's tested joint read frame by frame by the live pipeline
 * as the app reads it (view-picked cells of the uncertainty table), with and without the hand-shape estimator.
 */
async function sideCheck(): Promise<void> {
  const { createLivePipeline } = await import("@/vision/pipeline");
  const { CORRECTION_MODEL } = await import("@/vision/correction");
  const { deriveUncertaintyTable, parseAccuracyReport, readHandShapeRows, REPORT_FILE } = await import("./derive-uncertainty");
  const report = parseAccuracyReport(readFileSync(REPORT_FILE, "utf8"));
  const before = { model: { ...CORRECTION_MODEL, handShapeEstimators: undefined }, table: deriveUncertaintyTable(report, []) };
  const after = { model: CORRECTION_MODEL, table: deriveUncertaintyTable(report, readHandShapeRows()) };
  const load = (name: string) => JSON.parse(readFileSync(path.join(HERE, "..", "..", "tests", ".cache", "renders", "tracked", `set-${name}-lite-full.json`), "utf8")) as TrackedSet;
  // The side-view test motions (each still read for its own motion) and the held-out whole-hand shapes (every still
  // read for each finger motion): the engine's whole path, depth mirror and view-picked cells included.
  const checks = [
    { set: load("motions-20261202-360"), views: ["radial", "ulnar"], ownMotionOnly: true },
    { set: load(`hand-shapes-${HAND_SHAPE_HOLDOUT_SEED}-300`), views: [...HAND_SHAPE_VIEWS], ownMotionOnly: false },
  ];
  const lines = ["| motion | view | model | samples | before MAE ° | after MAE ° | frames read by the hand-shape estimator |", "| --- | --- | --- | ---: | ---: | ---: | ---: |"];
  for (const { set, views, ownMotionOnly } of checks) {
  for (const motion of ["mcp.flexion", "pip.flexion", "dip.flexion"] as const) {
    const joint = motion.split(".")[0] as FingerJoint;
    for (const view of views) {
      for (const handModel of ["lite", "full"] as const) {
        const errors = { before: [] as number[], after: [] as number[] };
        let handShapeFrames = 0;
        for (const still of set.stills.filter((s) => (!ownMotionOnly || s.motion === motion) && s.truth.view === view && s.model === handModel && s.hand)) {
          for (const digit of ESTIMATOR_FINGERS) {
            const truthDeg = getPoseAngle(still.truth.commandedDeg, fingerPoseKey(digit, joint));
            for (const [label, engine] of [["before", before], ["after", after]] as const) {
              const update = createLivePipeline({ motion, side: still.truth.side, digit, condition: "against_gravity", handModel, correctionModel: engine.model, uncertaintyTable: engine.table }).push({ t: 0, score: still.score, hand: still.hand, image: still.image, imageAspect: IMAGE_WIDTH_PX / IMAGE_HEIGHT_PX });
              if (update.angleDeg === null) continue;
              errors[label].push(Math.abs(update.angleDeg - truthDeg));
              if (label === "after" && update.correctionVersion && update.view && HAND_SHAPE_VIEWS.includes(update.view)) handShapeFrames += 1;
            }
          }
        }
        const mae = (xs: number[]) => (xs.length ? xs.reduce((a, b) => a + b, 0) / xs.length : null);
        lines.push(`| ${motion} | ${view} | ${handModel} | ${errors.after.length} | ${fmt(mae(errors.before))} | ${fmt(mae(errors.after))} | ${handShapeFrames} |`);
      }
    }
  }
  }
  console.log(lines.join("\n"));
}

async function main(): Promise<void> {
  const { values, positionals } = parseArgs({
    allowPositionals: true,
    options: {
      sets: { type: "string" },
      lambdas: { type: "string" },
      lambda: { type: "string" },
      models: { type: "string" },
      "whole-hand": { type: "boolean" },
      count: { type: "string" },
      reuse: { type: "boolean" },
      "spread-only": { type: "boolean" },
      family: { type: "string" },
      "clip-seeds": { type: "string" },
      "clip-holdout": { type: "string" },
      "clip-views": { type: "string" },
      "clip-weights": { type: "string" },
      picture: { type: "boolean" },
      "still-folds": { type: "boolean" },
      "clip-joints": { type: "string" },
      "clip-weight": { type: "string" },
    },
  });
  const command = positionals[0];
  if (command === "select") return select(values);
  if (command === "select-clips") return selectClips(values);
  if (command === "fit") {
    if (!values.sets) throw new Error("--sets: expected the training sets, comma-separated (e.g. hand-shapes-77000102-600)");
    const lambda = parseCount("lambda", values.lambda, Number.NaN);
    const family = familyOf(values.family);
    const clipSeeds = String(values["clip-seeds"] ?? "").split(",").filter(Boolean).map((raw) => parseCount("clip-seeds", raw, 0));
    const clipViews = String(values["clip-views"] ?? (family.name === "down" ? "down" : "palm,back")).split(",");
    const clipJoints = values["clip-joints"] === undefined ? undefined : String(values["clip-joints"]).split(",").map((joint) => {
      if (!(FINGER_JOINTS as readonly string[]).includes(joint)) throw new Error(`--clip-joints: expected some of ${FINGER_JOINTS.join(", ")}; got '${joint}'`);
      return joint as FingerJoint;
    });
    const clipWeight = values["clip-weight"] === undefined ? undefined : parseClipWeight(String(values["clip-weight"]));
    const fitted = fitHandShapeEstimator(values.sets.split(","), lambda, values["whole-hand"] ?? false, parseModels(values.models), family.views, { seeds: clipSeeds, views: clipViews, joints: clipJoints, weight: clipWeight }, Boolean(values.picture));
    // The side-on fit reads only what the side-view estimator declines (vision/correction.ts correctGroupAngle).
    const model: HandShapeEstimatorModel = family.name === "side" ? { ...fitted, onlyWhereSideFitDeclines: true } : fitted;
    writeFileSync(family.file, `${JSON.stringify(model, null, 2)}\n`);
    console.error(`hand-shape estimator -> ${family.file}`);
    return;
  }
  if (command === "holdout") {
    const family = familyOf(values.family);
    if (!existsSync(family.file)) throw new Error(`${family.file}: no fit; run \`hand-shape-fit.ts fit --family ${family.name}\` first`);
    return holdout(values, JSON.parse(readFileSync(family.file, "utf8")) as HandShapeEstimatorModel, family);
  }
  if (command === "side-check") return sideCheck();
  throw new Error(`command: expected select, fit, holdout or side-check; got '${command ?? ""}'`);
}

if (process.argv[1]?.endsWith("hand-shape-fit.ts")) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exitCode = 2;
  });
}
