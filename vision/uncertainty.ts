import { MOTIONS, type Digit, type MotionId } from "@/lib/motions/catalog";
import { correctionGroupFor, type HandModel } from "./correction";
import type { ValidationView } from "./correction-views";
import TABLE from "./uncertainty-table.json";

/**
 * How far an angle may be from the truth, from the validation error of the accuracy report
 * (scripts/accuracy/report.md) per joint group, camera view and hand model, widened when the tracker is unsure.
 * The table (vision/uncertainty-table.json) is written from the report by scripts/accuracy/derive-uncertainty.ts.
 */

// The views and their classifier live beside the correction, which picks its estimator by view; re-exported here.
export { VALIDATION_VIEWS, viewFromHand, type ValidationView } from "./correction-views";

export interface ValidationCell {
  group: string;
  view: ValidationView;
  model: HandModel;
  /**
   * Which held-out set the figures come from: one motion in its view ("test motions"), all four fingers in one
   * whole-hand shape seen from the palm, back, obliquely or from above ("hand shapes"), or any pose ("random poses").
   */
  source: "test motions" | "hand shapes" | "random poses";
  samples: number;
  rawMaeDeg: number;
  correctedMaeDeg: number | null;
  /**
   * For a "hand shapes" cell: the raw 3-D MAE of the same group, view and model on random poses. A frame the
   * hand-shape estimator declines (or read with the correction off) is not known to be a whole-hand shape, so its raw
   * uncertainty takes the worse of the two.
   */
  rawAnyPoseMaeDeg?: number;
  /**
   * Where held-out clips measured the cell (continuous motion, scripts/accuracy/clip-report*.md): the engine's frame
   * MAE, the worst over the clip reports' seeds, and the same without correction. The interval takes the worse of the
   * still renders' and the clips' figure: a continuous motion can read worse than the stills.
   */
  clipMaeDeg?: number;
  clipRawMaeDeg?: number;
  /**
   * Where every clip seed that measured the cell gave it: the half-width that held 90% of the held-out peaks (the
   * clip reports' "peak P90 °", the worst over their seeds), for the engine and without correction. A peak is read
   * off one repetition's top, where the tracker is least sure, and misses by more than a frame does (see
   * peakUncertaintyDeg).
   */
  clipPeakP90Deg?: number;
  clipRawPeakP90Deg?: number;
  /**
   * The same for frames: the half-width that held 90% of the held-out clips' detected frames (the reports' "frame P90
   * °", worst seed). The interval is never narrower: the normal rule (2.06 × MAE) holds fewer than 90% of errors
   * whose tails are heavy, as from the palm, the back or above.
   */
  clipFramesP90Deg?: number;
  clipRawFramesP90Deg?: number;
  /** The correction lowered the held-out mean absolute error here, so the engine applies it. */
  correctionHelps: boolean;
  /** Half-width of the 90% interval for the method the engine uses here (see UncertaintyTable.rule). */
  uncertaintyDeg: number;
  /**
   * Where the held-out clips were split by finger: each finger's figure. A view can see some fingers well and hide
   * others (from the thumb side the index finger stands in front of the rest), so a finger's reading takes its own.
   */
  byDigit?: DigitFigure[];
  /**
   * Seen side-on (thumb side or little-finger side), the frames the side-view finger estimator declines as outside
   * what it was fitted on: held-out whole-hand shapes seen side-on (vision/correction-hand-shape-side-validation.json),
   * read raw and with the side-on whole-hand-shape fit.
   */
  declinedBySideFit?: DeclinedFigure;
}

/**
 * Held-out figures of the frames the side-view estimator declines in one cell (kinarc-correction-9): a full fist seen
 * side-on, for one, brings its fingertips nearer the knuckles than any finger that fit saw. Their raw error is far
 * above a test motion's, so they take their own interval, never narrower than the cell's.
 */
export interface DeclinedFigure {
  samples: number;
  rawMaeDeg: number;
  rawP90Deg: number;
  sideOnFitMaeDeg: number | null;
  sideOnFitP90Deg: number | null;
  /** The side-on fit lowered their held-out error by more than two standard errors, so the engine reads them with it. */
  sideOnFitHelps: boolean;
  /** 90% half-widths (uncertaintyFromMaeDeg, floored by the held-out P90): raw, and with the side-on fit. */
  rawUncertaintyDeg: number;
  sideOnFitUncertaintyDeg: number | null;
}

/** One finger's held-out clip figure within a cell, and its interval (the cell's still figure as a floor). */
export interface DigitFigure {
  digit: Exclude<Digit, "thumb">;
  clipMaeDeg: number;
  /** The finger's own frame P90 (as ValidationCell.clipFramesP90Deg), where every seed gave it. */
  clipFramesP90Deg?: number;
  /** The finger's own peak MAE, where every seed gave it (FingerAloneCell.byDigit, which needs it). */
  clipPeakMaeDeg?: number;
  uncertaintyDeg: number;
}

/**
 * Held-out wrist clips whose straight-wrist hold the tracker missed, so the engine read the wrist against how the hand
 * was first seen (forearm line "capture-start"): pooled over the clip reports' seeds, models and conditions.
 */
export interface WithoutStraightWristReading {
  readings: number;
  /** Frame MAE over those readings' detected frames. */
  maeDeg: number;
  uncertaintyDeg: number;
}

/**
 * One finger bent while the other three stayed straight (report.md, "Single-finger test motions in their recommended
 * view"): the held-out error of the method the engine uses in that group, view and model.
 */
export interface FingerAloneCell {
  group: string;
  view: ValidationView;
  model: HandModel;
  samples: number;
  rawMaeDeg: number;
  correctedMaeDeg: number | null;
  /** MAE of the method the engine uses in the four-finger cell of the same group, view and model. */
  maeDeg: number;
  uncertaintyDeg: number;
  /**
   * Fingers whose lone readings held-out one-finger clips measured in this view (the one-finger clip reports'
   * per-finger tables): that finger's own interval, which stands for its lone readings in place of `uncertaintyDeg`.
   */
  byDigit?: DigitFigure[];
}

/**
 * Both hand models read together (vision/model-pair.ts): the held-out frame error of their combined reading for one
 * joint group in one view, measured on clips tracked by both (scripts/accuracy/clip-report-two-models.md).
 */
export interface PairCell {
  group: string;
  view: ValidationView;
  models: [HandModel, HandModel];
  /** How many held-out seeds measured it. */
  seeds: number;
  /** The combined reading's frame MAE, the worst over those seeds. */
  clipMaeDeg: number;
  uncertaintyDeg: number;
  /** From the thumb side: each finger's own worst seed (the fingers read unalike there). */
  byDigit?: DigitFigure[];
  /** The half-width that held 90% of the combined reading's peaks, the worst seed (as ValidationCell.clipPeakP90Deg). */
  clipPeakP90Deg?: number;
  /** The same for its frames, a floor under uncertaintyDeg (as ValidationCell.clipFramesP90Deg). */
  clipFramesP90Deg?: number;
}

export interface UncertaintyTable {
  version: string;
  correctionVersion: string;
  rule: string;
  cells: ValidationCell[];
  /** Absent until the clip reports hold such readings. */
  withoutStraightWristReading?: WithoutStraightWristReading;
  /** Absent until the report holds the single-finger tables. */
  fingerAlone?: FingerAloneCell[];
  /** Absent until the two-model report holds held-out seeds. */
  pairs?: PairCell[];
}

export const UNCERTAINTY_TABLE = TABLE as UncertaintyTable;

/**
 * The 90% interval half-width from a mean absolute error. The report gives mean absolute errors, not per-sample
 * errors; for a normal error, E|e| = sigma * sqrt(2/pi) (half-normal mean) and 90% of errors lie within 1.645 sigma,
 * so the half-width is 1.645 * sqrt(pi/2) * MAE = 2.06 * MAE. A 90% level matches the MDC90 convention of
 * clinimetrics (1.645 z) [common practice]. It treats bias and spread alike, which is the honest reading when the
 * bias differs between clients and cameras.
 */
export const Z90 = 1.645;
export function uncertaintyFromMaeDeg(maeDeg: number): number {
  return Z90 * Math.sqrt(Math.PI / 2) * maeDeg;
}

/**
 * The half-width from a mean absolute error (uncertaintyFromMaeDeg), never narrower than the width that held 90% of
 * the held-out clips' frames where they measured it (the clip reports' "frame P90 °"): the normal rule holds fewer
 * than 90% of errors whose tails are heavy.
 */
export function flooredUncertaintyDeg(maeDeg: number, framesP90Deg: number | null | undefined): number {
  return Math.max(uncertaintyFromMaeDeg(maeDeg), framesP90Deg ?? 0);
}

function cellsFor(table: UncertaintyTable, group: string, model: HandModel | null): ValidationCell[] {
  return table.cells.filter((c) => c.group === group && (model === null || c.model === model));
}

/** The cell for one group, view and hand model, or null when the report has none. */
export function validationCell(table: UncertaintyTable, group: string, model: HandModel, view: ValidationView): ValidationCell | null {
  return table.cells.find((c) => c.group === group && c.model === model && c.view === view) ?? null;
}

/** Whether the engine applies the correction for this group, model and view: only where validation shows it helps. */
export function correctionHelps(table: UncertaintyTable, group: string, model: HandModel, view: ValidationView | null): boolean {
  if (view === null) return cellsFor(table, group, model).every((c) => c.correctionHelps) && cellsFor(table, group, model).length > 0;
  return validationCell(table, group, model, view)?.correctionHelps ?? false;
}

/**
 * Which method's error a figure is for: the one the engine uses in the cell, raw 3-D angles (correction off), a frame
 * the side-view estimator declined and left raw, or one the side-on whole-hand-shape fit read in its stead.
 */
export type UncertaintyMethod = "engine" | "raw" | "declined, raw" | "side-on hand shape";

/** Whether the engine reads the side-view estimator's declined frames in this cell with the side-on whole-hand-shape fit. */
export function sideOnFitHelps(table: UncertaintyTable, group: string, model: HandModel, view: ValidationView | null): boolean {
  return view !== null && (validationCell(table, group, model, view)?.declinedBySideFit?.sideOnFitHelps ?? false);
}

/** A finger's own figure in a cell split by finger (byDigit); undefined where the cell is not split or no finger is named. */
export function digitFigure(cell: Pick<ValidationCell, "byDigit">, digit: Digit | null): DigitFigure | undefined {
  return digit ? cell.byDigit?.find((f) => f.digit === digit) : undefined;
}

function cellUncertaintyDeg(cell: ValidationCell, method: UncertaintyMethod, digit: Digit | null): number {
  const engine = () => digitFigure(cell, digit)?.uncertaintyDeg ?? cell.uncertaintyDeg;
  const raw = () => Math.round(flooredUncertaintyDeg(Math.max(cell.rawMaeDeg, cell.rawAnyPoseMaeDeg ?? 0, cell.clipRawMaeDeg ?? 0), cell.clipRawFramesP90Deg) * 10) / 10;
  const declined = cell.declinedBySideFit;
  if (method === "engine") return engine();
  if (method === "side-on hand shape") return Math.max(engine(), declined?.sideOnFitUncertaintyDeg ?? declined?.rawUncertaintyDeg ?? raw());
  if (method === "declined, raw") return Math.max(raw(), declined?.rawUncertaintyDeg ?? 0);
  return raw();
}

/**
 * The validation uncertainty before any tracking factor: the finger's own figure where the cell is split by finger.
 * Where the view (or model) is unknown, or the report has no cell for it, the worst cell of that group is taken. Null
 * when the report has no figure for the group at all.
 */
export function baseUncertaintyDeg(
  table: UncertaintyTable,
  group: string,
  model: HandModel | null,
  view: ValidationView | null,
  method: UncertaintyMethod = "engine",
  digit: Digit | null = null,
): number | null {
  const pool = cellPool(table, group, model, view);
  return pool.length ? Math.max(...pool.map((c) => cellUncertaintyDeg(c, method, digit))) : null;
}

/**
 * The cells a reading's figure comes from: the one of its group, model and view; with either unknown, or no such
 * cell, every cell of the group for that model (or for any model when it has none), whose worst figure is taken.
 */
function cellPool(table: UncertaintyTable, group: string, model: HandModel | null, view: ValidationView | null): ValidationCell[] {
  const exact = model && view ? validationCell(table, group, model, view) : null;
  if (exact) return [exact];
  const candidates = cellsFor(table, group, model);
  return candidates.length ? candidates : cellsFor(table, group, null);
}

/**
 * Kinarc's rule for poor tracking [our reasoning, not validated: the renders were tracked at high hand-presence
 * scores]: no widening at a score of 0.9 or more, then linearly wider to twice the width at 0.5, the lowest score the
 * pipeline reads at all (DEFAULT_MIN_SCORE). A doubling at the cut-off keeps an interval honest where the landmark
 * model itself says it is barely sure it sees a hand.
 */
export const FULL_CONFIDENCE_SCORE = 0.9;
export const LOWEST_READ_SCORE = 0.5;
export function trackingFactor(score: number): number {
  const s = Number.isFinite(score) ? Math.min(1, Math.max(0, score)) : 0;
  if (s >= FULL_CONFIDENCE_SCORE) return 1;
  return 1 + (FULL_CONFIDENCE_SCORE - s) / (FULL_CONFIDENCE_SCORE - LOWEST_READ_SCORE);
}

/** A validation figure widened by the tracking score (trackingFactor), to 0.1 degree. */
function widenedByScore(deg: number, score: number): number {
  return Math.round(deg * trackingFactor(score) * 10) / 10;
}

/**
 * Uncertainty of a wrist angle read against how the hand was first seen (no straight-wrist reading, no forearm in
 * view): the held-out clips read that way (UncertaintyTable.withoutStraightWristReading), widened by tracking score,
 * or the cell's own figure when that is wider. Their error comes from where the hand happened to be when the tracker
 * first found it, not from the joint or the view, so one pooled figure serves every wrist motion. Null for other
 * motions or when the table has no such figure.
 */
export function withoutStraightWristUncertaintyDeg(
  motion: MotionId,
  cellUncertaintyDeg: number | null,
  score: number,
  table: UncertaintyTable = UNCERTAINTY_TABLE,
): number | null {
  const pooled = table.withoutStraightWristReading;
  if (!pooled || MOTIONS[motion].joint !== "wrist") return null;
  return Math.max(cellUncertaintyDeg ?? 0, widenedByScore(pooled.uncertaintyDeg, score));
}

/** Uncertainty of a motion's angle: validation error for its joint, view and model, widened by tracking score. */
export function angleUncertaintyDeg(
  motion: MotionId,
  digit: Digit | null,
  model: HandModel | null,
  view: ValidationView | null,
  score: number,
  table: UncertaintyTable = UNCERTAINTY_TABLE,
  method: UncertaintyMethod = "engine",
): number | null {
  const target = correctionGroupFor(motion, digit);
  // The middle finger's spread has no fit but is the same joint geometry as the other fingers' spread.
  const group = target?.group ?? (motion.startsWith("finger.") ? "finger abduction" : null);
  if (!group) return null;
  const base = baseUncertaintyDeg(table, group, model, view, method, digit);
  return base === null ? null : widenedByScore(base, score);
}

/**
 * The held-out peak figure for a motion (ValidationCell.clipPeakP90Deg, or clipRawPeakP90Deg for the raw method),
 * widened by tracking score: the cell of its group, model and view, or with either unknown (or no such cell) the worst
 * figure among the group's cells. Null where no held-out clip measured a peak for the group. A capture's start, peak
 * and arc take the wider of this and the frame interval: on held-out clips a wrist's peak missed by about twice what
 * a frame did, so the frame interval held fewer than 90% of peaks there (scripts/accuracy/README.md).
 */
export function peakUncertaintyDeg(
  motion: MotionId,
  digit: Digit | null,
  model: HandModel | null,
  view: ValidationView | null,
  score: number,
  table: UncertaintyTable = UNCERTAINTY_TABLE,
  method: UncertaintyMethod = "engine",
): number | null {
  const group = correctionGroupFor(motion, digit)?.group;
  if (!group) return null;
  // A frame the side-on fit read is a corrected frame: the engine's peak figure, under the frame's own wider interval.
  const figure = (c: ValidationCell) => (method === "engine" || method === "side-on hand shape" ? c.clipPeakP90Deg : c.clipRawPeakP90Deg);
  const figures = cellPool(table, group, model, view).flatMap((c) => (figure(c) === undefined ? [] : [figure(c)!]));
  return figures.length ? widenedByScore(Math.max(...figures), score) : null;
}

/**
 * The single-finger cell for a motion's group, model and view; with the view (or model) unknown or without a cell of
 * its own, the worst of the group's cells. Null for motions outside the table.
 */
export function fingerAloneCell(
  table: UncertaintyTable,
  motion: MotionId,
  digit: Digit | null,
  model: HandModel | null,
  view: ValidationView | null,
): FingerAloneCell | null {
  const group = correctionGroupFor(motion, digit)?.group;
  const cells = (table.fingerAlone ?? []).filter((c) => c.group === group);
  const exact = cells.find((c) => c.model === model && c.view === view);
  if (exact) return exact;
  const pool = cells.filter((c) => model === null || c.model === model);
  const from = pool.length ? pool : cells;
  return from.length ? from.reduce((worst, c) => (c.uncertaintyDeg > worst.uncertaintyDeg ? c : worst)) : null;
}

/**
 * Uncertainty of a finger tested on its own: its single-finger cell (the finger's own figure where held-out one-finger
 * clips measured it in this view and model), widened by tracking score.
 */
export function fingerAloneUncertaintyDeg(motion: MotionId, digit: Digit | null, model: HandModel | null, view: ValidationView | null, score: number, table = UNCERTAINTY_TABLE): number | null {
  const cell = fingerAloneCell(table, motion, digit, model, view);
  if (!cell) return null;
  return widenedByScore(ownFigureIn(cell, digit, model, view)?.uncertaintyDeg ?? cell.uncertaintyDeg, score);
}

/** A finger's own figure only for the view and model that measured it, never for a stand-in cell. */
function ownFigureIn(cell: FingerAloneCell, digit: Digit | null, model: HandModel | null, view: ValidationView | null): DigitFigure | undefined {
  return cell.view === view && cell.model === model ? digitFigure(cell, digit) : undefined;
}

/**
 * The held-out one-finger clips' own figure for this finger bent alone in this view and model (FingerAloneCell.byDigit),
 * or undefined where they did not measure it (the pooled single-finger cell stands then).
 */
export function ownAloneFigure(table: UncertaintyTable, motion: MotionId, digit: Digit | null, model: HandModel | null, view: ValidationView | null): DigitFigure | undefined {
  const cell = fingerAloneCell(table, motion, digit, model, view);
  return cell ? ownFigureIn(cell, digit, model, view) : undefined;
}

/**
 * Uncertainty of both hand models read together, where the held-out clips measured their combined reading for the
 * motion's group in this view (PairCell), widened by tracking score; null elsewhere (the caller keeps its one-model rule).
 */
export function pairUncertaintyDeg(motion: MotionId, digit: Digit | null, view: ValidationView | null, score: number, table: UncertaintyTable = UNCERTAINTY_TABLE): number | null {
  const cell = pairCell(motion, digit, view, table);
  return cell ? widenedByScore(digitFigure(cell, digit)?.uncertaintyDeg ?? cell.uncertaintyDeg, score) : null;
}

/** The peak figure of both hand models read together (PairCell.clipPeakP90Deg), widened by tracking score; null without one. */
export function pairPeakUncertaintyDeg(motion: MotionId, digit: Digit | null, view: ValidationView | null, score: number, table: UncertaintyTable = UNCERTAINTY_TABLE): number | null {
  const figure = pairCell(motion, digit, view, table)?.clipPeakP90Deg;
  return figure === undefined ? null : widenedByScore(figure, score);
}

function pairCell(motion: MotionId, digit: Digit | null, view: ValidationView | null, table: UncertaintyTable): PairCell | undefined {
  const group = correctionGroupFor(motion, digit)?.group;
  return view === null || !group ? undefined : table.pairs?.find((c) => c.group === group && c.view === view);
}
