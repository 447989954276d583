import type { Side } from "@/lib/motions/catalog";
import { handAxes, type HandAxes } from "./angles";
import { viewOfAxes, type ValidationView } from "./correction-views";
import {
  applyFingerFit,
  ESTIMATOR_FINGERS,
  fingerFeatures,
  fingerPictureFeatures,
  inTrainingDomain,
  PICTURE_FEATURES,
  type Finger,
  type FingerJoint,
  type FingerJointFit,
  type FingerPicture,
} from "./estimator";
import type { HandLandmarks } from "./landmarks";

/**
 * Kinarc's whole-hand-shape estimator (part of kinarc-correction-3): finger MCP, PIP and DIP flexion when the palm or
 * the back of the hand faces the camera (or an oblique view between back and thumb side), and all four fingers take
 * one shape together (open hand, fist, hook, tabletop and shapes between), as the app asks a client to bend them.
 * The side-view finger estimator (./estimator.ts) was fitted on side views and reads these views no better than raw;
 * here the flexion lies mostly in depth, and the fit leans on how far each fingertip comes toward the wrist and how
 * foreshortened each phalanx is. Same form as the side-view estimator (ridge on the features and their pairwise
 * products, one fit per joint and hand model), fitted only on training renders of whole-hand shapes in these views
 * (scripts/accuracy/hand-shape-fit.ts); the engine applies it only in the cells where it beat raw on its held-out set
 * by more than two standard errors (vision/uncertainty-table.json, source "hand shapes").
 */
export const HAND_SHAPE_VIEWS: readonly ValidationView[] = ["palm", "back", "oblique"];

/**
 * With `wholeHandFeatures`, each finger's features are followed by these, the mean over the four fingers: in a
 * whole-hand shape every finger bends alike, so the hand's mean curl steadies one finger's noisy reading.
 */
export const WHOLE_HAND_FEATURES = ["handTipToMcp", "handTipToMcpImage", "handTipToWrist", "handTipToWristImage"] as const;
/** Where those four sit in FINGER_FEATURES (tipToMcp, tipToMcpImage, tipToWrist, tipToWristImage). */
export const CURL_FEATURE_INDEXES = [6, 7, 8, 9];

/** Each finger's curl features minus the four fingers' mean: how far the finger is from the hand's shape. */
export function fingerSpreads(rows: Record<Finger, number[]>): Record<Finger, number[]> {
  const means = CURL_FEATURE_INDEXES.map((i) => ESTIMATOR_FINGERS.reduce((sum, f) => sum + rows[f][i], 0) / ESTIMATOR_FINGERS.length);
  return Object.fromEntries(ESTIMATOR_FINGERS.map((f) => [f, CURL_FEATURE_INDEXES.map((i, k) => rows[f][i] - means[k])])) as Record<Finger, number[]>;
}

/** Whether all four fingers take one shape as closely as training's whole-hand shapes did. */
export function isWholeHandShape(range: HandSpreadRange, rows: Record<Finger, number[]>): boolean {
  const spreads = fingerSpreads(rows);
  return ESTIMATOR_FINGERS.every((f, i) => spreads[f].every((d, k) => d >= range.lowest[i][k] && d <= range.highest[i][k]));
}

/**
 * How far each finger's curl may lie from the four fingers' mean, per hand model: per finger (index, middle, ring,
 * little: their lengths differ, so each has its own range) the 1st-99th percentile range of (finger - mean) of
 * tipToMcp, tipToMcpImage, tipToWrist and tipToWristImage in training, widened by DOMAIN_MARGIN_SD of its spread.
 * Each finger's features alone may all lie in range while one finger bends and the others stay straight; that is not
 * a whole-hand shape, and the estimator declines it.
 */
export interface HandSpreadRange {
  lowest: number[][];
  highest: number[][];
}

export interface HandShapeEstimatorModel {
  features: readonly string[];
  wholeHandFeatures: boolean;
  /** By hand model. */
  handSpread: Record<string, HandSpreadRange>;
  views: readonly ValidationView[];
  /**
   * A fit that reads only the frames of its views that the side-view finger estimator (./estimator.ts) declines as
   * outside its training domain (kinarc-correction-9: whole-hand shapes seen side-on, such as a full fist, whose
   * fingertips come nearer the knuckles than any finger the side-view fit saw). Without it, the fit alone reads its
   * views (the palm, back and oblique fit; the fit from above).
   */
  onlyWhereSideFitDeclines?: boolean;
  trainingSets: readonly string[];
  /** By hand model, then joint. */
  fits: Record<string, Partial<Record<FingerJoint, FingerJointFit>>>;
}

/** Whether a hand-shape model reads the picture features too (its feature list holds them). */
export function handShapeUsesPicture(model: Pick<HandShapeEstimatorModel, "features">): boolean {
  return PICTURE_FEATURES.every((name) => model.features.includes(name));
}

/**
 * The features of all four fingers (each the estimator's row), or null when any finger cannot be read. With `picture`
 * (a model whose features include the picture ones), each row ends with that finger's picture features
 * (./estimator.ts PICTURE_FEATURES); null when the picture cannot be read.
 */
export function handShapeFeatureRows(
  hand: HandLandmarks,
  side: Side,
  axes: HandAxes,
  wholeHandFeatures: boolean,
  picture?: FingerPicture | null,
): Record<Finger, number[]> | null {
  if (picture === null) return null;
  const rows: Partial<Record<Finger, number[]>> = {};
  const inPicture: Partial<Record<Finger, number[]>> = {};
  for (const finger of ESTIMATOR_FINGERS) {
    const base = fingerFeatures(hand, side, finger, axes);
    if (!base) return null;
    rows[finger] = base;
    if (picture) {
      const own = fingerPictureFeatures(picture, finger);
      if (!own) return null;
      inPicture[finger] = own;
    }
  }
  const full = rows as Record<Finger, number[]>;
  const means = wholeHandFeatures ? CURL_FEATURE_INDEXES.map((i) => ESTIMATOR_FINGERS.reduce((sum, f) => sum + full[f][i], 0) / ESTIMATOR_FINGERS.length) : [];
  // Feature order as the model lists them: the finger's own, the whole hand's, then the picture's.
  return Object.fromEntries(ESTIMATOR_FINGERS.map((f) => [f, [...full[f], ...means, ...(inPicture[f] ?? [])]])) as Record<Finger, number[]>;
}

/**
 * The estimated flexion of one finger joint (degrees), or null when the model has no fit for the joint and hand
 * model, the view is not one it was fitted for, a finger cannot be read, one finger's curl is apart from the others'
 * (not a whole-hand shape), any of the four fingers lies outside the fit's training domain, or the model reads the
 * picture features and the frame has no picture: then the raw angle stands. `view`, when given, is the frame's view as
 * the engine measured it (correction-views.ts viewOfHand, which reads a side-on hand from the picture); else the view
 * comes from the 3-D axes alone, as the palm, back and oblique fit has always taken it.
 */
export function estimateHandShapeJointDeg(
  model: HandShapeEstimatorModel,
  handModel: string,
  joint: FingerJoint,
  hand: HandLandmarks,
  side: Side,
  finger: Finger,
  axes?: HandAxes,
  picture?: FingerPicture | null,
  measuredView?: ValidationView,
): number | null {
  const fit = model.fits[handModel]?.[joint];
  if (!fit) return null;
  const handAxesNow = axes ?? handAxes(hand, side);
  if (!handAxesNow) return null;
  const view = measuredView ?? viewOfAxes(handAxesNow);
  if (!model.views.includes(view)) return null;
  // A model fitted with the picture features reads a frame only with its picture (else the raw angle stands).
  const rows = handShapeFeatureRows(hand, side, handAxesNow, model.wholeHandFeatures, handShapeUsesPicture(model) ? (picture ?? null) : undefined);
  const spread = model.handSpread[handModel];
  if (!rows || !spread || !isWholeHandShape(spread, rows) || !ESTIMATOR_FINGERS.every((f) => inTrainingDomain(fit, rows[f]))) return null;
  return applyFingerFit(fit, rows[finger]);
}
