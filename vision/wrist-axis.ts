import type { MotionId, Side } from "@/lib/motions/catalog";
import { correctionGroupFor, type HandModel } from "./correction";
import { handAxes } from "./angles";
import { LANDMARK_COUNT, type HandLandmarks } from "./landmarks";
import { add, angleBetweenDeg, cross, isFiniteVec, normalize, rejectFrom, scale, type Vec3 } from "./vec";
import { viewOfAxes } from "./view-policy";
import { trackingFactor, uncertaintyFromMaeDeg, type ValidationView } from "./uncertainty";
import VALIDATION from "./wrist-axis-validation.json";

/**
 * The forearm line the wrist angles are measured against, when no forearm is seen.
 *
 * The pose landmarker needs shoulders and elbow in the picture, which a camera aimed at a hand on a table rarely has.
 * A neutral reading stands in: with the wrist straight and the forearm resting on the table, a few still seconds give
 * the hand's orientation in camera axes. While the forearm stays on the table and the camera stays put, the forearm
 * line in camera axes is the neutral hand's long axis, and each later wrist angle is the rotation of the hand frame
 * relative to the neutral hand frame, read the way vision/angles wristAngles reads it (flexion, then deviation). The
 * roll about the forearm (pronation, supination) changes neither angle, so a forearm that turns a little on the table
 * does not leak into them. The neutral reading also takes the client's own straight wrist as zero, which removes the
 * fixed offset between the landmark model's wrist-to-middle-knuckle line and the forearm line.
 */

/** Where a wrist capture's forearm line came from, frame by frame. */
export type ForearmSource =
  /** The pose landmarker's elbow-to-wrist direction, sent with the frame. */
  | "pose"
  /** A neutral reading taken before the attempt (wrist straight, forearm resting still). */
  | "neutral-reading"
  /** No forearm and no neutral reading: the hand's long axis over the capture's first moments, assumed straight. */
  | "capture-start";

export const FOREARM_SOURCES: readonly ForearmSource[] = ["pose", "neutral-reading", "capture-start"];

export interface NeutralFrame {
  t: number;
  score: number;
  hand: HandLandmarks | null;
}

/** The hand's orientation at neutral, camera axes (x right, y down, z away), from the tracker's world landmarks. */
export interface NeutralReading {
  side: Side;
  /** Mean wrist-to-middle-knuckle direction: the forearm line from here on. */
  longAxis: Vec3;
  radialAxis: Vec3;
  palmarNormal: Vec3;
  /** Frames the reading was taken from, of all frames offered. */
  usableFrames: number;
  frames: number;
  /** Time the usable frames spanned. */
  durationMs: number;
  /** How still the hand was: the 90th percentile of the angles between each frame's long axis and the mean. */
  spreadDeg: number;
  /** The camera view of the hand at neutral (the engine's classifier). */
  view: ValidationView;
}

export const NEUTRAL_LIMITS = {
  /** Frames below this tracker score are left out, as the pipeline skips them (DEFAULT_MIN_SCORE). */
  minScore: 0.5,
  /** At least this many usable frames. */
  minFrames: 10,
  /** Over at least this long: a few seconds still, so one twitch does not set the zero. */
  minDurationMs: 1500,
  /**
   * The hand counts as still when 90% of frames have their long axis within this of the mean (the percentile, so one
   * odd frame does not refuse a good reading). The tracker alone scatters the wrist-to-knuckle line of a still hand:
   * up to 5.6 degrees across the tracked frames of identical rendered stills (scripts/accuracy/wrist-axis.ts, seed
   * 20261203); 8 leaves room for that and refuses a hand that drifts through the hold.
   */
  maxSpreadDeg: 8,
} as const;

export type NeutralLimits = { [K in keyof typeof NEUTRAL_LIMITS]: number };

export type NeutralOutcome = { ok: true; reading: NeutralReading } | { ok: false; problem: string };

function usableHand(hand: HandLandmarks | null): hand is HandLandmarks {
  return !!hand && hand.length === LANDMARK_COUNT && hand.every((p) => isFiniteVec(p));
}

/**
 * The neutral reading from frames of a still, straight wrist, or the reason it can't be taken (in the client's
 * words). Pure: the browser takes it live and the server takes it again from the capture file's neutral frames.
 */
export function neutralReading(frames: readonly NeutralFrame[], side: Side, limits: Partial<NeutralLimits> = {}): NeutralOutcome {
  const l = { ...NEUTRAL_LIMITS, ...limits };
  const axes = frames
    .filter((f) => Number.isFinite(f.score) && f.score >= l.minScore && usableHand(f.hand))
    .map((f) => ({ t: f.t, axes: handAxes(f.hand!, side) }))
    .filter((f): f is { t: number; axes: NonNullable<ReturnType<typeof handAxes>> } => f.axes !== null);
  if (axes.length < l.minFrames) {
    return { ok: false, problem: `the hand was tracked in ${axes.length} of ${frames.length} frames; at least ${l.minFrames} are needed. Keep the whole hand in the picture.` };
  }
  const durationMs = axes[axes.length - 1].t - axes[0].t;
  if (durationMs < l.minDurationMs) {
    return { ok: false, problem: `the hand was held for ${(durationMs / 1000).toFixed(1)} s; hold it still for at least ${(l.minDurationMs / 1000).toFixed(1)} s.` };
  }
  let longSum: Vec3 = [0, 0, 0];
  let radialSum: Vec3 = [0, 0, 0];
  for (const { axes: a } of axes) {
    longSum = add(longSum, a.longAxis);
    radialSum = add(radialSum, a.radialAxis);
  }
  const longAxis = normalize(longSum);
  const radialMean = normalize(radialSum);
  if (!longAxis || !radialMean) return { ok: false, problem: "the hand's direction changed too much to take a straight-wrist reading. Hold it still." };
  const offsets = axes.map(({ axes: a }) => angleBetweenDeg(a.longAxis, longAxis)).sort((a, b) => a - b);
  const spreadDeg = offsets[Math.min(offsets.length - 1, Math.ceil(0.9 * offsets.length) - 1)];
  if (spreadDeg > l.maxSpreadDeg) {
    return {
      ok: false,
      problem: `the hand moved ${spreadDeg.toFixed(0)} degrees while the straight-wrist reading was taken (at most ${l.maxSpreadDeg}). Rest your forearm on the table and keep the hand still.`,
    };
  }
  // Rebuild an orthonormal frame from the means, as handAxes does from one frame's landmarks.
  const radialAxis = normalize(rejectFrom(radialMean, longAxis));
  if (!radialAxis) return { ok: false, problem: "the hand was seen edge-on to its own width; turn it a little and hold it still." };
  const rc = cross(radialAxis, longAxis);
  const palmarNormal = side === "right" ? rc : scale(rc, -1);
  const view = viewOfAxes({ wrist: [0, 0, 0], longAxis, radialAxis, palmarNormal, flexionAxis: cross(longAxis, palmarNormal) });
  return {
    ok: true,
    reading: { side, longAxis, radialAxis, palmarNormal, usableFrames: axes.length, frames: frames.length, durationMs, spreadDeg, view },
  };
}

/** The forearm line (unit, elbow to wrist, camera axes) a neutral reading stands for. */
export function forearmFromNeutral(reading: Pick<NeutralReading, "longAxis">): Vec3 {
  return reading.longAxis;
}

/**
 * Validation error of wrist angles read against a neutral reading, per motion group, view and hand model, written by
 * scripts/accuracy/wrist-axis.ts from held-out renders with a fixed forearm (its section of
 * scripts/accuracy/report.md). Raw 3-D angles: kinarc-correction-1 was fitted against the render's true forearm line
 * and moves these readings away from the truth (same section: the `engine` rows), so the engine does not apply it here.
 */
export interface WristAxisCell {
  group: string;
  view: ValidationView;
  model: HandModel;
  samples: number;
  detected: number;
  maeDeg: number;
  biasDeg: number;
  slope: number | null;
}

export interface WristAxisValidation {
  seed: number;
  source: "neutral-reading";
  method: "raw";
  cells: WristAxisCell[];
}

export const WRIST_AXIS_VALIDATION = VALIDATION as WristAxisValidation;

/**
 * The 90% half-width for a wrist angle read against a neutral reading: the cell's MAE through the same rule as every
 * other angle (vision/uncertainty.ts uncertaintyFromMaeDeg, widened by trackingFactor). With no view, the worst cell
 * of the group and model. Null when the table has no cell for the motion's group (the caller falls back).
 */
export function neutralReadingUncertaintyDeg(
  motion: MotionId,
  model: HandModel,
  view: ValidationView | null,
  score: number,
  table: WristAxisValidation = WRIST_AXIS_VALIDATION,
): number | null {
  const group = correctionGroupFor(motion, null)?.group;
  if (!group) return null;
  const cells = table.cells.filter((c) => c.group === group && c.model === model && (view === null || c.view === view));
  if (cells.length === 0) return null;
  const mae = Math.max(...cells.map((c) => c.maeDeg));
  return Math.round(uncertaintyFromMaeDeg(mae) * trackingFactor(score) * 10) / 10;
}
