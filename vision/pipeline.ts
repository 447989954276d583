import type { Condition, Digit, MotionId, Side } from "@/lib/motions/catalog";
import { isOneFingerMotion, MOTIONS } from "@/lib/motions/catalog";
import { handAxes, negate, readMotion } from "./angles";
import { PalmContinuity } from "./depth-mirror";
import type { HandLandmarks } from "./landmarks";
import { LANDMARK_COUNT } from "./landmarks";
import { OneEuroFilter, type OneEuroParams } from "./one-euro";
import { PlaneAccumulator, readPlane, unitGravity, type PlaneReading } from "./plane";
import { RepSegmenter, type RepParams, type RepPhase, type Repetition } from "./reps";
import { add, isFiniteVec, normalize, type Vec3 } from "./vec";
import { CORRECTION_MODEL, correctionGroupFor, correctMotionReading, wristPictureGain, type CorrectionModel, type HandModel } from "./correction";
import {
  angleUncertaintyDeg,
  correctionHelps,
  digitFigure,
  fingerAloneCell,
  fingerAloneUncertaintyDeg,
  ownAloneFigure,
  peakUncertaintyDeg,
  sideOnFitHelps,
  UNCERTAINTY_TABLE,
  validationCell,
  withoutStraightWristUncertaintyDeg,
  type UncertaintyMethod,
  type UncertaintyTable,
  type ValidationView,
} from "./uncertainty";
import { viewName, viewOfHand, viewPolicy, viewQuality, type ViewPolicy, type ViewQuality } from "./view-policy";
import { forearmFromNeutral, neutralReadingUncertaintyDeg, sideOnNeutral, sideOnWristFlexion, WRIST_AXIS_VALIDATION, type ForearmSource, type NeutralReading, type WristAxisValidation } from "./wrist-axis";

/** How an angle was obtained: raw 3-D landmarks, or those corrected by a named correction ("world3d+kinarc-correction-2"). */
export type MeasurementMethod = "world3d" | "image_plane" | `world3d+${string}` | `image_plane+${string}`;

/** A stored attempt's method in the therapist's words (the upload review shows it). */
export function measurementMethodWords(method: string | null): string {
  if (method === "image_plane") return "read in the picture, the hand seen side-on (no correction)";
  if (method?.startsWith("image_plane+")) return `read in the picture, the hand seen side-on, scaled by its fitted gain (${method.slice("image_plane+".length)})`;
  if (method === "world3d") return "3-D hand landmarks (raw angles, no correction)";
  if (method?.startsWith("world3d+")) return `hand landmarks, corrected (${method.slice("world3d+".length)})`;
  return method ?? "—";
}

export interface PipelineFrame {
  /** Milliseconds since the capture started. */
  t: number;
  /** The tracker's hand-presence score, 0..1. */
  score: number;
  hand: HandLandmarks | null;
  /** Unit vector from elbow to wrist, camera axes, when the elbow is in view. */
  forearm?: Vec3 | null;
  /** The 21 landmarks in the picture, [x, y] as fractions of its width and height (with `imageAspect`). */
  image?: readonly (readonly number[])[] | null;
  /** The picture's width over its height for this frame (a live camera's); else the options' `imageAspect`. */
  imageAspect?: number;
}

export interface LivePipelineOptions {
  motion: MotionId;
  side: Side;
  digit: Digit | null;
  condition: Condition;
  /**
   * The tested finger bends on its own, the other three held straight (as a therapist isolates one finger). The hand
   * tracker reads such a finger far worse than four fingers bent together (scripts/accuracy/report.md, "Single-finger
   * test motions"): its angles carry that error (UncertaintyTable.fingerAlone) and the summary says so.
   */
  oneFinger?: boolean;
  /** The picture's width over its height: with it, frames' `image` points can be read as angles (the finger estimator's picture features). */
  imageAspect?: number | null;
  /** Gravity in camera axes; straight down the image when not given. */
  gravity?: Vec3 | null;
  /** Frames scoring below this are skipped, never read as a zero angle. */
  minScore?: number;
  filter?: Partial<OneEuroParams>;
  reps?: Partial<RepParams>;
  /**
   * A neutral reading taken before the attempt (vision/wrist-axis.ts): for wrist motions, frames without a forearm
   * direction are read against it instead of against the capture's first moments.
   */
  neutral?: NeutralReading | null;
  /** Without a forearm direction or a neutral reading, the hand's mean long axis over this first stretch is taken as neutral. */
  neutralWindowMs?: number;
  /** A gap in usable frames longer than this restarts the smoother, so it does not glide across the hole. */
  maxGapMs?: number;
  /** The tracker's hand landmark model; the correction and the validation error differ by model. Default "lite", the app's. */
  handModel?: HandModel;
  /**
   * "auto" (default) applies the angle correction where validation shows it lowers the error for the joint, view and
   * model; "off" reads raw 3-D angles (for checks of the angle geometry on exact landmarks).
   */
  correction?: "auto" | "off";
  /** Read a frame whose palm flips against the frames before it mirrored in depth (vision/depth-mirror.ts). Default true. */
  depthMirror?: boolean;
  /** Injectable for tests; the committed coefficients and validation table otherwise. */
  correctionModel?: CorrectionModel;
  uncertaintyTable?: UncertaintyTable;
  wristAxisValidation?: WristAxisValidation;
}

export type FrameQuality = "ok" | "no_hand" | "low_score" | "bad_landmarks" | "degenerate";

export interface LiveUpdate {
  t: number;
  quality: FrameQuality;
  score: number;
  /** Reported angle (positive in the motion's direction), null when the frame was skipped. */
  angleDeg: number | null;
  imagePlaneDeg: number | null;
  smoothedDeg: number | null;
  /** The frame's plane reading; `travelAlongGravity` lets a reading built from several frames' angles find its plane again. */
  plane: (PlaneReading & { travelAlongGravity: number }) | null;
  /** Whether this frame's plane reading agrees with the condition under test (null when the frame was skipped). */
  planeMatchesCondition: boolean | null;
  rep: { phase: RepPhase; count: number; currentTopDeg: number | null };
  method: MeasurementMethod;
  /** 90% interval half-width of `angleDeg` (and the smoothed angle): validation error, widened by tracking score. */
  uncertaintyDeg: number | null;
  /**
   * The interval a peak read at this frame carries (the live top of a repetition): `uncertaintyDeg`, never narrower
   * than the held-out peaks' figure for this view and score (peakUncertaintyDeg); the summary's figure for the capture.
   */
  peakUncertaintyDeg: number | null;
  /**
   * Which held-out figure the frame's interval came from (vision/uncertainty.ts UncertaintyMethod); absent for a
   * skipped frame. A frame the side-view estimator declined ("declined, raw", "side-on hand shape") is not a test
   * motion's, so figures measured on test motions (both models read together) do not stand for it.
   */
  intervalMethod?: UncertaintyMethod;
  /** The camera view the frame's hand axes point to (scripts/accuracy views), null when the frame was skipped. */
  view: ValidationView | null;
  /** How that view serves the motion and test position (vision/view-policy.ts), null when the frame was skipped. */
  viewQuality: ViewQuality | null;
  /** Wrist motions: where this frame's forearm line came from; null for finger motions and skipped frames. */
  forearmSource: ForearmSource | null;
  correctionVersion: string | null;
}

export interface PipelineSummary {
  frames: number;
  usableFrames: number;
  meanScore: number;
  /** Completed repetitions plus, if the capture stopped mid-movement, the open one marked incomplete. */
  repetitions: Repetition[];
  /** Plane over the outward part of every repetition, or over all usable frames when there was none. */
  plane: PlaneReading | null;
  method: MeasurementMethod;
  /**
   * 90% interval half-width for the capture's start, peak and arc: the frame interval of its usual view (the worse of
   * views when mixed) at its mean score, never narrower than the held-out peaks' figure (peakUncertaintyDeg).
   */
  uncertaintyDeg: number | null;
  /** The view seen in most usable frames, null when none held a majority. */
  view: ValidationView | null;
  /**
   * How the capture's view serves the motion: that of `view`, or with no majority view the worst of the views seen
   * in at least a fifth of usable frames. Null when no frame was usable.
   */
  viewQuality: ViewQuality | null;
  /** The views the policy recommends for this motion and test position, best first. */
  recommendedViews: readonly ValidationView[];
  /** Wrist motions: the forearm source of most usable frames (null for finger motions or with no usable frame). */
  forearmSource: ForearmSource | null;
  /** Read as one finger tested on its own: `oneFinger` asked for, and the motion is one it applies to. */
  oneFinger: boolean;
  correctionVersion: string | null;
  warnings: string[];
}

export interface LivePipeline {
  readonly options: Readonly<LivePipelineOptions>;
  push(frame: PipelineFrame): LiveUpdate;
  summary(): PipelineSummary;
}

export const DEFAULT_MIN_SCORE = 0.5;
const DEFAULT_NEUTRAL_WINDOW_MS = 500;
export const DEFAULT_MAX_GAP_MS = 500;

function landmarksUsable(hand: HandLandmarks): boolean {
  if (hand.length !== LANDMARK_COUNT) return false;
  for (const p of hand) if (!isFiniteVec(p)) return false;
  return true;
}

/** How much wider than its cell's a finger's interval must be for the analysis to say it reads worse [our threshold]. */
export const FINGER_READS_WORSE_RATIO = 1.25;

/**
 * Where the held-out clips split a cell by finger and this finger read clearly worse than the fingers together (its
 * interval at least FINGER_READS_WORSE_RATIO times the cell's), its figures; null otherwise. From the thumb side, for
 * one, the index finger stands in front of the others.
 */
export function fingerReadsWorse(
  table: UncertaintyTable,
  motion: MotionId,
  digit: Digit | null,
  model: HandModel,
  view: ValidationView,
): { fingerMaeDeg: number; cellMaeDeg: number } | null {
  const group = correctionGroupFor(motion, digit)?.group;
  const cell = group ? validationCell(table, group, model, view) : null;
  const own = cell ? digitFigure(cell, digit) : undefined;
  if (!cell || !own || cell.clipMaeDeg === undefined || own.uncertaintyDeg < FINGER_READS_WORSE_RATIO * cell.uncertaintyDeg) return null;
  return { fingerMaeDeg: own.clipMaeDeg, cellMaeDeg: cell.clipMaeDeg };
}

/** How the engine's note on a finger tested on its own begins (a two-model reading keeps one of the two models'). */
export const ONE_FINGER_NOTE = "one finger tested on its own";

/**
 * The per-frame measurement path shared by the live UI (one `push` per camera frame) and the whole-capture analyzer.
 * No DOM, no Node APIs: runs on the main thread, in a worker and on the server.
 */
export function createLivePipeline(options: LivePipelineOptions): LivePipeline {
  const motion = MOTIONS[options.motion];
  const isWrist = motion.joint === "wrist";
  const gravity = unitGravity(options.gravity);
  const minScore = options.minScore ?? DEFAULT_MIN_SCORE;
  const neutralWindowMs = options.neutralWindowMs ?? DEFAULT_NEUTRAL_WINDOW_MS;
  const maxGapMs = options.maxGapMs ?? DEFAULT_MAX_GAP_MS;
  const filter = new OneEuroFilter(options.filter);
  const segmenter = new RepSegmenter(options.reps);
  const allFramesPlane = new PlaneAccumulator();

  let frames = 0;
  let usable = 0;
  let scoreSum = 0;
  let lastUsableMs = Number.NaN;
  let neutralSum: Vec3 = [0, 0, 0];
  let neutralStartMs = Number.NaN;
  let neutral: Vec3 | null = null;
  let usedNeutral = false;
  const handModel: HandModel = options.handModel ?? "lite";
  const correctionModel = options.correctionModel ?? CORRECTION_MODEL;
  const table = options.uncertaintyTable ?? UNCERTAINTY_TABLE;
  const correctionTarget = options.correction === "off" ? null : correctionGroupFor(options.motion, options.digit);
  const correctedMethod: MeasurementMethod = `world3d+${correctionModel.version}`;
  const pictureCorrectedMethod: MeasurementMethod = `image_plane+${correctionModel.version}`;
  let correctedFrames = 0;
  /** Interval methods of frames the side-view estimator declined (read raw or by the side-on fit). */
  const declinedMethods = new Set<UncertaintyMethod>();
  let usableScoreSum = 0;
  const viewCounts = new Map<ValidationView, number>();
  const policy = viewPolicy(options.motion, options.condition, options.digit);
  const forearmCounts = new Map<ForearmSource, number>();
  const neutralForearm = options.neutral ? forearmFromNeutral(options.neutral) : null;
  const wristInPicture = options.motion === "wrist.flexion" || options.motion === "wrist.extension";
  // Read in the picture, the wrist over-reads its turn a little; the fitted gain undoes it (kinarc-correction-8).
  const pictureGain = wristInPicture && correctionTarget ? wristPictureGain(correctionModel, handModel) : null;
  let sideOn = wristInPicture ? (options.neutral?.sideOn ?? null) : null;
  // Without a neutral reading the capture's first moments stand in for it, side-on figures included.
  const startHands: HandLandmarks[] = [];
  let pictureFrames = 0;
  const wristTable = options.wristAxisValidation ?? WRIST_AXIS_VALIDATION;
  let method: MeasurementMethod = "world3d";
  const palmContinuity = new PalmContinuity(options.side);

  /**
   * The validation interval of an angle read against this forearm line, in this view, at this score: a wrist read
   * against how the hand was first seen, or against the straight-wrist reading, takes those figures; a finger tested
   * on its own its single-finger figure; the cell's otherwise.
   */
  function statedInterval(source: ForearmSource | null, view: ValidationView | null, score: number, method: UncertaintyMethod): number | null {
    return oneFingerUncertainty(
      wristStartUncertainty(
        source,
        (source === "neutral-reading" ? neutralReadingUncertaintyDeg(options.motion, handModel, view, score, wristTable, table) : null) ??
          angleUncertaintyDeg(options.motion, options.digit, handModel, view, score, table, method),
        score,
      ),
      view,
      score,
    );
  }

  /** An interval for a peak: the frame interval, never narrower than the held-out peaks' figure (peakUncertaintyDeg). */
  function atLeastPeakFigure(frameDeg: number | null, view: ValidationView | null, score: number, method: UncertaintyMethod): number | null {
    const peak = peakUncertaintyDeg(options.motion, options.digit, handModel, view, score, table, method);
    return frameDeg === null ? peak : Math.max(frameDeg, peak ?? 0);
  }

  function skipped(t: number, score: number, quality: FrameQuality): LiveUpdate {
    return {
      t,
      quality,
      score,
      angleDeg: null,
      imagePlaneDeg: null,
      smoothedDeg: null,
      plane: null,
      planeMatchesCondition: null,
      rep: { phase: segmenter.phase, count: segmenter.completed.length, currentTopDeg: segmenter.currentTopDeg },
      method,
      uncertaintyDeg: null,
      peakUncertaintyDeg: null,
      view: null,
      viewQuality: null,
      forearmSource: null,
      correctionVersion: null,
    };
  }

  /**
   * Forearm direction for this frame: the pose landmarker's, else the neutral reading's, else the neutral built from
   * the first frames of the capture.
   */
  function forearmFor(frame: PipelineFrame, longAxis: Vec3): { direction: Vec3 | null; source: ForearmSource } {
    if (frame.forearm && isFiniteVec(frame.forearm)) return { direction: frame.forearm, source: "pose" };
    if (neutralForearm) return { direction: neutralForearm, source: "neutral-reading" };
    usedNeutral = true;
    if (Number.isNaN(neutralStartMs)) neutralStartMs = frame.t;
    if (frame.t - neutralStartMs <= neutralWindowMs) {
      neutralSum = add(neutralSum, longAxis);
      neutral = normalize(neutralSum);
      if (wristInPicture && frame.hand) {
        startHands.push(frame.hand);
        sideOn = sideOnNeutral(startHands);
      }
    }
    return { direction: neutral, source: "capture-start" };
  }

  // A finger tested on its own carries the single-finger validation error (never narrower than the cell's own).
  const oneFinger = options.oneFinger === true && isOneFingerMotion(options.motion, options.digit);
  function oneFingerUncertainty(cellDeg: number | null, view: ValidationView | null, score: number): number | null {
    if (!oneFinger) return cellDeg;
    const alone = fingerAloneUncertaintyDeg(options.motion, options.digit, handModel, view, score, table);
    return alone === null ? cellDeg : Math.max(alone, cellDeg ?? 0);
  }

  /** A wrist read against how the hand was first seen carries the error of held-out clips read that way. */
  function wristStartUncertainty(source: ForearmSource | null, cellDeg: number | null, score: number): number | null {
    return source === "capture-start" ? (withoutStraightWristUncertaintyDeg(options.motion, cellDeg, score, table) ?? cellDeg) : cellDeg;
  }

  function push(frame: PipelineFrame): LiveUpdate {
    segmenter.frame(frame.t);
    frames += 1;
    const score = Number.isFinite(frame.score) ? frame.score : 0;
    scoreSum += score;
    if (!frame.hand) return skipped(frame.t, score, "no_hand");
    if (score < minScore) return skipped(frame.t, score, "low_score");
    if (!landmarksUsable(frame.hand)) return skipped(frame.t, score, "bad_landmarks");
    const seenAxes = handAxes(frame.hand, options.side);
    if (!seenAxes) return skipped(frame.t, score, "degenerate");
    // After a gap the hand may really have turned: the palm's direction is taken afresh.
    if (!Number.isNaN(lastUsableMs) && frame.t - lastUsableMs > maxGapMs) palmContinuity.reset();
    const { hand, axes } = options.depthMirror === false ? { hand: frame.hand, axes: seenAxes } : palmContinuity.check(frame.hand, seenAxes);
    const forearm = isWrist ? forearmFor(frame, axes.longAxis) : null;
    // Against a side-on neutral reading, wrist flexion and extension are read in the picture (vision/wrist-axis.ts).
    const pictureWrist = forearm && forearm.source !== "pose" && sideOn ? sideOnWristFlexion(hand, sideOn) : null;
    const pictureFlexion = pictureWrist && options.motion === "wrist.extension" ? negate(pictureWrist) : pictureWrist;
    const reading = pictureFlexion ?? readMotion(options.motion, options.digit, hand, axes, forearm?.direction ?? null);
    if (!reading || !Number.isFinite(reading.deg)) return skipped(frame.t, score, "degenerate");
    if (forearm) forearmCounts.set(forearm.source, (forearmCounts.get(forearm.source) ?? 0) + 1);

    const view = viewOfHand(hand, axes, options.side);
    let angleDeg = reading.deg;
    const inPicture = pictureFlexion !== null;
    let frameMethod: MeasurementMethod = inPicture ? "image_plane" : "world3d";
    if (inPicture) pictureFrames += 1;
    if (inPicture && pictureGain !== null) {
      angleDeg = reading.deg * pictureGain;
      frameMethod = pictureCorrectedMethod;
      correctedFrames += 1;
    }
    // The finger estimator reads the picture points too (vision/estimator.ts PICTURE_FEATURES); the depth mirror
    // turns the world hand front to back and leaves the picture as it was.
    const aspect = frame.imageAspect ?? options.imageAspect;
    const picture = frame.image && aspect ? { image: frame.image, aspect } : null;
    // The correction's wrist maps were fitted on angles read against the render's true forearm; against a neutral reading
    // it moves them away from the truth (scripts/accuracy/report.md, wrist section), so they stay raw.
    const againstNeutral = forearm?.source === "neutral-reading";
    // Which figure the frame's interval takes: the corrected cell's, raw, or (seen side-on) a declined frame's.
    let intervalMethod: UncertaintyMethod = "raw";
    if (correctionTarget && !againstNeutral && !inPicture && Number.isFinite(reading.imagePlaneDeg) && correctionHelps(table, correctionTarget.group, handModel, view)) {
      const reader = correctMotionReading(correctionModel, handModel, options.motion, options.digit, {
        deg: reading.deg,
        imagePlaneDeg: reading.imagePlaneDeg,
        planeFacing: Math.abs(reading.axis[2]),
        radialTowardCamera: -axes.radialAxis[2],
        palmTowardCamera: -axes.palmarNormal[2],
        hand,
        side: options.side,
        axes,
        view,
        picture,
      });
      // The side-on whole-hand-shape fit reads a declined frame only in cells where held-out shapes showed it helps.
      const corrected = reader?.reader === "side-on hand shape" && !sideOnFitHelps(table, correctionTarget.group, handModel, view) ? null : reader;
      if (corrected !== null && Number.isFinite(corrected.deg)) {
        angleDeg = corrected.deg;
        frameMethod = correctedMethod;
        correctedFrames += 1;
        intervalMethod = corrected.reader === "side-on hand shape" ? "side-on hand shape" : "engine";
      } else if (view && validationCell(table, correctionTarget.group, handModel, view)?.declinedBySideFit) {
        intervalMethod = "declined, raw";
      }
      if (intervalMethod === "side-on hand shape" || intervalMethod === "declined, raw") declinedMethods.add(intervalMethod);
    }
    method = frameMethod;
    viewCounts.set(view, (viewCounts.get(view) ?? 0) + 1);
    usableScoreSum += score;

    usable += 1;
    if (!Number.isNaN(lastUsableMs) && frame.t - lastUsableMs > maxGapMs) filter.reset();
    lastUsableMs = frame.t;
    const smoothedDeg = filter.filter(angleDeg, frame.t / 1000);
    const plane = readPlane(reading.axis, reading.travel, gravity);
    allFramesPlane.add(plane.axisToGravityDeg, plane.travelAlongGravity);
    const phase = segmenter.push(frame.t, angleDeg, smoothedDeg, filter.speed, plane.axisToGravityDeg, plane.travelAlongGravity);
    // A frame left uncorrected carries the raw method's error, whatever the cell's policy.
    const frameUncertainty = statedInterval(forearm?.source ?? null, view, score, intervalMethod);
    const correctedFrame = frameMethod === correctedMethod || frameMethod === pictureCorrectedMethod;
    return {
      t: frame.t,
      quality: "ok",
      score,
      angleDeg,
      imagePlaneDeg: Number.isFinite(reading.imagePlaneDeg) ? reading.imagePlaneDeg : null,
      smoothedDeg,
      plane: { verdict: plane.verdict, axisToGravityDeg: plane.axisToGravityDeg, travelAlongGravity: plane.travelAlongGravity },
      planeMatchesCondition: plane.verdict === options.condition,
      rep: { phase, count: segmenter.completed.length, currentTopDeg: segmenter.currentTopDeg },
      method: frameMethod,
      uncertaintyDeg: frameUncertainty,
      // A wrist read in the picture keeps the raw frame figure (no held-out cell reads it) but the engine's peaks.
      peakUncertaintyDeg: atLeastPeakFigure(frameUncertainty, view, score, correctedFrame && intervalMethod === "raw" ? "engine" : intervalMethod),
      intervalMethod,
      view,
      viewQuality: viewQuality(policy, view),
      forearmSource: forearm?.source ?? null,
      correctionVersion: correctedFrame ? correctionModel.version : null,
    };
  }

  function summary(): PipelineSummary {
    const repetitions = segmenter.snapshot();
    const repPlane = segmenter.outwardPlane();
    const warnings: string[] = [];
    if (isWrist && usedNeutral) {
      const pooled = table.withoutStraightWristReading;
      warnings.push(
        `no forearm direction: neutral wrist position taken from the hand over the first ${neutralWindowMs} ms; angles assume the client started at neutral and kept the forearm still` +
          (pooled ? ` (held-out clips read this way were off by ${pooled.maeDeg.toFixed(0)} deg on average; a straight-wrist reading before the attempt avoids it)` : ""),
      );
    }
    if (frames > 0 && usable / frames < 0.8) warnings.push(`only ${usable} of ${frames} frames had a usable hand`);
    if (usable > 0 && repetitions.length === 0) {
      warnings.push(
        "no repetition found: the joint did not move clearly away from its resting angle" +
          // On renders a finger bent on its own behind the others showed no bend at all (scripts/accuracy/README.md).
          (oneFinger ? "; a finger bent on its own, above all one hidden behind the others, may not show at all, so this is not evidence that it cannot move" : ""),
      );
    }
    if (repetitions.some((r) => !r.complete)) warnings.push("the capture ended before the last repetition returned to rest");
    if (palmContinuity.mirroredFrames > 0) {
      warnings.push(`in ${palmContinuity.mirroredFrames} of ${usable} usable frames the tracker saw the hand mirrored front to back; they were read the right way round`);
    }
    if (correctedFrames > 0 && correctedFrames < usable) {
      warnings.push(`angle correction applied on ${correctedFrames} of ${usable} usable frames (only in views where validation shows it helps)`);
    }
    // The capture's view is the one most frames saw; with no majority the worse of the views sets the uncertainty.
    let view: ValidationView | null = null;
    for (const [v, n] of viewCounts) if (n > usable / 2) view = v;
    const quality = summaryViewQuality(policy, view, viewCounts, usable);
    // A finger the held-out one-finger clips measured on its own in this view reads within its own figure.
    const ownFigure = oneFinger && view ? ownAloneFigure(table, options.motion, options.digit, handModel, view) : undefined;
    if (ownFigure) {
      warnings.push(
        `${ONE_FINGER_NOTE}, the others held straight: seen in a ${viewName(view!)}, the ${options.digit} finger bent alone was measured on held-out renders ` +
          `(off by ${ownFigure.clipMaeDeg.toFixed(0)} deg on average per frame, ${ownFigure.clipPeakMaeDeg!.toFixed(0)} deg at the peak, mostly too little bend), so its ± is that finger's own; ` +
          "four fingers bending together read more truly",
      );
    } else if (oneFinger) {
      const cell = fingerAloneCell(table, options.motion, options.digit, handModel, null);
      warnings.push(
        `${ONE_FINGER_NOTE}, the others held straight: the hand tracker reads a finger bent alone far less truly than four fingers bent together` +
          (cell ? ` (held-out renders: off by up to ${cell.maeDeg.toFixed(0)} deg on average, mostly reading too little bend)` : "") +
          "; treat the range as a rough guide, or repeat with all four fingers bending together for a measured range",
      );
    }
    const recommendedWords = policy.recommended.map(viewName).join(" or ");
    const seen = view ? `a ${viewName(view)}` : "changing views";
    if (quality === "poor") {
      warnings.push(`view: ${seen} in most frames, not the ${recommendedWords} this motion and position need; the motion did not lie square to the camera, so these angles come from a poor view`);
    } else if (quality === "usable") {
      warnings.push(`view: ${seen}; the ${recommendedWords} measures more truly (validation error is larger from this side)`);
    }
    const hidden = view && !oneFinger ? fingerReadsWorse(table, options.motion, options.digit, handModel, view) : null;
    if (hidden) {
      warnings.push(
        `seen in a ${viewName(view!)}, the ${options.digit} finger reads less truly than the others: on held-out clips its angle was off by ${hidden.fingerMaeDeg.toFixed(0)} deg on average ` +
          `(the four fingers together: ${hidden.cellMaeDeg.toFixed(0)} deg), so its ± is wider`,
      );
    }
    let forearmSource: ForearmSource | null = null;
    for (const [source, n] of forearmCounts) if (!forearmSource || n > (forearmCounts.get(forearmSource) ?? 0)) forearmSource = source;
    if (forearmCounts.size > 1) {
      warnings.push(`forearm line: ${[...forearmCounts].map(([source, n]) => `${source} in ${n} frames`).join(", ")} (the pose landmarker saw the elbow only part of the time)`);
    }
    const meanUsableScore = usable ? usableScoreSum / usable : 0;
    const uncertaintyMethod: UncertaintyMethod = correctedFrames === usable ? "engine" : "raw";
    // Frames the side-view estimator declined widen the capture's interval to their own figure.
    const statedFor = (method: UncertaintyMethod) => atLeastPeakFigure(statedInterval(forearmSource, view, meanUsableScore, method), view, meanUsableScore, method);
    const intervals = [uncertaintyMethod, ...declinedMethods].flatMap((m) => statedFor(m) ?? []);
    const summaryMethod: MeasurementMethod = pictureFrames > 0 ? (correctedFrames > 0 ? pictureCorrectedMethod : "image_plane") : correctedFrames > 0 ? correctedMethod : "world3d";
    return {
      frames,
      usableFrames: usable,
      meanScore: frames ? scoreSum / frames : 0,
      repetitions,
      plane: repPlane.empty ? allFramesPlane.result() : repPlane.result(),
      method: summaryMethod,
      // The capture's start, peak and arc: the interval of its usual view at its mean score, never narrower than the
      // held-out peaks' own figure (a peak is one repetition's top and misses by more than a frame does).
      uncertaintyDeg: usable && intervals.length ? Math.max(...intervals) : null,
      view,
      viewQuality: quality,
      recommendedViews: policy.recommended,
      forearmSource,
      oneFinger,
      correctionVersion: correctedFrames > 0 ? correctionModel.version : null,
      warnings,
    };
  }

  return { options, push, summary };
}

const QUALITY_ORDER: readonly ViewQuality[] = ["recommended", "usable", "poor"];

/** The majority view's quality; with no majority, the worst quality among views seen in at least a fifth of frames. */
function summaryViewQuality(policy: ViewPolicy, view: ValidationView | null, counts: ReadonlyMap<ValidationView, number>, usable: number): ViewQuality | null {
  if (usable === 0) return null;
  if (view) return viewQuality(policy, view);
  let worst: ViewQuality = "recommended";
  for (const [v, n] of counts) {
    const q = viewQuality(policy, v);
    if (n * 5 >= usable && QUALITY_ORDER.indexOf(q) > QUALITY_ORDER.indexOf(worst)) worst = q;
  }
  return worst;
}
