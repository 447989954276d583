// npm run -s analyze -- [--scale daniels|mrc|intrinsic] [--reference DEG] [--table ID] FILE...
// Analyzes capture files (format v1) of one motion, side and digit and prints one JSON object: each capture's
// repetitions, peak, arc and test plane, the reference end-range and the range-based grade. Bad input: exit 2, one
// line on stderr naming the file, frame and field, nothing on stdout.
import { readFileSync } from "node:fs";
import { basename } from "node:path";
import { CaptureFormatError, parseCaptureText } from "@/lib/capture/parse";
import type { CaptureFile } from "@/lib/capture/schema";
import { GRADE_SCALES, chooseReference, gradeMotion, type GradeScale } from "@/lib/grading/grade";
import { RANGE_TABLE_IDS, type RangeTableId } from "@/lib/motions/catalog";
import type { CaptureAnalysis } from "@/vision/analyze-capture";
import { analyzeCaptureFile, type PairAnalysis } from "@/vision/model-pair";

export class UsageError extends Error {}

interface Options {
  scale: GradeScale;
  referenceDeg: number | null;
  table: RangeTableId | undefined;
  files: string[];
}

function parseArgs(argv: readonly string[]): Options {
  const options: Options = { scale: "daniels", referenceDeg: null, table: undefined, files: [] };
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    const value = () => {
      const v = argv[++i];
      if (v === undefined) throw new UsageError(`${arg}: expected a value`);
      return v;
    };
    if (arg === "--scale") {
      const v = value();
      if (!(GRADE_SCALES as readonly string[]).includes(v)) throw new UsageError(`--scale: expected one of ${GRADE_SCALES.join(", ")}, got ${JSON.stringify(v)}`);
      options.scale = v as GradeScale;
    } else if (arg === "--reference") {
      const v = value();
      const deg = Number(v);
      if (!Number.isFinite(deg) || deg <= 0 || deg > 180) throw new UsageError(`--reference: expected degrees above 0 and up to 180, got ${JSON.stringify(v)}`);
      options.referenceDeg = deg;
    } else if (arg === "--table") {
      const v = value();
      if (!(RANGE_TABLE_IDS as readonly string[]).includes(v)) throw new UsageError(`--table: expected one of ${RANGE_TABLE_IDS.join(", ")}, got ${JSON.stringify(v)}`);
      options.table = v as RangeTableId;
    } else if (arg.startsWith("--")) {
      throw new UsageError(`${arg}: unknown option (expected --scale, --reference, --table)`);
    } else {
      options.files.push(arg);
    }
  }
  if (options.files.length === 0) throw new UsageError("expected at least one capture file");
  return options;
}

const round = (deg: number | null) => (deg === null ? null : Math.round(deg * 10) / 10);

function captureReport(file: string, a: CaptureAnalysis | PairAnalysis) {
  return {
    file,
    motion: a.motion,
    side: a.side,
    digit: a.digit,
    condition: a.condition,
    frames: a.frames,
    usableFrames: a.usableFrames,
    reps: a.reps,
    startDeg: round(a.startDeg),
    peakDeg: round(a.peakDeg),
    arcDeg: round(a.arcDeg),
    plane: a.plane ? { verdict: a.plane.verdict, axisToGravityDeg: round(a.plane.axisToGravityDeg) } : null,
    trackingOk: a.trackingOk,
    method: a.method,
    correctionVersion: a.correctionVersion,
    // The hand models whose frames were read: both when the capture carries the full model's too (vision/model-pair.ts).
    handModels: "handModels" in a ? a.handModels : ["lite"],
    // 90% interval half-width of startDeg, peakDeg and each repetition's angles (vision/uncertainty.ts); view is the
    // camera view most frames saw and how it serves the motion; wrist motions say which forearm line they used.
    uncertaintyDeg: a.uncertaintyDeg,
    view: a.view,
    viewQuality: a.viewQuality,
    forearmSource: a.forearmSource,
    // A finger tested on its own (the capture's oneFinger): its interval is the single-finger validation error.
    oneFinger: a.oneFinger,
    repetitions: a.repetitions.map((r) => ({
      complete: r.complete,
      startDeg: round(r.startDeg),
      peakDeg: round(r.peakDeg),
      uncertaintyDeg: a.uncertaintyDeg,
      arcDeg: round(r.arcDeg),
      timeToPeakMs: Math.round(r.timeToPeakMs),
      holdMs: Math.round(r.holdMs),
      plane: r.plane ? { verdict: r.plane.verdict, axisToGravityDeg: round(r.plane.axisToGravityDeg) } : null,
    })),
    warnings: a.warnings,
  };
}

/** The whole command as a function: argv in, the JSON report out; throws UsageError or CaptureFormatError. */
export function analyzeFiles(argv: readonly string[], readText: (file: string) => string = (f) => readFileSync(f, "utf8")) {
  const options = parseArgs(argv);
  const captures: Array<{ file: string; capture: CaptureFile }> = [];
  for (const file of options.files) {
    let text: string;
    try {
      text = readText(file);
    } catch (error) {
      throw new CaptureFormatError(file, null, "", `cannot be read (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})`);
    }
    const capture = parseCaptureText(text, file);
    const first = captures[0];
    if (first) {
      for (const field of ["motion", "side", "digit"] as const) {
        if (capture[field] !== first.capture[field]) {
          throw new CaptureFormatError(file, null, field, `expected ${JSON.stringify(first.capture[field])} like ${first.file}, got ${JSON.stringify(capture[field])}`);
        }
      }
    }
    captures.push({ file, capture });
  }

  const { motion, digit } = captures[0].capture;
  const analyses = captures.map(({ file, capture }) => ({ file, analysis: analyzeCaptureFile(capture) }));
  const passive = options.referenceDeg ?? captures.find((c) => c.capture.passiveRangeDeg !== undefined)?.capture.passiveRangeDeg ?? null;
  const reference = chooseReference(motion, digit, { passiveRangeDeg: passive, table: options.table })!;
  const grade = gradeMotion({
    motion,
    scale: options.scale,
    reference,
    attempts: analyses.map(({ file, analysis }) => ({
      label: file,
      condition: analysis.condition,
      planeVerdict: analysis.plane?.verdict ?? null,
      peakDeg: analysis.peakDeg,
      arcDeg: analysis.arcDeg,
      trackingOk: analysis.trackingOk,
      uncertaintyDeg: analysis.uncertaintyDeg,
    })),
  });

  return {
    captures: analyses.map(({ file, analysis }) => captureReport(file, analysis)),
    reference: { endRangeDeg: reference.endRangeDeg, source: reference.source },
    grade: { scale: grade.scale, value: grade.value, ceiling: grade.ceiling, inPerson: grade.inPerson, reasons: grade.reasons },
  };
}

function main(): void {
  try {
    process.stdout.write(`${JSON.stringify(analyzeFiles(process.argv.slice(2)), null, 2)}\n`);
  } catch (error) {
    if (error instanceof UsageError || error instanceof CaptureFormatError) {
      process.stderr.write(`${error instanceof UsageError ? "analyze: " : ""}${error.message.replace(/\s+/g, " ")}\n`);
      process.exitCode = 2;
      return;
    }
    throw error;
  }
}

// Imported by its test under vitest and by analyze-clip (which reuses analyzeFiles): run as the command only when it
// is the script tsx was started with.
if (!process.env.VITEST && /^analyze\.[cm]?[jt]s$/.test(basename(process.argv[1] ?? ""))) main();
