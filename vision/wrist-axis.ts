import type { MotionId, Side } from "@/lib/motions/catalog";
import { correctionGroupFor, type HandModel } from "./correction";
import { handAxes } from "./angles";
import type { MotionReading } from "./angles";
import { LANDMARK_COUNT, type HandLandmarks } from "./landmarks";
import { add, angleBetweenDeg, cross, isFiniteVec, normalize, pictureTurnDeg, rejectFrom, scale, type Vec3 } from "./vec";
import { viewOfAxes } from "./view-policy";
import { pictureLongAxis, pictureSideOnFigures, SIDE_ON_LIMITS } from "./correction-views";
import { trackingFactor, UNCERTAINTY_TABLE, uncertaintyFromMaeDeg, type UncertaintyTable, type ValidationView } from "./uncertainty";
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
  /** Set when the hand was seen side-on: wrist flexion and extension are then read in the picture (`sideOnWristFlexion`). */
  sideOn: SideOnNeutral | null;
}

/**
 * A straight wrist seen side-on: the hand's width along the camera's line of sight, so wrist flexion and extension turn
 * the hand in the picture. The landmark model places the hand's depth least surely, and the 3-D hand frame is built
 * across the hand's width (index to little-finger knuckle), which side-on lies along the depth: a few millimetres of
 * depth error turn the palm's direction by tens of degrees and the 3-D wrist angle with it (held-out thumb-side clips:
 * MAE 14-25 degrees, slope 0.34 down to -0.27). In the picture the hand's long axis turns by the wrist angle itself.
 */
export interface SideOnNeutral {
  /** Mean wrist-to-middle-knuckle direction in the picture plane (x right, y down), unit. */
  longAxisXY: [number, number];
  /** +1 when turning the long axis from x toward y (clockwise on screen) bends the wrist toward the palm, else -1. */
  palmarTurn: 1 | -1;
  /** Mean in-picture hand width (index to little-finger knuckle) over in-picture hand length (wrist to middle knuckle). */
  widthRatio: number;
  /** Mean offset of the thumb (MCP, IP, tip) from the long axis, toward the palm, metres. */
  thumbOffsetM: number;
}

/** When a neutral reading counts as side-on: the same limits as a frame's view (vision/correction-views.ts). */
export { SIDE_ON_LIMITS };

/** The side-on figures of a neutral reading's frames, or null when the hand was not seen side-on. */
export function sideOnNeutral(hands: readonly HandLandmarks[]): SideOnNeutral | null {
  let sx = 0;
  let sy = 0;
  let widthRatio = 0;
  let thumb = 0;
  let n = 0;
  for (const hand of hands) {
    const figures = pictureSideOnFigures(hand);
    if (!figures) continue;
    sx += figures.u[0];
    sy += figures.u[1];
    widthRatio += figures.widthRatio;
    thumb += figures.thumbOffsetM;
    n += 1;
  }
  const sum = Math.hypot(sx, sy);
  if (n === 0 || sum < 1e-9) return null;
  const out: SideOnNeutral = { longAxisXY: [sx / sum, sy / sum], palmarTurn: thumb >= 0 ? 1 : -1, widthRatio: widthRatio / n, thumbOffsetM: Math.abs(thumb / n) };
  return out.widthRatio <= SIDE_ON_LIMITS.maxWidthRatio && out.thumbOffsetM >= SIDE_ON_LIMITS.minThumbOffsetM ? out : null;
}

/**
 * Wrist flexion (+) / extension (-) of a hand against a side-on neutral reading, read in the picture: the turn of the
 * wrist-to-middle-knuckle line from its neutral direction, toward the palm positive. The motion's axis is the line of
 * sight (for the plane check), its travel the palm's side in the picture. Null when the hand has no length in the picture.
 */
export function sideOnWristFlexion(hand: HandLandmarks, neutral: SideOnNeutral): MotionReading | null {
  const u = pictureLongAxis(hand)?.u;
  if (!u) return null;
  const p = neutral.palmarTurn;
  const deg = p * pictureTurnDeg(neutral.longAxisXY, u);
  return { deg, imagePlaneDeg: deg, axis: [0, 0, p], travel: [-u[1] * p, u[0] * p, 0] };
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
    .map((f) => ({ t: f.t, hand: f.hand!, axes: handAxes(f.hand!, side) }))
    .filter((f): f is { t: number; hand: HandLandmarks; axes: NonNullable<ReturnType<typeof handAxes>> } => f.axes !== null);
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
  const sideOn = sideOnNeutral(axes.map((a) => a.hand));
  return {
    ok: true,
    reading: { side, longAxis, radialAxis, palmarNormal, usableFrames: axes.length, frames: frames.length, durationMs, spreadDeg, view, sideOn },
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
  /** "engine": read as the engine reads against a neutral reading (since kinarc-correction-8 the picture-read wrist takes its gain); "raw" before. */
  method: "engine" | "raw";
  cells: WristAxisCell[];
}

export const WRIST_AXIS_VALIDATION = VALIDATION as WristAxisValidation;

/**
 * The 90% half-width for a wrist angle read against a neutral reading: the cell's MAE through the same rule as every
 * other angle (vision/uncertainty.ts uncertaintyFromMaeDeg, widened by trackingFactor). With no view, the worst cell
 * of the group and model. Held-out clips read their wrist against the clip's own straight-wrist reading, so where the
 * uncertainty table has a clip figure for the group, model and view (clipMaeDeg) the worse of the two is taken.
 * Null when the table has no cell for the motion's group (the caller falls back).
 */
export function neutralReadingUncertaintyDeg(
  motion: MotionId,
  model: HandModel,
  view: ValidationView | null,
  score: number,
  table: WristAxisValidation = WRIST_AXIS_VALIDATION,
  uncertaintyTable: UncertaintyTable = UNCERTAINTY_TABLE,
): number | null {
  const group = correctionGroupFor(motion, null)?.group;
  if (!group) return null;
  const matches = (c: { group: string; model: HandModel; view: ValidationView }) => c.group === group && c.model === model && (view === null || c.view === view);
  const cells = table.cells.filter(matches);
  if (cells.length === 0) return null;
  const clipMaes = uncertaintyTable.cells.filter(matches).map((c) => c.clipMaeDeg ?? 0);
  const mae = Math.max(...cells.map((c) => c.maeDeg), ...clipMaes);
  return Math.round(uncertaintyFromMaeDeg(mae) * trackingFactor(score) * 10) / 10;
}
