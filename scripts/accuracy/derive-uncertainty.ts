/**
 * Derives the engine's uncertainty table (vision/uncertainty-table.json) from the accuracy report
 * (scripts/accuracy/report.md): per joint group, view and hand model, whether the correction lowered the held-out
 * error (then the engine applies it) and the 90% interval half-width of the method the engine then uses.
 * Re-run after `npm run accuracy`:
 *
 *   npx tsx scripts/accuracy/derive-uncertainty.ts
 */
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { FINGERS, type MotionId } from "@/lib/motions/catalog";
import { CORRECTION_VERSION, correctionGroupFor, type HandModel } from "@/vision/correction";
import { fingerJointOfGroup } from "@/vision/estimator";
import { flooredUncertaintyDeg, uncertaintyFromMaeDeg, VALIDATION_VIEWS, type DigitFigure, type FingerAloneCell, type PairCell, type UncertaintyTable, type ValidationCell, type ValidationView } from "@/vision/uncertainty";

const HERE = path.dirname(fileURLToPath(import.meta.url));
export const REPORT_FILE = path.join(HERE, "report.md");
export const UNCERTAINTY_FILE = path.join(HERE, "..", "..", "vision", "uncertainty-table.json");
export const UNCERTAINTY_VERSION = "kinarc-uncertainty-1";
/** The whole-hand-shape estimator's held-out cells (scripts/accuracy/hand-shape-fit.ts holdout), front fit first. */
export const HAND_SHAPE_VALIDATION_FILE = path.join(HERE, "..", "..", "vision", "correction-hand-shape-validation.json");
export const HAND_SHAPE_DOWN_VALIDATION_FILE = path.join(HERE, "..", "..", "vision", "correction-hand-shape-down-validation.json");
/** The side-on whole-hand-shape fit (kinarc-correction-9): it reads only frames the side-view estimator declines. */
export const HAND_SHAPE_SIDE_FILE = path.join(HERE, "..", "..", "vision", "correction-hand-shape-side.json");
export const HAND_SHAPE_SIDE_VALIDATION_FILE = path.join(HERE, "..", "..", "vision", "correction-hand-shape-side-validation.json");
export const HAND_SHAPE_VALIDATION_FILES = [HAND_SHAPE_VALIDATION_FILE, HAND_SHAPE_DOWN_VALIDATION_FILE] as const;
/** The held-out clip reports (scripts/accuracy/clip-validation.ts), one per condition. */
export const CLIP_REPORT_FILES = [
  path.join(HERE, "clip-report.md"),
  path.join(HERE, "clip-report-gravity-minimized.md"),
  // Whole-hand shapes: the finger test motions seen from the palm, the back and above (clip-validation.ts --view).
  path.join(HERE, "clip-report-hand-shapes.md"),
  // The MCP and PIP test motions seen from the palm on training seed 77000409 (never fitted on), the mesh's hand and
  // hands of varied build: its PIP peaks fell outside the intervals stated without it (clip-validation.ts SEED_NOTES).
  path.join(HERE, "clip-report-palm-view.md"),
  path.join(HERE, "clip-report-palm-view-varied-build.md"),
  // The PIP test motion with each finger's DIP bending along at 0.7 of its PIP (training seed 77000412, never fitted
  // on, both test positions): the engine over-reads the PIP by about 9-10 degrees then, and the landmarks cannot tell
  // that from a PIP bent alone, so the PIP's intervals must hold for both (clip-validation.ts --dip-follows).
  path.join(HERE, "clip-report-pip-dip-follows.md"),
  path.join(HERE, "clip-report-gravity-minimized-pip-dip-follows.md"),
  // The fresh check of kinarc-correction-10's little-finger-side PIP (seed 20261239, the PIP alone and with its DIP
  // along): the full model's peaks fell outside the stated ± more often than its rule allowed, so it is a source too.
  path.join(HERE, "clip-report-pip-check.md"),
  path.join(HERE, "clip-report-pip-dip-follows-check.md"),
] as const;

/**
 * Held-out one-finger clips (clip-validation.ts --one-finger), split by finger: their per-finger tables give a lone
 * finger its own interval (FingerAloneCell.byDigit) where a view measured it.
 */
export const ONE_FINGER_CLIP_REPORT_FILES = [
  path.join(HERE, "clip-report-one-finger-little.md"),
  path.join(HERE, "clip-report-one-finger-index-middle-ring.md"),
] as const;

/** Both hand models on one clip (model-agreement.ts): its "both" rows give the two-model cells (PairCell). */
export const TWO_MODEL_REPORT_FILE = path.join(HERE, "clip-report-two-models.md");
/**
 * Both models on the PIP test motion with each finger's DIP bending along (training seed 77000412, never fitted on):
 * read beside TWO_MODEL_REPORT_FILE, its seed taken as a source like the held-out ones, so the two-model PIP interval
 * holds for that motion as the one-model intervals do (CLIP_REPORT_FILES).
 */
export const TWO_MODEL_DIP_FOLLOWS_FILE = path.join(HERE, "clip-report-two-models-pip-dip-follows.md");
export const TWO_MODEL_DIP_FOLLOWS_SEEDS: ReadonlySet<string> = new Set(["77000412"]);

/** Both models on the fresh check of kinarc-correction-10's PIP (seed 20261239), a source like its one-model rows. */
export const TWO_MODEL_PIP_CHECK_FILE = path.join(HERE, "clip-report-two-models-pip-check.md");

/** The two-model report and its PIP companions, as one markdown text for parsePairCells. */
export function readTwoModelReports(): string {
  return [TWO_MODEL_REPORT_FILE, TWO_MODEL_DIP_FOLLOWS_FILE, TWO_MODEL_PIP_CHECK_FILE].filter((f) => existsSync(f)).map((f) => readFileSync(f, "utf8")).join("\n");
}

/** A markdown table row's cells, trimmed (the row starts and ends with "|"). */
function tableCells(row: string): string[] {
  return row.split("|").slice(1, -1).map((c) => c.trim());
}

/** A held-out clip figure: the worst frame MAE over the reports' seeds for one group, view and model. */
export interface ClipRow {
  group: string;
  view: string;
  model: string;
  /** The engine as shipped (correction where it helps, depth mirror on). */
  engineMaeDeg: number;
  /** No correction, no depth mirror. */
  rawMaeDeg: number;
  /** How many seeds' engine rows measured it. */
  seeds: number;
  /**
   * The half-width that held 90% of the peaks (the reports' "peak P90 °"), the worst over the seeds, engine and raw;
   * absent unless every seed's row gave it (a report written before the column was added does not).
   */
  enginePeakP90Deg?: number;
  rawPeakP90Deg?: number;
  /** The half-width that held 90% of detected frames (the reports' "frame P90 °"), the worst seed; as the peak's. */
  engineFramesP90Deg?: number;
  rawFramesP90Deg?: number;
}

/** A row of a markdown table, its cells looked up by the table's column names. */
export interface TableRow {
  cells: string[];
  at: (name: string) => string;
}

/**
 * The body rows of every table in `markdowns` whose header `wants` (a header is the row right above a `| --- |` line;
 * a table ends at the first line that is not a row).
 */
export function tableRows(markdowns: readonly string[], wants: (header: readonly string[]) => boolean): TableRow[] {
  const out: TableRow[] = [];
  for (const markdown of markdowns) {
    const lines = markdown.split("\n").map((line) => line.trim());
    let columns: string[] | null = null;
    lines.forEach((text, i) => {
      if (!text.startsWith("|")) {
        columns = null;
        return;
      }
      const cells = tableCells(text);
      if (cells[0].startsWith("---")) return;
      if (lines[i + 1]?.startsWith("| ---")) {
        columns = wants(cells) ? cells : null;
        return;
      }
      const header = columns;
      if (header) out.push({ cells, at: (name: string) => cells[header.indexOf(name)] });
    });
  }
  return out;
}

/** A figure of a table row, named in the error when it is not a number (a trailing % is dropped). */
export function rowNumber(row: TableRow, name: string, what: string, kind: "motion" | "finger" | "wrist"): number {
  const value = Number(row.at(name).replace(/%$/, ""));
  // The cells that name the row: motion, view, model and reading (or finger); the wrist table's forearm line and model.
  const naming = row.cells.slice(0, kind === "wrist" ? 2 : 4).join(", ");
  if (!Number.isFinite(value)) throw new Error(`clip report: ${kind} row "${naming}": expected ${what} for ${name}, got "${row.at(name)}"`);
  return value;
}

/** The per-motion tables: one row per reading method (the per-finger table below them has no "reading" column). */
export const isMotionTable = (header: readonly string[]) => header[0] === "motion" && header.includes("reading");

/**
 * The clip reports' frame MAE per group, view and model, the worst over their seeds (and reports), for the engine and
 * raw readings. Throws naming the row when a figure is not a number.
 */
export function parseClipReports(markdowns: readonly string[]): ClipRow[] {
  const rows = new Map<string, ClipRow>();
  const optional = new OptionalFigures();
  for (const r of tableRows(markdowns, isMotionTable)) {
    const reading = r.at("reading");
    if (reading !== "engine" && reading !== "raw") continue;
    const mae = rowNumber(r, "MAE °", "a number of degrees", "motion");
    const key = `${r.cells[0]}|${r.at("view")}|${r.at("model")}`;
    const row = rows.get(key) ?? { group: r.cells[0], view: r.at("view"), model: r.at("model"), engineMaeDeg: 0, rawMaeDeg: 0, seeds: 0 };
    if (reading === "engine") {
      row.engineMaeDeg = Math.max(row.engineMaeDeg, mae);
      row.seeds += 1;
    } else row.rawMaeDeg = Math.max(row.rawMaeDeg, mae);
    rows.set(key, row);
    optional.add(`${key}|${reading}|peak`, r, "peak P90 °", "motion");
    optional.add(`${key}|${reading}|frames`, r, "frame P90 °", "motion");
  }
  for (const [key, row] of rows) {
    const figures = {
      enginePeakP90Deg: optional.worstOverAll(`${key}|engine|peak`, row.seeds),
      rawPeakP90Deg: optional.worstOverAll(`${key}|raw|peak`, row.seeds),
      engineFramesP90Deg: optional.worstOverAll(`${key}|engine|frames`, row.seeds),
      rawFramesP90Deg: optional.worstOverAll(`${key}|raw|frames`, row.seeds),
    };
    for (const [name, value] of Object.entries(figures)) if (value !== null) row[name as keyof typeof figures] = value;
  }
  return [...rows.values()];
}

/**
 * Figures of a column that older reports lack (or show as "-" where there was nothing to rank): per key, the worst
 * over the rows that gave one, and how many did. A cell takes such a figure only where every seed gave it.
 */
class OptionalFigures {
  private readonly seen = new Map<string, { seeds: number; worstDeg: number }>();

  add(key: string, row: TableRow, column: string, kind: "motion" | "finger"): void {
    const cell = row.at(column);
    if (cell === undefined || cell === "-") return;
    const value = rowNumber(row, column, "a number of degrees", kind);
    const before = this.seen.get(key) ?? { seeds: 0, worstDeg: 0 };
    this.seen.set(key, { seeds: before.seeds + 1, worstDeg: Math.max(before.worstDeg, value) });
  }

  worstOverAll(key: string, seeds: number): number | null {
    const figure = this.seen.get(key);
    return figure && figure.seeds === seeds ? figure.worstDeg : null;
  }
}

/** The header of the two-model report's by-finger table of both models together (written by model-agreement.ts). */
export const BOTH_BY_FINGER_HEADER = "| motion | seed | finger | both: readings | both: detected | both: MAE ° |";

/**
 * The two-model cells from the two-model report: per finger joint and view, the engine's frame MAE of both models read
 * together ("both" rows), the worst over the held-out seeds (2026xxxx; the training seeds' rows and the "all" rows are
 * left out). Sections against gravity were seen from the little-finger side (view ulnar), with gravity minimized from
 * the thumb side (radial). From the thumb side the fingers read unalike (the one-model cells there are split by
 * finger), so a thumb-side cell is made only where every seed that measured it was also split by finger (the report's
 * "both" by-finger tables), and each finger takes its own worst seed. Throws naming the row when a figure is not a number.
 */
export function parsePairCells(markdown: string, trainingSeeds: ReadonlySet<string> = new Set()): PairCell[] {
  const worst = new Map<string, { group: string; view: ValidationView; maeDeg: number; seeds: number }>();
  const optional = new OptionalFigures();
  const fingers = new Map<string, { maeDeg: number; seeds: number }>();
  // Held-out seeds, and the training seeds a caller names as sources (never fitted on; e.g. 77000412's PIP with its DIP bending along).
  const heldOut = (seed: string) => /^2026\d{4}$/.test(seed) || trainingSeeds.has(seed);
  // The engine's own group for the motion (four fingers: no digit); only the finger flexion groups are read by both models.
  const groupOf = (motion: string, naming: string) => {
    const group = correctionGroupFor(motion as MotionId, null)?.group;
    if (!group || !fingerJointOfGroup(group)) throw new Error(`two-model report: row "${naming}": expected a finger's MCP, PIP or DIP flexion`);
    return group;
  };
  for (const section of markdown.split(/^## /m).slice(1)) {
    const heading = section.split("\n")[0];
    const view: ValidationView | null = heading.endsWith(", against gravity") ? "ulnar" : heading.endsWith(", gravity minimized") ? "radial" : null;
    if (!view) continue;
    for (const r of tableRows([section], isMotionTable)) {
      if (r.at("reading") !== "both" || !heldOut(r.at("seed"))) continue;
      const group = groupOf(r.cells[0], r.cells.slice(0, 3).join(", "));
      const mae = rowNumber(r, "MAE °", "a number of degrees", "motion");
      const key = `${group}|${view}`;
      const seen = worst.get(key) ?? { group, view, maeDeg: 0, seeds: 0 };
      worst.set(key, { ...seen, maeDeg: Math.max(seen.maeDeg, mae), seeds: seen.seeds + 1 });
      optional.add(`${key}|peak`, r, "peak P90 °", "motion");
      optional.add(`${key}|frames`, r, "frame P90 °", "motion");
    }
    for (const r of tableRows([section], (header) => tableCells(BOTH_BY_FINGER_HEADER).every((name, i) => header[i] === name))) {
      if (!heldOut(r.at("seed"))) continue;
      const group = groupOf(r.cells[0], r.cells.slice(0, 3).join(", "));
      const mae = rowNumber(r, "both: MAE °", "a number of degrees", "finger");
      const key = `${group}|${view}|${r.at("finger")}`;
      const seen = fingers.get(key) ?? { maeDeg: 0, seeds: 0 };
      fingers.set(key, { maeDeg: Math.max(seen.maeDeg, mae), seeds: seen.seeds + 1 });
      optional.add(`${key}|frames`, r, "both: frame P90 °", "finger");
    }
  }
  const cells: PairCell[] = [];
  for (const [key, w] of worst) {
    const peakP90Deg = optional.worstOverAll(`${key}|peak`, w.seeds);
    const framesP90Deg = optional.worstOverAll(`${key}|frames`, w.seeds);
    const split = FINGERS.map((digit) => ({ digit, row: fingers.get(`${key}|${digit}`) }));
    const complete = split.every((f) => f.row && f.row.seeds === w.seeds);
    if (w.view === "radial" && !complete) continue;
    cells.push({
      group: w.group,
      view: w.view,
      models: ["lite", "full"],
      seeds: w.seeds,
      clipMaeDeg: w.maeDeg,
      // The normal rule, never narrower than the width that held 90% of the held-out frames (as for one model).
      uncertaintyDeg: round1(flooredUncertaintyDeg(w.maeDeg, framesP90Deg)),
      ...(framesP90Deg !== null ? { clipFramesP90Deg: framesP90Deg } : {}),
      ...(peakP90Deg !== null ? { clipPeakP90Deg: peakP90Deg } : {}),
      ...(w.view === "radial"
        ? {
            byDigit: split.map((f) => {
              const fingerP90 = optional.worstOverAll(`${key}|${f.digit}|frames`, w.seeds);
              return {
                digit: f.digit,
                clipMaeDeg: f.row!.maeDeg,
                ...(fingerP90 !== null ? { clipFramesP90Deg: fingerP90 } : {}),
                uncertaintyDeg: round1(flooredUncertaintyDeg(f.row!.maeDeg, fingerP90)),
              };
            }),
          }
        : {}),
    });
  }
  return cells;
}

/**
 * The clip reports' wrist readings made without a straight-wrist reading (clip-validation.ts
 * WITHOUT_STRAIGHT_WRIST_HEADER), pooled: their count and the frame MAE over all their detected frames. Null when no
 * report has any. Throws naming the row when a figure is not a number.
 */
export function parseWithoutStraightWrist(markdowns: readonly string[]): { readings: number; maeDeg: number } | null {
  let readings = 0;
  let detectedFrames = 0;
  let errorSum = 0;
  for (const r of tableRows(markdowns, (header) => header[0] === "forearm line")) {
    const detected = rowNumber(r, "frames", "a count", "wrist") * (rowNumber(r, "detected", "a percentage", "wrist") / 100);
    readings += rowNumber(r, "readings", "a count", "wrist");
    detectedFrames += detected;
    errorSum += detected * rowNumber(r, "MAE °", "a number of degrees", "wrist");
  }
  return readings > 0 && detectedFrames > 0 ? { readings, maeDeg: Math.round((errorSum / detectedFrames) * 100) / 100 } : null;
}

/** A held-out clip figure for one finger: the engine's worst frame MAE over the reports' seeds. */
export interface ClipFingerRow {
  group: string;
  view: string;
  model: string;
  digit: string;
  engineMaeDeg: number;
  /** How many seeds measured it (a cell is split by finger only where every seed that measured it was split). */
  seeds: number;
  /** The finger's frame P90, the worst seed, where every seed gave it. */
  engineFramesP90Deg?: number;
  /** The finger's peak MAE, the worst seed, where every seed gave it. */
  enginePeakMaeDeg?: number;
}

/**
 * The clip reports' per-finger tables (clip-validation.ts "By finger (engine)"): per group, view, model and finger,
 * the worst engine frame MAE over the seeds. Throws naming the row when a figure is not a number.
 */
export function parseClipFingerRows(markdowns: readonly string[]): ClipFingerRow[] {
  const rows = new Map<string, ClipFingerRow>();
  const optional = new OptionalFigures();
  const peaks = new OptionalFigures();
  for (const r of tableRows(markdowns, (header) => header[0] === "motion" && header.includes("finger"))) {
    const mae = rowNumber(r, "MAE °", "a number of degrees", "finger");
    const key = `${r.cells[0]}|${r.at("view")}|${r.at("model")}|${r.at("finger")}`;
    const row = rows.get(key) ?? { group: r.cells[0], view: r.at("view"), model: r.at("model"), digit: r.at("finger"), engineMaeDeg: 0, seeds: 0 };
    row.engineMaeDeg = Math.max(row.engineMaeDeg, mae);
    row.seeds += 1;
    rows.set(key, row);
    optional.add(key, r, "frame P90 °", "finger");
    peaks.add(key, r, "peak MAE °", "finger");
  }
  for (const [key, row] of rows) {
    const p90 = optional.worstOverAll(key, row.seeds);
    if (p90 !== null) row.engineFramesP90Deg = p90;
    const peak = peaks.worstOverAll(key, row.seeds);
    if (peak !== null) row.enginePeakMaeDeg = peak;
  }
  return [...rows.values()];
}

/** The committed clip reports' text (none for a report not yet written). */
function readClipReports(files: readonly string[] = CLIP_REPORT_FILES): string[] {
  return files.filter((file) => existsSync(file)).map((file) => readFileSync(file, "utf8"));
}

/** The committed clip reports' rows. */
export function readClipRows(files: readonly string[] = CLIP_REPORT_FILES): ClipRow[] {
  return parseClipReports(readClipReports(files));
}

/** The committed clip reports' per-finger rows. */
export function readClipFingerRows(files: readonly string[] = CLIP_REPORT_FILES): ClipFingerRow[] {
  return parseClipFingerRows(readClipReports(files));
}

/** A held-out cell of the whole-hand shapes: the figures the table needs. */
export interface HandShapeRow {
  group: string;
  view: string;
  model: string;
  samples: number;
  rawMaeDeg: number;
  correctedMaeDeg: number | null;
}

/**
 * A held-out cell of the side-on whole-hand shapes (hand-shape-fit.ts holdout --family side; SideHandShapeCell there):
 * the frames the side-view estimator declined, raw and with the side-on fit.
 */
export interface DeclinedRow {
  group: string;
  view: string;
  model: string;
  declined: {
    samples: number;
    rawMaeDeg: number | null;
    rawP90Deg: number | null;
    afterMaeDeg: number | null;
    afterP90Deg: number | null;
    correctionHelps: boolean;
  };
}

/** The committed side-on held-out rows, or none when the file has not been written. */
export function readDeclinedRows(file: string = HAND_SHAPE_SIDE_VALIDATION_FILE): DeclinedRow[] {
  return readHeldOutCells<DeclinedRow>(file);
}

/** The "cells" of a committed held-out file (hand-shape-fit.ts holdout), or none when the file has not been written. */
function readHeldOutCells<T>(file: string): T[] {
  if (!existsSync(file)) return [];
  const parsed = JSON.parse(readFileSync(file, "utf8")) as { cells?: T[] };
  if (!Array.isArray(parsed.cells)) throw new Error(`${file}: expected "cells", a list of held-out rows`);
  return parsed.cells;
}

/**
 * Attaches the declined frames' figures to the side-on cells they were measured in (ValidationCell.declinedBySideFit).
 * A row with no raw figure (no declined frame held out) adds nothing; a row for a cell the table lacks is an error.
 */
export function withDeclinedFigures(cells: readonly ValidationCell[], rows: readonly DeclinedRow[]): ValidationCell[] {
  const out = cells.map((c) => ({ ...c }));
  for (const row of rows) {
    const cell = out.find((c) => c.group === row.group && c.view === row.view && c.model === row.model);
    if (!cell) throw new Error(`side-on hand shapes: no cell ${row.group} | ${row.view} | ${row.model} in the table`);
    const d = row.declined;
    if (d.rawMaeDeg === null || d.rawP90Deg === null || d.samples === 0) continue;
    const helps = d.correctionHelps && d.afterMaeDeg !== null;
    cell.declinedBySideFit = {
      samples: d.samples,
      rawMaeDeg: d.rawMaeDeg,
      rawP90Deg: d.rawP90Deg,
      sideOnFitMaeDeg: d.afterMaeDeg,
      sideOnFitP90Deg: d.afterP90Deg,
      sideOnFitHelps: helps,
      rawUncertaintyDeg: round1(flooredUncertaintyDeg(d.rawMaeDeg, d.rawP90Deg)),
      sideOnFitUncertaintyDeg: helps ? round1(flooredUncertaintyDeg(d.afterMaeDeg!, d.afterP90Deg)) : null,
    };
  }
  return out;
}

export interface ReportRow {
  group: string;
  view: string;
  model: string;
  samples: number;
  maeDeg: number | null;
}

export type ReportSection = "test motions" | "random poses" | "single finger";
export type ReportMethod = "raw 3-D" | "image plane" | "corrected";

/** The report's tables by section and method, rows as numbers. Throws naming the heading when one is missing. */
export function parseAccuracyReport(markdown: string): Record<ReportSection, Record<ReportMethod, ReportRow[]>> {
  const sections: Record<string, ReportSection> = {
    "## Test motions in their recommended view": "test motions",
    "## Random poses in every view": "random poses",
    "## Single-finger test motions in their recommended view": "single finger",
  };
  const methods: Record<string, ReportMethod> = {
    "### Raw landmarks, 3-D angles": "raw 3-D",
    "### Raw landmarks, image plane angles": "image plane",
    "### After correction": "corrected",
  };
  const out: Record<ReportSection, Record<ReportMethod, ReportRow[]>> = {
    "test motions": { "raw 3-D": [], "image plane": [], corrected: [] },
    "random poses": { "raw 3-D": [], "image plane": [], corrected: [] },
    "single finger": { "raw 3-D": [], "image plane": [], corrected: [] },
  };
  let section: ReportSection | null = null;
  let method: ReportMethod | null = null;
  let maeColumn = -1;
  const seen = new Set<string>();
  for (const line of markdown.split("\n")) {
    const heading = line.trim();
    if (heading.startsWith("## ")) {
      section = sections[heading] ?? null;
      method = null;
    } else if (heading.startsWith("### ")) {
      method = methods[heading] ?? null;
      if (section && method) seen.add(`${section} / ${method}`);
    } else if (section && method && heading.startsWith("|")) {
      const cells = tableCells(heading);
      if (cells[0] === "joint") {
        maeColumn = cells.indexOf("MAE °");
        if (maeColumn < 0) throw new Error(`report: table "${section} / ${method}" has no "MAE °" column`);
        continue;
      }
      if (cells[0].startsWith("---")) continue;
      const mae = cells[maeColumn] === "-" ? null : Number(cells[maeColumn]);
      if (mae !== null && !Number.isFinite(mae)) throw new Error(`report: "${section} / ${method}" row "${cells.slice(0, 3).join(", ")}": expected a number of degrees for MAE, got "${cells[maeColumn]}"`);
      out[section][method].push({ group: cells[0], view: cells[1], model: cells[2], samples: Number(cells[3]), maeDeg: mae });
    }
  }
  for (const s of Object.values(sections)) {
    for (const m of ["raw 3-D", "corrected"] as const) {
      if (!seen.has(`${s} / ${m}`)) throw new Error(`report: expected a table "${s} / ${m}"`);
    }
  }
  return out;
}

const round1 = (x: number) => Math.round(x * 10) / 10;

/**
 * One cell per group, view and model. Test-motion rows (one joint moving, in the view the catalog recommends: what
 * the app measures) come first; then the whole-hand shapes' held-out rows (finger flexion seen from the palm, back,
 * obliquely or from above, all four fingers bent together as the app asks); random-pose rows fill the views and groups they lack. The correction is applied
 * where its held-out MAE is clearly below the raw 3-D MAE (`correctionClearlyHelps`); the uncertainty is that of the
 * method the engine then uses.
 */
/**
 * The correction is applied only where it lowers the held-out error by more than chance could: by at least two
 * standard errors of the raw MAE. For a normal error the absolute error's SD is sqrt(pi/2 - 1) ≈ 0.755 times its mean,
 * so SE(MAE) ≈ 0.755 · MAE / sqrt(n). (Our rule; it keeps a fit that wins by a few degrees out of forty on a
 * random-pose view it was not trained for from moving real readings.)
 */
export const ABS_ERROR_SD_PER_MEAN = Math.sqrt(Math.PI / 2 - 1);

export function correctionClearlyHelps(rawMaeDeg: number, correctedMaeDeg: number, samples: number): boolean {
  const standardError = (ABS_ERROR_SD_PER_MEAN * rawMaeDeg) / Math.sqrt(Math.max(1, samples));
  return correctedMaeDeg <= rawMaeDeg - 2 * standardError;
}

export function deriveUncertaintyTable(
  report: ReturnType<typeof parseAccuracyReport>,
  handShapeRows: readonly HandShapeRow[] = [],
  correctionVersion: string = CORRECTION_VERSION,
  clipRows: readonly ClipRow[] = [],
  withoutStraightWrist: { readings: number; maeDeg: number } | null = null,
  clipFingerRows: readonly ClipFingerRow[] = [],
  pairCells: readonly PairCell[] = [],
  aloneFingerRows: readonly ClipFingerRow[] = [],
  declinedRows: readonly DeclinedRow[] = [],
): UncertaintyTable {
  const clips = new Map(clipRows.map((r) => [`${r.group}|${r.view}|${r.model}`, r]));
  // A cell is split by finger where every seed that measured it was split, for all four fingers.
  const byDigitOf = (key: string, clip: ClipRow | undefined, stillMae: number): DigitFigure[] | null => {
    if (!clip) return null;
    const figures: DigitFigure[] = [];
    for (const digit of FINGERS) {
      const row = clipFingerRows.find((r) => `${r.group}|${r.view}|${r.model}|${r.digit}` === `${key}|${digit}` && r.seeds === clip.seeds);
      if (!row) return null;
      figures.push({
        digit,
        clipMaeDeg: row.engineMaeDeg,
        ...(row.engineFramesP90Deg !== undefined ? { clipFramesP90Deg: row.engineFramesP90Deg } : {}),
        uncertaintyDeg: round1(flooredUncertaintyDeg(Math.max(stillMae, row.engineMaeDeg), row.engineFramesP90Deg)),
      });
    }
    return figures;
  };
  const cells: ValidationCell[] = [];
  const taken = new Set<string>();
  const handShapes = {
    "raw 3-D": handShapeRows.map((r) => ({ group: r.group, view: r.view, model: r.model, samples: r.samples, maeDeg: r.rawMaeDeg })),
    corrected: handShapeRows.map((r) => ({ group: r.group, view: r.view, model: r.model, samples: r.samples, maeDeg: r.correctedMaeDeg })),
  };
  for (const source of ["test motions", "hand shapes", "random poses"] as const) {
    const rows = source === "hand shapes" ? handShapes : report[source];
    const corrected = new Map(rows.corrected.map((r) => [`${r.group}|${r.view}|${r.model}`, r]));
    for (const raw of rows["raw 3-D"]) {
      const key = `${raw.group}|${raw.view}|${raw.model}`;
      if (taken.has(key) || raw.maeDeg === null) continue;
      if (!(VALIDATION_VIEWS as readonly string[]).includes(raw.view)) throw new Error(`report: view "${raw.view}": expected one of ${VALIDATION_VIEWS.join(", ")}`);
      if (raw.model !== "lite" && raw.model !== "full") throw new Error(`report: model "${raw.model}": expected lite or full`);
      const correctedMae = corrected.get(key)?.maeDeg ?? null;
      const helps = correctedMae !== null && correctionClearlyHelps(raw.maeDeg, correctedMae, raw.samples);
      taken.add(key);
      const anyPose = source === "hand shapes" ? report["random poses"]["raw 3-D"].find((r) => `${r.group}|${r.view}|${r.model}` === key)?.maeDeg : null;
      const clip = clips.get(key);
      const stillMae = helps ? correctedMae! : Math.max(raw.maeDeg, anyPose ?? 0);
      const byDigit = byDigitOf(key, clip, stillMae);
      cells.push({
        group: raw.group,
        view: raw.view as ValidationView,
        model: raw.model as HandModel,
        source,
        samples: raw.samples,
        rawMaeDeg: raw.maeDeg,
        correctedMaeDeg: correctedMae,
        ...(anyPose !== null && anyPose !== undefined ? { rawAnyPoseMaeDeg: anyPose } : {}),
        ...(clip ? { clipMaeDeg: clip.engineMaeDeg, clipRawMaeDeg: clip.rawMaeDeg } : {}),
        ...(clip?.enginePeakP90Deg !== undefined ? { clipPeakP90Deg: clip.enginePeakP90Deg } : {}),
        ...(clip?.rawPeakP90Deg !== undefined ? { clipRawPeakP90Deg: clip.rawPeakP90Deg } : {}),
        ...(clip?.engineFramesP90Deg !== undefined ? { clipFramesP90Deg: clip.engineFramesP90Deg } : {}),
        ...(clip?.rawFramesP90Deg !== undefined ? { clipRawFramesP90Deg: clip.rawFramesP90Deg } : {}),
        correctionHelps: helps,
        uncertaintyDeg: round1(flooredUncertaintyDeg(Math.max(stillMae, clip?.engineMaeDeg ?? 0), clip?.engineFramesP90Deg)),
        ...(byDigit ? { byDigit } : {}),
      });
    }
  }
  // One finger bent alone: the method the engine uses in the four-finger cell of the same group, view and model.
  const singleCorrected = new Map(report["single finger"].corrected.map((r) => [`${r.group}|${r.view}|${r.model}`, r]));
  const fingerAlone: FingerAloneCell[] = report["single finger"]["raw 3-D"].flatMap((raw) => {
    if (raw.maeDeg === null) return [];
    const key = `${raw.group}|${raw.view}|${raw.model}`;
    const correctedMae = singleCorrected.get(key)?.maeDeg ?? null;
    const corrects = cells.find((c) => `${c.group}|${c.view}|${c.model}` === key)?.correctionHelps ?? false;
    const maeDeg = corrects && correctedMae !== null ? correctedMae : raw.maeDeg;
    // A finger the one-finger clips measured in this view: its own interval from its frames (MAE, frame P90) and its
    // peaks (MAE), the worst seed; a finger whose peak some seed never found keeps the cell's.
    const byDigit: DigitFigure[] = FINGERS.flatMap((digit) => {
      const row = aloneFingerRows.find((r) => `${r.group}|${r.view}|${r.model}|${r.digit}` === `${key}|${digit}`);
      if (!row || row.enginePeakMaeDeg === undefined) return [];
      const frames = flooredUncertaintyDeg(row.engineMaeDeg, row.engineFramesP90Deg);
      return [
        {
          digit,
          clipMaeDeg: row.engineMaeDeg,
          ...(row.engineFramesP90Deg !== undefined ? { clipFramesP90Deg: row.engineFramesP90Deg } : {}),
          clipPeakMaeDeg: row.enginePeakMaeDeg,
          uncertaintyDeg: round1(Math.max(frames, uncertaintyFromMaeDeg(row.enginePeakMaeDeg))),
        },
      ];
    });
    return [
      {
        group: raw.group,
        view: raw.view as ValidationView,
        model: raw.model as HandModel,
        samples: raw.samples,
        rawMaeDeg: raw.maeDeg,
        correctedMaeDeg: correctedMae,
        maeDeg,
        uncertaintyDeg: round1(uncertaintyFromMaeDeg(maeDeg)),
        ...(byDigit.length ? { byDigit } : {}),
      },
    ];
  });
  return {
    version: UNCERTAINTY_VERSION,
    correctionVersion,
    rule:
      "uncertaintyDeg = 1.645 * sqrt(pi/2) * MAE (90% interval half-width of a normal error with that mean absolute error) " +
      "of the method the engine uses in the cell: corrected where the correction's held-out MAE is below the raw 3-D MAE by more than two standard errors " +
      "(for whole-hand-shape cells, raw frames take the worse of the hand-shape and random-pose raw MAE, rawAnyPoseMaeDeg) " +
      "(SE = 0.755 * raw MAE / sqrt(samples)), raw 3-D otherwise; where held-out clips measured the cell (clipMaeDeg, the engine's worst frame MAE over " +
      "the clip reports' seeds; clipRawMaeDeg without correction), the worse of the still and clip figures. " +
      "byDigit: where every clip seed that measured a cell also split it by finger (the clip reports' per-finger tables), each finger's " +
      "interval from the worse of the cell's still figure and that finger's worst clip MAE over the seeds; it stands for readings of that finger. " +
      "clipFramesP90Deg (clipRawFramesP90Deg without correction): where every clip seed that measured a cell gave it, the half-width that held 90% of " +
      "its detected frames (nearest rank, the clip reports' frame P90, worst seed); an interval is never narrower, nor a finger's than its own " +
      "(byDigit clipFramesP90Deg): it widens the normal rule where errors have heavy tails. " +
      "clipPeakP90Deg (clipRawPeakP90Deg without correction): where every clip seed that measured a cell gave it, the half-width that held 90% of the " +
      "held-out peaks (nearest rank of the absolute peak errors, the clip reports' peak P90), the worst over the seeds; a capture's start, peak and arc " +
      "take the wider of it and the frame interval (vision/uncertainty.ts peakUncertaintyDeg), both widened by tracking score. " +
      "Source: scripts/accuracy/report.md (held-out renders) and vision/correction-hand-shape-validation.json and " +
      "correction-hand-shape-down-validation.json (held-out whole-hand shapes, seeds 20261212 and 20261213); " +
      "test-motion rows first, then whole-hand-shape rows, random-pose rows for the rest; scripts/accuracy/clip-report.md and " +
      "clip-report-gravity-minimized.md (held-out clips, continuous motion, each motion in its recommended view) and " +
      "clip-report-hand-shapes.md (the finger test motions seen from the palm, the back and above). " +
      "withoutStraightWristReading: the same rule on the frame MAE of the clip reports' wrist readings made against how the hand was first seen " +
      "(the tracker missed the straight-wrist hold), pooled over their seeds, models and conditions; it stands for every wrist reading made that way. " +
      "fingerAlone: the same rule on report.md's single-finger test motions (one finger bent, the others straight), with the method the engine uses in the " +
      "four-finger cell of the same group, view and model; it stands for a finger the therapist marks as tested on its own, the others held straight (vision/pipeline.ts oneFinger). " +
      "fingerAlone byDigit: where held-out one-finger clips (scripts/accuracy/clip-report-one-finger-little.md, clip-report-one-finger-index-middle-ring.md) measured a finger bent alone in a cell's view and model, that finger's " +
      "interval from the worst seed's frame MAE (never narrower than its frame P90) and peak MAE, by the same normal rule; it stands for that finger's lone readings in that view. " +
      "pairs: the same rule on the frame MAE of both hand models read together (vision/model-pair.ts), the worst over the held-out seeds of " +
      "scripts/accuracy/clip-report-two-models.md, against gravity (little-finger side) and with gravity minimized (thumb side; there only where every seed " +
      "was split by finger, each finger's interval from its own worst seed, byDigit); it stands for a frame both models read in that view; " +
      "a pair cell's clipFramesP90Deg (and each finger's from the thumb side) is the same report's frame P90 of the 'both' rows, the worst seed, where every " +
      "seed gave it, a floor under its interval as for one model; its clipPeakP90Deg the peak P90 alike: the two-model peak's " +
      "interval is never narrower than it (vision/model-pair.ts). " +
      "declinedBySideFit: seen side-on, the frames the side-view estimator declines (outside its training domain), measured on held-out side-on " +
      "whole-hand shapes (vision/correction-hand-shape-side-validation.json): the same rule on their raw MAE, never narrower than their P90, and where " +
      "the side-on whole-hand-shape fit lowered their MAE by more than two standard errors (sideOnFitHelps) the engine reads them with it and they take " +
      "its figure alike; either is never narrower than the cell's own (vision/uncertainty.ts).",
    cells: declinedRows.length ? withDeclinedFigures(cells, declinedRows) : cells,
    ...(withoutStraightWrist
      ? {
          withoutStraightWristReading: {
            readings: withoutStraightWrist.readings,
            maeDeg: withoutStraightWrist.maeDeg,
            uncertaintyDeg: round1(uncertaintyFromMaeDeg(withoutStraightWrist.maeDeg)),
          },
        }
      : {}),
    ...(fingerAlone.length ? { fingerAlone } : {}),
    ...(pairCells.length ? { pairs: [...pairCells] } : {}),
  };
}

/** The committed hand-shape held-out rows, or none when the file has not been written. */
export function readHandShapeRows(files: readonly string[] = HAND_SHAPE_VALIDATION_FILES): HandShapeRow[] {
  return files.flatMap((file) => readHeldOutCells<HandShapeRow>(file));
}

/** The table the committed reports give (what `main` writes and the committed table must equal). */
export function deriveCommittedTable(): UncertaintyTable {
  const clipReports = readClipReports();
  return deriveUncertaintyTable(
    parseAccuracyReport(readFileSync(REPORT_FILE, "utf8")),
    readHandShapeRows(),
    CORRECTION_VERSION,
    parseClipReports(clipReports),
    parseWithoutStraightWrist(clipReports),
    parseClipFingerRows(clipReports),
    parsePairCells(readTwoModelReports(), TWO_MODEL_DIP_FOLLOWS_SEEDS),
    parseClipFingerRows(readClipReports(ONE_FINGER_CLIP_REPORT_FILES)),
    readDeclinedRows(),
  );
}

function main(): void {
  const table = deriveCommittedTable();
  writeFileSync(UNCERTAINTY_FILE, `${JSON.stringify(table, null, 2)}\n`);
  const applied = table.cells.filter((c) => c.correctionHelps).length;
  console.log(`${table.cells.length} cells, correction applied in ${applied}`);
  console.error(`uncertainty -> ${UNCERTAINTY_FILE}`);
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  try {
    main();
  } catch (error) {
    console.error(error instanceof Error ? error.message : error);
    process.exitCode = 2;
  }
}
