/**
 * Two hand models on the same clip: how far their readings differ, and what reading both gives.
 *
 * Clips tracked with both models (`clip-validation.ts --models lite,full`, saved tracking only; nothing is rendered or
 * tracked here) are read by the engine once per model, finger by finger, and compared frame by frame with each other
 * and with the truth. Why: the lite model once lost a deep PIP bend that the full model saw (held-out seed 20261216,
 * clip 5), and each model misses frames the other finds.
 *
 * "both" is the engine's reading of the two captures together (vision/model-pair.ts `analyzeCapturePair`, whose header
 * gives the rule); "peaks apart" counts the readings it warns about (`modelsDisagree`).
 *
 *   npx tsx scripts/accuracy/model-agreement.ts --seeds 77000401,77000402 [--motions pip.flexion,mcp.flexion]
 *     [--condition against_gravity|gravity_minimized] [--clips 10] [--per-reading] [--fps N] [--out FILE]
 *     [--framing setup|filter] [--dip-follows 0.7]
 *
 * `--fps N` (below the clips' own 30) reads only the frames a camera at N frames a second would have given, as live
 * tracking with both models delivers fewer frames than a clip has. An approximation: the saved tracking followed every
 * frame, while a tracker given fewer frames starts each one from a hand that moved further.
 *
 * `--framing setup` reads the clips `clip-validation.ts --framing setup` rendered; `--framing filter` the usual ones; either
 * way only the clips whose first frame the app's set-up check accepts for the hand's size (clip-validation.ts setupAccepts).
 *
 * Prints markdown tables (and writes them to FILE with --out); per seed and motion, each model alone and both.
 */
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { parseArgs } from "node:util";
import type { Condition, MotionId } from "@/lib/motions/catalog";
import type { TrackedFrame } from "@/vision/live/types";
import { ClipCaptureError, clipCapture, withFullModelFrames } from "@/vision/live/clip-capture";
import { analyzeCaptureFile, PEAK_DISAGREEMENT_DEG } from "@/vision/model-pair";
import {
  CLIP_FPS,
  framesAtRate,
  frameErrorP90,
  parseTrackFps,
  peakCoverage,
  peakErrorP90,
  parseFraming,
  planClips,
  withDipFollowing,
  readClip,
  readSavedTracking,
  setupAccepts,
  statedCoverage,
  trackedRateSuffix,
  truthAtTimes,
  type ClipPlan,
  type ClipReading,
} from "./clip-validation";
import { RENDER_OUTPUT_ROOT } from "./renderer";
import { parseCount } from "./run-accuracy";
import { ACCEPTANCE, meetsAcceptance, type AcceptanceKey } from "./acceptance";
import { summarizeErrors, type ErrorSample } from "./stats";
// No "reading" column in the by-finger table: the motion tables' parser skips it.
import { BOTH_BY_FINGER_HEADER } from "./derive-uncertainty";

/**
 * One clip and finger read by both models together, on the app's own path: the lite capture with the full model's
 * frames attached (vision/live/clip-capture.ts withFullModelFrames) read by analyzeCaptureFile (vision/model-pair.ts),
 * scored like a one-model reading. Where one model found no hand in any frame, the other model's reading stands alone,
 * as the app measures such a clip.
 */
export function readPair(lite: ClipReading, full: ClipReading, liteFrames: readonly TrackedFrame[], fullFrames: readonly TrackedFrame[]): Scored & { disagree: boolean } {
  const target = { motion: lite.plan.motion.motion, side: lite.plan.side, digit: lite.digit, condition: lite.plan.condition };
  let capture;
  try {
    capture = withFullModelFrames(clipCapture(target, liteFrames, lite.plan.name).capture, target, fullFrames, lite.plan.name);
  } catch (error) {
    if (error instanceof ClipCaptureError) return { ...full, disagree: false };
    throw error;
  }
  const pair = analyzeCaptureFile(capture);
  if (!("frameReadings" in pair)) return { ...lite, disagree: false };
  return {
    samples: lite.samples.map((s, i) => ({ truthDeg: s.truthDeg, estimateDeg: pair.frameReadings[i].angleDeg })),
    uncertaintiesDeg: pair.frameReadings.map((r) => r.uncertaintyDeg),
    truthPeakDeg: lite.truthPeakDeg,
    peakDeg: pair.peakDeg,
    peakUncertaintyDeg: pair.uncertaintyDeg,
    disagree: pair.modelsDisagree,
  };
}

type Scored = Pick<ClipReading, "samples" | "uncertaintiesDeg" | "truthPeakDeg" | "peakDeg" | "peakUncertaintyDeg">;

export interface AgreementRow {
  reading: "lite" | "full" | "both";
  readings: number;
  detected: number;
  maeDeg: number | null;
  slope: number | null;
  within: number | null;
  peakMaeDeg: number | null;
  worstPeakErrorDeg: number | null;
  /** The half-width that held 90% of the readings' peaks (clip-validation.ts peakErrorP90). */
  peakP90Deg: number | null;
  /** The same for every detected frame (clip-validation.ts frameErrorP90). */
  framesP90Deg: number | null;
  /** Share of readings with a peak whose error lies inside the peak's stated interval. */
  peakWithin: number | null;
}

export function agreementRow(reading: AgreementRow["reading"], readings: readonly Scored[]): AgreementRow {
  const samples: ErrorSample[] = readings.flatMap((r) => r.samples);
  const s = summarizeErrors(samples);
  const peaked = readings.filter((r) => r.peakDeg !== null);
  const peakErrors = peaked.map((r) => r.peakDeg! - r.truthPeakDeg);
  const worst = peakErrors.reduce<number | null>((w, e) => (w === null || Math.abs(e) > Math.abs(w) ? e : w), null);
  return {
    reading,
    readings: readings.length,
    detected: s.detectionRate,
    maeDeg: s.meanAbsoluteErrorDeg,
    slope: s.slope,
    within: statedCoverage(readings),
    peakMaeDeg: peakErrors.length ? peakErrors.reduce((sum, e) => sum + Math.abs(e), 0) / peakErrors.length : null,
    worstPeakErrorDeg: worst,
    peakP90Deg: peakErrorP90(readings),
    framesP90Deg: frameErrorP90(readings),
    peakWithin: peakCoverage(readings),
  };
}

type ClipTruthFile = Parameters<typeof readClip>[4];

type Reading3 = [ClipReading, ClipReading, Scored & { disagree: boolean }];

/**
 * Both models' engine readings of every saved clip of `plans` (clips tracked with one model only are skipped). `fps`:
 * only the frames a camera at that rate would have given (framesAtRate); `trackedFps`: the tracking saved at that rate
 * (`clip-validation.ts --track-fps`).
 */
export function readBoth(folder: string, plans: readonly ClipPlan[], fps: number | null = null, trackedFps: number | null = null): Reading3[] {
  const pairs: Reading3[] = [];
  for (const plan of plans) {
    const [liteFile, fullFile] = ["lite", "full"].map((model) => path.join(folder, `${plan.name}-${model}${trackedRateSuffix(trackedFps)}.tracked.json`));
    if (!existsSync(liteFile) || !existsSync(fullFile)) continue;
    let [lite, full] = [readSavedTracking(liteFile), readSavedTracking(fullFile)];
    const whole = JSON.parse(readFileSync(path.join(folder, `${plan.name}.json`), "utf8")) as ClipTruthFile;
    let truth = trackedFps === null ? whole : truthAtTimes(whole, lite);
    if (fps !== null) {
      const kept = framesAtRate(truth.frameCount, fps, CLIP_FPS);
      [lite, full] = [kept.map((i) => lite[i]), kept.map((i) => full[i])];
      truth = { ...truth, frameCount: kept.length, frames: kept.map((i) => truth.frames[i]) };
    }
    for (const digit of plan.motion.digits) {
      const one = readClip(plan, "lite", digit, lite, truth);
      const two = readClip(plan, "full", digit, full, truth);
      pairs.push([one, two, readPair(one, two, lite, full)]);
    }
  }
  return pairs;
}

/** Issue 8's bars for the motion (scripts/accuracy/acceptance.ts), as the clip reports word them. */
function bars(motion: MotionId, row: AgreementRow): string {
  const target = ACCEPTANCE[motion as AcceptanceKey];
  if (!target) return "-";
  return meetsAcceptance({ meanAbsoluteErrorDeg: row.maeDeg, slope: row.slope, detectionRate: row.detected }, target) ? "meets" : "misses";
}

const fmt = (v: number | null, digits = 2) => (v === null ? "-" : v.toFixed(digits));
const pct = (v: number | null) => (v === null ? "-" : `${Math.round(v * 100)}%`);

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: {
      seeds: { type: "string" },
      motions: { type: "string" },
      condition: { type: "string" },
      clips: { type: "string" },
      "per-reading": { type: "boolean" },
      fps: { type: "string" },
      "tracked-fps": { type: "string" },
      out: { type: "string" },
      framing: { type: "string" },
      "dip-follows": { type: "string" },
    },
  });
  // --dip-follows 0.7: the PIP clips clip-validation.ts rendered with each finger's DIP bending along (named `-dip70-`).
  const dipFollows = values["dip-follows"] === undefined ? null : Number(values["dip-follows"]);
  const framing = parseFraming(values.framing);
  if (!values.seeds) throw new Error("--seeds: expected a comma-separated list of seeds, e.g. 77000401,77000402");
  const seeds = values.seeds.split(",").map((raw) => parseCount("seeds", raw, 0));
  const motions = (values.motions ?? "mcp.flexion,pip.flexion,dip.flexion").split(",") as MotionId[];
  const condition = (values.condition ?? "against_gravity") as Condition;
  if (condition !== "against_gravity" && condition !== "gravity_minimized") throw new Error(`--condition: expected against_gravity or gravity_minimized; got '${condition}'`);
  const clips = parseCount("clips", values.clips, 10);
  const fps = values.fps === undefined ? null : parseCount("fps", values.fps, CLIP_FPS);
  const trackedFps = parseTrackFps(values["tracked-fps"]);
  if (fps !== null && trackedFps !== null) throw new Error("--fps and --tracked-fps: expected one of them");
  const lines: string[] = [];
  lines.push(`## Seeds ${seeds.join(", ")}${dipFollows === null ? "" : ` (the DIP bending along at ${dipFollows} of the PIP)`}, ${condition.replace("_", " ")}${fps === null ? "" : `, read at ${fps} frames a second`}${trackedFps === null ? "" : `, tracked at ${trackedFps} frames a second`}${framing === null ? "" : `, framing ${framing}`}\n`);
  lines.push("| motion | seed | reading | readings | detected | MAE ° | slope | within stated ± | peak MAE ° | worst peak error ° | peak P90 ° | frame P90 ° | peak within stated ± | models disagree (> " + PEAK_DISAGREEMENT_DEG + "°) | issue 8's bars |");
  lines.push("| --- | --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | --- |");
  const perReading: string[] = [];
  // Both models together, split by finger (derive-uncertainty.ts reads it for the thumb side's two-model cells).
  const byFinger: string[] = [];
  const framingNotes: string[] = [];
  for (const motion of motions) {
    const all: Reading3[] = [];
    const rows = (label: string, pairs: Reading3[]) => {
      const apart = pairs.filter((p) => p[2].disagree).length;
      for (const row of [agreementRow("lite", pairs.map((p) => p[0])), agreementRow("full", pairs.map((p) => p[1])), agreementRow("both", pairs.map((p) => p[2]))]) {
        lines.push(
          `| ${motion} | ${label} | ${row.reading} | ${row.readings} | ${pct(row.detected)} | ${fmt(row.maeDeg)} | ${fmt(row.slope)} | ${pct(row.within)} | ${fmt(row.peakMaeDeg, 1)} | ${fmt(row.worstPeakErrorDeg, 1)} | ${fmt(row.peakP90Deg, 1)} | ${fmt(row.framesP90Deg, 1)} | ${pct(row.peakWithin)} | ${row.reading === "both" ? apart : ""} | ${bars(motion, row)} |`,
        );
      }
    };
    for (const seed of seeds) {
      const folder = path.join(RENDER_OUTPUT_ROOT, "clip-validation", String(seed));
      const planned = planClips(seed, clips, condition, [motion], undefined, false, framing);
      const drawn = dipFollows === null ? planned : withDipFollowing(planned, seed, dipFollows);
      // --framing: only the clips the set-up check would let start (clip-validation.ts setupAccepts).
      const plans = framing ? drawn.filter((plan) => setupAccepts(plan, JSON.parse(readFileSync(path.join(folder, `${plan.name}.json`), "utf8")) as ClipTruthFile)) : drawn;
      if (framing) framingNotes.push(`${motion} ${seed}: ${plans.length} of ${drawn.length} clips`);
      const pairs = readBoth(folder, plans, fps, trackedFps);
      if (!pairs.length) continue;
      all.push(...pairs);
      rows(String(seed), pairs);
      for (const digit of [...new Set(pairs.map((p) => p[0].digit))]) {
        if (digit === null) continue;
        const mine = pairs.filter((p) => p[0].digit === digit);
        const both = summarizeErrors(mine.flatMap((p) => p[2].samples));
        byFinger.push(`| ${motion} | ${seed} | ${digit} | ${mine.length} | ${pct(both.detectionRate)} | ${fmt(both.meanAbsoluteErrorDeg)} | ${fmt(frameErrorP90(mine.map((p) => p[2])), 1)} |`);
      }
      for (const [a, b, c] of pairs) {
        perReading.push(`| ${a.plan.name} | ${a.digit} | ${a.plan.side} | ${a.truthPeakDeg.toFixed(1)} | ${fmt(a.peakDeg, 1)} | ${fmt(b.peakDeg, 1)} | ${fmt(c.peakDeg, 1)} | ${fmt(summarizeErrors(a.samples).meanAbsoluteErrorDeg, 1)} | ${fmt(summarizeErrors(b.samples).meanAbsoluteErrorDeg, 1)} | ${fmt(summarizeErrors(c.samples).meanAbsoluteErrorDeg, 1)} |`);
      }
    }
    if (seeds.length > 1 && all.length) rows("all", all);
  }
  if (framingNotes.length) lines.push("", `Kept by the set-up check's framing (first frame's hand span within vision/view-policy.ts handSpanBand): ${framingNotes.join("; ")}.`);
  if (byFinger.length) lines.push(["", `${BOTH_BY_FINGER_HEADER} both: frame P90 ° |`, "| --- | --- | --- | ---: | ---: | ---: | ---: |", ...byFinger].join("\n"));
  if (values["per-reading"]) lines.push(["", "| clip | finger | side | truth peak ° | lite peak ° | full peak ° | both peak ° | lite MAE ° | full MAE ° | both MAE ° |", "| --- | --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: |", ...perReading].join("\n"));
  const text = `${lines.join("\n")}\n`;
  if (values.out) writeFileSync(values.out, text);
  process.stdout.write(text);
}

if (!process.env.VITEST && path.resolve(process.argv[1] ?? "") === path.resolve(__filename)) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exitCode = 1;
  });
}
