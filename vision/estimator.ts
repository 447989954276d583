import type { Side } from "@/lib/motions/catalog";
import { handAxes, readMotion, type HandAxes } from "./angles";
import { viewOfAxes, type ValidationView } from "./correction-views";
import { DIGIT_CHAIN, LANDMARK_COUNT, MIDDLE_MCP, WRIST, type HandLandmarks } from "./landmarks";
import { length, pictureTurnDeg, sub, type Vec3 } from "./vec";

/**
 * Kinarc's finger-joint estimator (part of kinarc-correction-2 and -3; side views). The landmark model does not put a finger's flexion
 * at the joint that made it: it spreads it over the finger's joints, under-reads PIP and DIP, and past about 60
 * degrees of PIP the reading folds back. One joint's own reading cannot undo that, so the estimator reads the whole
 * finger: its three joint angles in 3-D and in the image plane, how far the fingertip has come toward the MCP and the
 * wrist (a curl shortens both, whatever joint it sits in), how much each phalanx is foreshortened (a depth cue the
 * angle formula ignores), and which side of the hand faces the camera. A ridge regression on those features and
 * their pairwise products, fitted per joint (MCP, PIP, DIP) and hand model on training renders
 * (scripts/accuracy/fit-correction.ts), maps them to the joint's angle.
 *
 * The tracker's hand-presence score is not a feature: the renders were all tracked with high scores, so a fit could
 * not learn what a low score means; the uncertainty widens with it instead (vision/uncertainty.ts).
 */
export const FINGER_FEATURES = [
  "mcpDeg",
  "pipDeg",
  "dipDeg",
  "mcpImageDeg",
  "pipImageDeg",
  "dipImageDeg",
  // Tip-to-MCP distance over the finger's length, in 3-D and as seen in the image (x, y of camera axes).
  "tipToMcp",
  "tipToMcpImage",
  // Tip-to-wrist distance over the palm's length (wrist to middle MCP), 3-D and image.
  "tipToWrist",
  "tipToWristImage",
  // Each phalanx's length in the image over its 3-D length: 1 when it lies across the line of sight.
  "proximalInImage",
  "middleInImage",
  "distalInImage",
  // Cosines of the palm normal, the radial axis and the long axis with the direction to the camera.
  "palmTowardCamera",
  "radialTowardCamera",
  "distalTowardCamera",
] as const;
export type FingerFeatureName = (typeof FINGER_FEATURES)[number];

/**
 * Since kinarc-correction-6: the same finger read in the picture. The tracker's picture points are its primary
 * output; its 3-D (world) points come from a second head that bends the fingers its own way (with gravity minimized an
 * MCP angle measured in the picture read training clips about twice as truly as the corrected 3-D one;
 * scripts/accuracy/README.md). With the hand seen side-on the finger's bending plane lies in the picture, so the turns
 * between its segments there carry what the world points lose past about 60 degrees. Chosen on training seeds only
 * (README, "Picture features"): on the clips of training seed 77000403, little-finger side, lite, MCP 3.9 -> 3.1,
 * PIP 5.8 -> 4.2, DIP 9.7 -> 7.1 degrees; thumb side (gravity minimized) MCP 8.1 -> 4.9, DIP 12.1 -> 8.8.
 */
export const PICTURE_FEATURES = [
  // Unsigned turns between the finger's segments in the picture (wrist-MCP to MCP-PIP, and so on), degrees.
  "mcpPictureDeg",
  "pipPictureDeg",
  "dipPictureDeg",
  // Tip-to-MCP distance in the picture over the finger's picture length.
  "tipToMcpPicture",
  // The distal phalanx's picture length over the middle one's (foreshortening of a curling tip).
  "distalOverMiddlePicture",
] as const;

/** The features the committed estimator reads (kinarc-correction-6): the world features, then the picture features. */
export const ESTIMATOR_FEATURES: readonly string[] = [...FINGER_FEATURES, ...PICTURE_FEATURES];

/** The frame's 21 picture points ([x, y] as fractions of width and height) and the picture's width over its height. */
export interface FingerPicture {
  image: readonly (readonly number[])[];
  aspect: number;
}

export const FINGER_JOINTS = ["mcp", "pip", "dip"] as const;
export type FingerJoint = (typeof FINGER_JOINTS)[number];
export type Finger = "index" | "middle" | "ring" | "little";
export const ESTIMATOR_FINGERS: readonly Finger[] = ["index", "middle", "ring", "little"];

/** One fitted joint: standardisation of the base features, the product terms and their coefficients. */
export interface FingerJointFit {
  /** Per base feature: training mean and standard deviation (z = (x - mean) / sd), and the z range seen in training. */
  means: number[];
  sds: number[];
  zMin: number[];
  zMax: number[];
  /** The 1st and 99th percentiles of each standardised feature in training: the domain the fit speaks for. */
  domainLowZ: number[];
  domainHighZ: number[];
  /** Terms after the intercept: [i] a base feature, [i, j] a product (i may equal j). */
  terms: number[][];
  /** Intercept first, then one per term. */
  coefficients: number[];
  /** Estimates are held to the training truth's range widened by this margin, never extrapolated past it. */
  outputRangeDeg: [number, number];
  ridgeLambda: number;
  trainingSamples: number;
  trainingMaeDeg: number;
}

/** Fits that read a frame seen from one of `views` (the engine's view classification, vision/correction-views.ts). */
export interface FingerViewFits {
  views: readonly ValidationView[];
  /** By hand model, then joint. */
  fits: Record<string, Partial<Record<FingerJoint, FingerJointFit>>>;
  trainingSets: string[];
}

export interface FingerEstimatorModel {
  /** FINGER_FEATURES, followed since kinarc-correction-6 by PICTURE_FEATURES (then every frame read needs its picture). */
  features: readonly string[];
  /** By hand model, then joint: the fit for every side view without a view fit of its own. */
  fits: Record<string, Partial<Record<FingerJoint, FingerJointFit>>>;
  /**
   * Since kinarc-correction-5: fits for particular views, taken before `fits` when they hold the frame's view and
   * have the joint and hand model (the little-finger side, fitted on tracked clips as well as stills).
   */
  viewFits?: readonly FingerViewFits[];
}

/** The fit that reads a joint in a frame seen from `view`: a view fit that holds the view, else the general one. */
export function fingerFitFor(model: FingerEstimatorModel, handModel: string, joint: FingerJoint, view: ValidationView | null): FingerJointFit | undefined {
  const viewFit = view ? model.viewFits?.find((v) => v.views.includes(view) && v.fits[handModel]?.[joint]) : undefined;
  return viewFit?.fits[handModel]?.[joint] ?? model.fits[handModel]?.[joint];
}

const GROUP_JOINT: Record<string, FingerJoint> = { "MCP flexion": "mcp", "PIP flexion": "pip", "DIP flexion": "dip" };
/** The estimator's joint for a correction group label, or null for groups it does not cover. */
export function fingerJointOfGroup(group: string): FingerJoint | null {
  return GROUP_JOINT[group] ?? null;
}

function ratio(numerator: number, denominator: number): number {
  return denominator > 1e-9 ? numerator / denominator : Number.NaN;
}

const planar = (v: Vec3): number => Math.hypot(v[0], v[1]);

/**
 * The base features of one finger, in FINGER_FEATURES order, from 21 world landmarks (metres, camera axes). Null
 * when the hand's axes or a joint angle cannot be read.
 */
export function fingerFeatures(hand: HandLandmarks, side: Side, finger: Finger, axes: HandAxes | null = handAxes(hand, side)): number[] | null {
  if (!axes) return null;
  const mcpReading = readMotion("mcp.flexion", finger, hand, axes, null);
  const pipReading = readMotion("pip.flexion", finger, hand, axes, null);
  const dipReading = readMotion("dip.flexion", finger, hand, axes, null);
  if (!mcpReading || !pipReading || !dipReading) return null;
  const [mcp, pip, dip, tip] = DIGIT_CHAIN[finger];
  const proximal = sub(hand[pip], hand[mcp]);
  const middle = sub(hand[dip], hand[pip]);
  const distal = sub(hand[tip], hand[dip]);
  const fingerLength = length(proximal) + length(middle) + length(distal);
  const palmLength = length(sub(hand[MIDDLE_MCP], hand[WRIST]));
  const tipFromMcp = sub(hand[tip], hand[mcp]);
  const tipFromWrist = sub(hand[tip], hand[WRIST]);
  const values = [
    mcpReading.deg,
    pipReading.deg,
    dipReading.deg,
    mcpReading.imagePlaneDeg,
    pipReading.imagePlaneDeg,
    dipReading.imagePlaneDeg,
    ratio(length(tipFromMcp), fingerLength),
    ratio(planar(tipFromMcp), fingerLength),
    ratio(length(tipFromWrist), palmLength),
    ratio(planar(tipFromWrist), palmLength),
    ratio(planar(proximal), length(proximal)),
    ratio(planar(middle), length(middle)),
    ratio(planar(distal), length(distal)),
    // Camera axes: z points away from the camera, so "toward the camera" is -z.
    -axes.palmarNormal[2],
    -axes.radialAxis[2],
    -axes.longAxis[2],
  ];
  return values.every(Number.isFinite) ? values : null;
}

/**
 * The picture features of one finger, in PICTURE_FEATURES order, or null when a point is missing or a segment has no
 * length in the picture. x is scaled by the aspect so that turns are true angles in the picture.
 */
export function fingerPictureFeatures(picture: FingerPicture, finger: Finger): number[] | null {
  const { image, aspect } = picture;
  if (image.length !== LANDMARK_COUNT || !(aspect > 0)) return null;
  const [mcp, pip, dip, tip] = DIGIT_CHAIN[finger];
  const at = (i: number): [number, number] => [image[i][0] * aspect, image[i][1]];
  const [w, m, p, d, t] = [at(WRIST), at(mcp), at(pip), at(dip), at(tip)];
  const from = (a: [number, number], b: [number, number]) => [b[0] - a[0], b[1] - a[1]];
  const segments = [from(w, m), from(m, p), from(p, d), from(d, t)];
  const lengths = segments.map((v) => Math.hypot(v[0], v[1]));
  if (!lengths.every((l) => l > 1e-9) || !segments.flat().every(Number.isFinite)) return null;
  const fingerLength = lengths[1] + lengths[2] + lengths[3];
  const tipFromMcp = from(m, t);
  return [
    Math.abs(pictureTurnDeg(segments[0], segments[1])),
    Math.abs(pictureTurnDeg(segments[1], segments[2])),
    Math.abs(pictureTurnDeg(segments[2], segments[3])),
    Math.hypot(tipFromMcp[0], tipFromMcp[1]) / fingerLength,
    lengths[3] / lengths[2],
  ];
}

/** Whether a model's fits read the picture features too (and so need each frame's picture). */
export function usesPicture(model: Pick<FingerEstimatorModel, "features">): boolean {
  return model.features.length > FINGER_FEATURES.length;
}

/**
 * The features a model reads for one finger: the world features, then the picture features when the model uses them.
 * Null when any is unreadable, or the model needs a picture and the frame has none.
 */
export function modelFingerFeatures(
  model: Pick<FingerEstimatorModel, "features">,
  hand: HandLandmarks,
  side: Side,
  finger: Finger,
  axes: HandAxes | null | undefined,
  picture: FingerPicture | null | undefined,
): number[] | null {
  // No axes given: computed from the hand, as fingerFeatures does.
  const world = fingerFeatures(hand, side, finger, axes ?? undefined);
  if (!world || !usesPicture(model)) return world;
  const inPicture = picture ? fingerPictureFeatures(picture, finger) : null;
  return inPicture ? [...world, ...inPicture] : null;
}

/** All base features and their pairwise products (squares included): the small polynomial basis of the fit. */
export function quadraticTerms(featureCount: number): number[][] {
  const terms: number[][] = [];
  for (let i = 0; i < featureCount; i++) terms.push([i]);
  for (let i = 0; i < featureCount; i++) for (let j = i; j < featureCount; j++) terms.push([i, j]);
  return terms;
}

/**
 * How far (in training standard deviations) a feature may lie outside the range training saw before the estimator
 * declines to read the frame. The fit only knows its joint's test motion (the others held near straight, as the
 * catalog's test positions ask); a finger outside that, e.g. curled into a fist while the MCP is read, is not
 * something the fit has seen, and the raw angle (with its own, wider uncertainty) is the honest reading there.
 * Chosen on training seeds (select-estimator.ts --margins, holdout finger-motions-77000002-900): the smallest margin
 * that keeps the estimator on at least 95% of the held-out test-motion samples of every joint, view and model.
 */
export const DOMAIN_MARGIN_SD = 2;

/**
 * Whether each standardised base feature lies within its 1st-99th percentile range in training, widened by
 * `marginSd`. Percentiles, not the extremes: training holds a few gross tracker misreadings, and a range stretched to
 * them would admit almost anything.
 */
export function inTrainingDomain(fit: Pick<FingerJointFit, "means" | "sds" | "domainLowZ" | "domainHighZ">, base: readonly number[], marginSd = DOMAIN_MARGIN_SD): boolean {
  return base.every((x, i) => {
    const z = (x - fit.means[i]) / fit.sds[i];
    return z >= fit.domainLowZ[i] - marginSd && z <= fit.domainHighZ[i] + marginSd;
  });
}

/** Standardised base features, each held within the range training saw: a polynomial must not extrapolate. */
export function standardize(fit: Pick<FingerJointFit, "means" | "sds" | "zMin" | "zMax">, base: readonly number[]): number[] {
  return base.map((x, i) => Math.min(fit.zMax[i], Math.max(fit.zMin[i], (x - fit.means[i]) / fit.sds[i])));
}

/** The design row of a fit: intercept, then each term's product of standardised features. */
export function designRow(terms: readonly (readonly number[])[], z: readonly number[]): number[] {
  return [1, ...terms.map((term) => term.reduce((product, i) => product * z[i], 1))];
}

export function applyFingerFit(fit: FingerJointFit, base: readonly number[]): number {
  if (base.length !== fit.means.length) {
    throw new Error(`finger estimator: expected ${fit.means.length} base features, got ${base.length}; refit`);
  }
  if (fit.coefficients.length !== fit.terms.length + 1) {
    throw new Error(`finger estimator: expected ${fit.terms.length + 1} coefficients for ${fit.terms.length} terms, got ${fit.coefficients.length}; refit`);
  }
  const row = designRow(fit.terms, standardize(fit, base));
  const value = row.reduce((sum, x, i) => sum + x * fit.coefficients[i], 0);
  return Math.min(fit.outputRangeDeg[1], Math.max(fit.outputRangeDeg[0], value));
}

/**
 * The estimated flexion of one finger joint (degrees, flexion positive), or null when the model has no fit for the
 * joint and hand model, the finger's features cannot be read (a model that uses picture features needs `picture`),
 * or they lie outside the fit's training domain. Where the model has view fits, the fit is chosen by `view`, the
 * frame's view as the engine names it (viewOfHand: the picture decides a side-on hand), or without it by the 3-D axes.
 * Engine analysis-7: before it the 3-D axes chose here even where the picture had named the frame side-on, so a
 * thumb-side frame whose axes leaned toward the palm was read by the stills-only fit, and one whose axes named the
 * little-finger side by the fit for that side (calibration seeds 77000407-408: 8-65% of thumb-side frames, by joint
 * and hand model).
 */
export function estimateFingerJointDeg(
  model: FingerEstimatorModel,
  handModel: string,
  joint: FingerJoint,
  hand: HandLandmarks,
  side: Side,
  finger: Finger,
  axes?: HandAxes,
  picture?: FingerPicture | null,
  view?: ValidationView,
): number | null {
  const frameAxes = axes ?? handAxes(hand, side);
  const fit = fingerFitFor(model, handModel, joint, model.viewFits?.length ? (view ?? (frameAxes ? viewOfAxes(frameAxes) : null)) : null);
  if (!fit) return null;
  const base = modelFingerFeatures(model, hand, side, finger, frameAxes ?? null, picture);
  return base && inTrainingDomain(fit, base) ? applyFingerFit(fit, base) : null;
}
