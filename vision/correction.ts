import type { Digit, MotionId, Side } from "@/lib/motions/catalog";
import COEFFICIENTS from "./correction-coefficients.json";
import HAND_SHAPE_FIT from "./correction-hand-shape.json";
import HAND_SHAPE_DOWN_FIT from "./correction-hand-shape-down.json";
import HAND_SHAPE_SIDE_FIT from "./correction-hand-shape-side.json";
import WRIST_PICTURE_GAIN from "./wrist-picture-gain.json";
import { estimateHandShapeJointDeg, handShapeUsesPicture, type HandShapeEstimatorModel } from "./correction-hand-shape";
import { estimateFingerJointDeg, fingerJointOfGroup, usesPicture, type Finger, type FingerEstimatorModel, type FingerPicture } from "./estimator";
import { handAxes, type HandAxes } from "./angles";
import { viewFromHand, viewOfAxes, viewOfHand, type ValidationView } from "./correction-views";
import type { HandLandmarks } from "./landmarks";

/**
 * Kinarc's angle correction, version 5. Finger MCP, PIP and DIP flexion come from the finger estimator
 * (vision/estimator.ts), which reads the whole finger, fitted on side views (version 5: one fit per side, on tracked
 * clips of the test motions as well as stills, scripts/accuracy/clip-training.ts); seen from the palm, the back or obliquely
 * they come from the whole-hand-shape estimator (vision/correction-hand-shape.ts) instead, and seen from above the back
 * of a hand on a table from its second fit (version 4: vision/correction-hand-shape-down.json). The other joint groups
 * keep version 1's form: per joint group
 * and hand model, a linear map from what the raw landmarks give to the joint angle,
 *
 *   angle = b . [1, deg, ip, facing, deg*facing, ip*facing, radial, deg*radial, palm, deg*palm]
 *
 * where `deg` is the engine's 3-D reading, `ip` its image-plane counterpart, `facing` how squarely the joint's plane
 * faces the camera (1 = in the image), and `radial` / `palm` which side of the hand faces the camera (cosines, from
 * the landmarks' own hand axes). The products let the map lean on the image-plane angle when the plane faces the
 * camera, and let the under-reading differ between a thumb-side and a little-finger-side view. The coefficients are
 * fitted on training renders by scripts/accuracy/fit-correction.ts, which writes vision/correction-coefficients.json;
 * the app and the accuracy report read that one file.
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

export const CORRECTION_VERSION = "kinarc-correction-11";

/** Joint groups as the accuracy report names its rows: the four fingers share one fit per joint. */
export const CORRECTION_GROUPS = [
  "MCP flexion",
  "PIP flexion",
  "DIP flexion",
  "finger abduction",
  "thumb MCP flexion",
  "thumb IP flexion",
  "wrist flexion (+) / extension (-)",
  "wrist radial (+) / ulnar (-) deviation",
] as const;
export type CorrectionGroup = (typeof CORRECTION_GROUPS)[number];

/** Hand landmark models the tracker can run (vision/live/types.ts ModelVariant). */
export type HandModel = "lite" | "full";
export const HAND_MODELS: readonly HandModel[] = ["lite", "full"];

/** What the raw landmarks give for one joint in one frame: the correction's inputs. */
export interface RawAngleFeatures {
  /** From the 3-D (world) landmarks. */
  deg: number;
  /** The same angle as seen in the image plane. */
  imagePlaneDeg: number;
  /** |cos| between the joint's axis and the line of sight: 1 when the motion's plane lies in the image. */
  planeFacing: number;
  /** cos between the hand's radial axis and the direction to the camera: +1 thumb side toward it. */
  radialTowardCamera: number;
  /** cos between the palm's normal and the direction to the camera: +1 palm toward it. */
  palmTowardCamera: number;
  /** The frame's 21 world landmarks and the hand's side: the finger estimator reads the whole finger from them. */
  hand?: HandLandmarks;
  side?: Side;
  /** The hand's axes when the caller already has them for this frame (saves computing them again per frame). */
  axes?: HandAxes;
  /** The frame's view (viewOfHand) when the caller has already classified it, as the pipeline has. */
  view?: ValidationView;
  /** The frame's picture points: the finger estimator reads them too since kinarc-correction-6. */
  picture?: FingerPicture | null;
}

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
  /** By hand model ("lite", "full"), then joint group label: the linear maps. */
  groups: Record<string, Record<string, CorrectionGroupFit>>;
  /** Finger MCP, PIP and DIP flexion; where it has a fit, it reads those groups instead of a linear map. */
  fingerEstimator?: FingerEstimatorModel & { trainingSets: string[] };
  /**
   * Finger MCP, PIP and DIP flexion of whole-hand shapes, each fit in its own views: palm, back and oblique (version 3),
   * from above the back of a hand on a table (version 4). The first whose views hold the frame's view reads it.
   */
  handShapeEstimators?: readonly HandShapeEstimatorModel[];
  /**
   * Side-on wrist flexion/extension read in the picture (vision/wrist-axis.ts), by hand model: the gain that undoes its
   * over-read (version 8, scripts/accuracy/wrist-picture-fit.ts, vision/wrist-picture-gain.json).
   */
  wristPictureGains?: Record<string, WristPictureFit>;
}

/**
 * One calibration line of the picture-read wrist: reading = interceptDeg + slope * truth on training clips seen from
 * either side; gain = 1 / slope. `bySide` shows the same fit per side of the hand toward the camera; the engine takes
 * the pooled one, because from the thumb side its view classifier names the side wrongly in about half the frames
 * (the depth it rests on is what side-on tracking places least surely).
 */
export interface WristPictureFit {
  slope: number;
  interceptDeg: number;
  gain: number;
  frames: number;
  bySide?: Record<string, Omit<WristPictureFit, "bySide">>;
}

/** The gain for a picture-read wrist angle, or null where the hand model has none (the angle is read as it is). */
export function wristPictureGain(model: CorrectionModel, handModel: string): number | null {
  const gain = model.wristPictureGains?.[handModel]?.gain;
  return gain !== undefined && Number.isFinite(gain) && gain > 0 ? gain : null;
}

/** The committed coefficients. */
// The JSON module's inferred type is wider than the model's (tuples read as arrays); applyFingerFit and correctGroupAngle check sizes.
export const HAND_SHAPE_MODEL: HandShapeEstimatorModel = HAND_SHAPE_FIT as unknown as HandShapeEstimatorModel;
export const HAND_SHAPE_DOWN_MODEL: HandShapeEstimatorModel = HAND_SHAPE_DOWN_FIT as unknown as HandShapeEstimatorModel;
export const HAND_SHAPE_SIDE_MODEL: HandShapeEstimatorModel = HAND_SHAPE_SIDE_FIT as unknown as HandShapeEstimatorModel;
export const CORRECTION_MODEL: CorrectionModel = {
  ...(COEFFICIENTS as unknown as CorrectionModel),
  version: CORRECTION_VERSION,
  handShapeEstimators: [HAND_SHAPE_MODEL, HAND_SHAPE_DOWN_MODEL, HAND_SHAPE_SIDE_MODEL],
  wristPictureGains: WRIST_PICTURE_GAIN.gains as Record<string, WristPictureFit>,
};

export function correctionFeatures(f: RawAngleFeatures): number[] {
  const { deg, imagePlaneDeg: ip, planeFacing: c, radialTowardCamera: r, palmTowardCamera: p } = f;
  return [1, deg, ip, c, deg * c, ip * c, r, deg * r, p, deg * p];
}

const FINGERS: readonly string[] = ["index", "middle", "ring", "little"];

/** The frame's view as the engine classifies it (viewOfHand, or viewOfAxes without the landmarks), from the features' hand. */
function viewOfFeatures(features: RawAngleFeatures): ValidationView {
  if (features.view) return features.view;
  const axes = features.axes ?? (features.hand && features.side ? handAxes(features.hand, features.side) : null);
  if (axes && features.hand && features.side) return viewOfHand(features.hand, axes, features.side);
  if (axes) return viewOfAxes(axes);
  return viewFromHand(features.palmTowardCamera, features.radialTowardCamera, 0);
}

/**
 * Which of the correction's fits read a frame: the linear map of a joint group, the side-view finger estimator, a
 * whole-hand-shape fit that alone reads its views, or the side-on whole-hand-shape fit that reads only frames the
 * side-view estimator declines. The stated uncertainty of a frame follows the fit that read it.
 */
export type CorrectionReader = "linear" | "finger" | "hand shape" | "side-on hand shape";

export interface CorrectedReading {
  deg: number;
  reader: CorrectionReader;
}

/**
 * The corrected angle for a joint group (flexion positive for the finger estimator's groups) and the fit that read it,
 * or null when the model has no fit for it and this hand model. `digit` names the finger for the finger estimator,
 * which also needs the features' `hand` and `side`; without them its groups read null (the raw angle stands), never a
 * different model.
 */
export function correctGroupReading(
  model: CorrectionModel,
  handModel: string,
  group: string,
  features: RawAngleFeatures,
  digit: Digit | null = null,
): CorrectedReading | null {
  const joint = fingerJointOfGroup(group);
  const hasHandShape = Boolean(joint && model.handShapeEstimators?.some((m) => m.fits[handModel]?.[joint]));
  if (joint && (model.fingerEstimator?.fits[handModel]?.[joint] || hasHandShape)) {
    if (!features.hand || !features.side || !digit || !FINGERS.includes(digit)) return null;
    const read = (deg: number | null, reader: CorrectionReader): CorrectedReading | null => (deg === null ? null : { deg, reader });
    // In its views a hand-shape estimator reads the frame or nobody does: the side-view fit was not chosen there.
    // The frame's view also picks the finger estimator's view fit (engine analysis-7).
    const view = viewOfFeatures(features);
    const inView = (m: HandShapeEstimatorModel) => Boolean(m.fits[handModel]?.[joint]) && m.views.includes(view);
    const handShape = model.handShapeEstimators?.find((m) => inView(m) && !m.onlyWhereSideFitDeclines);
    if (handShape) {
      return read(estimateHandShapeJointDeg(handShape, handModel, joint, features.hand, features.side, digit as Finger, features.axes, features.picture), "hand shape");
    }
    const sideFit = model.fingerEstimator?.fits[handModel]?.[joint]
      ? estimateFingerJointDeg(model.fingerEstimator, handModel, joint, features.hand, features.side, digit as Finger, features.axes, features.picture, view)
      : null;
    if (sideFit !== null) return { deg: sideFit, reader: "finger" };
    // Where the side-view fit declines a frame (outside its training domain), a side-on whole-hand-shape fit may read it.
    const fallback = model.handShapeEstimators?.find((m) => inView(m) && m.onlyWhereSideFitDeclines);
    if (!fallback) return null;
    return read(estimateHandShapeJointDeg(fallback, handModel, joint, features.hand, features.side, digit as Finger, features.axes, features.picture, view), "side-on hand shape");
  }
  const fit = model.groups[handModel]?.[group];
  if (!fit) return null;
  if (fit.coefficients.length !== CORRECTION_FEATURES.length) {
    throw new Error(
      `correction ${handModel} ${group}: expected ${CORRECTION_FEATURES.length} coefficients (${CORRECTION_FEATURES.join(", ")}), got ${fit.coefficients.length}; refit`,
    );
  }
  return { deg: correctionFeatures(features).reduce((sum, value, i) => sum + value * fit.coefficients[i], 0), reader: "linear" };
}

/** The corrected angle for a joint group alone (correctGroupReading without the fit's name). */
export function correctGroupAngle(
  model: CorrectionModel,
  handModel: string,
  group: string,
  features: RawAngleFeatures,
  digit: Digit | null = null,
): number | null {
  return correctGroupReading(model, handModel, group, features, digit)?.deg ?? null;
}

/** Whether the model has a fit (linear or the finger estimator) for a group and hand model. */
export function hasGroupFit(model: CorrectionModel, handModel: string, group: string): boolean {
  const joint = fingerJointOfGroup(group);
  return Boolean(
    model.groups[handModel]?.[group] ||
      (joint && (model.fingerEstimator?.fits[handModel]?.[joint] || model.handShapeEstimators?.some((m) => m.fits[handModel]?.[joint]))),
  );
}

/**
 * Which correction group reads a motion, and the sign from the motion's reported angle to the group's (the groups
 * were fitted on flexion, radial deviation and abduction; extension, ulnar deviation and adduction are their
 * negatives). Null for the middle finger's spread: the engine reads it as whichever way it went, which no fit saw.
 */
export function correctionGroupFor(motion: MotionId, digit: Digit | null): { group: CorrectionGroup; sign: 1 | -1 } | null {
  const thumb = digit === "thumb";
  switch (motion) {
    case "wrist.flexion":
      return { group: "wrist flexion (+) / extension (-)", sign: 1 };
    case "wrist.extension":
      return { group: "wrist flexion (+) / extension (-)", sign: -1 };
    case "wrist.radial_deviation":
      return { group: "wrist radial (+) / ulnar (-) deviation", sign: 1 };
    case "wrist.ulnar_deviation":
      return { group: "wrist radial (+) / ulnar (-) deviation", sign: -1 };
    case "mcp.flexion":
      return { group: thumb ? "thumb MCP flexion" : "MCP flexion", sign: 1 };
    case "mcp.extension":
      return { group: thumb ? "thumb MCP flexion" : "MCP flexion", sign: -1 };
    case "pip.flexion":
      return { group: "PIP flexion", sign: 1 };
    case "dip.flexion":
      return { group: "DIP flexion", sign: 1 };
    case "ip.flexion":
      return { group: thumb ? "thumb IP flexion" : "PIP flexion", sign: 1 };
    case "ip.extension":
      return { group: thumb ? "thumb IP flexion" : "PIP flexion", sign: -1 };
    case "finger.abduction":
    case "finger.adduction":
      if (!digit || thumb || digit === "middle") return null;
      return { group: "finger abduction", sign: motion === "finger.abduction" ? 1 : -1 };
  }
}

/**
 * Whether the engine's correction reads a motion's picture points as well as its 3-D ones (the finger estimator since
 * kinarc-correction-6): a capture of it keeps them, so the server reads what the browser read.
 */
export function readsPicturePoints(model: CorrectionModel, motion: MotionId, digit: Digit | null): boolean {
  const group = correctionGroupFor(motion, digit)?.group;
  const joint = group ? fingerJointOfGroup(group) : null;
  return Boolean(joint && ((model.fingerEstimator && usesPicture(model.fingerEstimator)) || model.handShapeEstimators?.some(handShapeUsesPicture)));
}

/** The corrected reading for a motion's reported angle (same sign convention) and the fit that read it, or null when there is no fit. */
export function correctMotionReading(
  model: CorrectionModel,
  handModel: string,
  motion: MotionId,
  digit: Digit | null,
  features: RawAngleFeatures,
): CorrectedReading | null {
  const target = correctionGroupFor(motion, digit);
  if (!target) return null;
  const { sign } = target;
  const corrected = correctGroupReading(
    model,
    handModel,
    target.group,
    { ...features, deg: sign * features.deg, imagePlaneDeg: sign * features.imagePlaneDeg },
    digit,
  );
  return corrected === null ? null : { deg: sign * corrected.deg, reader: corrected.reader };
}

/** The corrected reading for a motion's reported angle (same sign convention), or null when there is no fit. */
export function correctMotionAngle(
  model: CorrectionModel,
  handModel: string,
  motion: MotionId,
  digit: Digit | null,
  features: RawAngleFeatures,
): number | null {
  return correctMotionReading(model, handModel, motion, digit, features)?.deg ?? null;
}
