/**
 * Measurement engine benchmark: per-frame cost of the live pipeline, and the cost of analyzing a 10-minute 30 fps
 * capture against the cost of merely parsing (JSON + schema) the same file. Figures only; the goals (live under
 * 0.1 ms per frame, analysis under 3x parsing) are printed beside them for a person to judge.
 *
 *   npx tsx scripts/bench/engine.ts [--minutes 10]
 */
import { parseCaptureText } from "../../lib/capture/parse";
import type { MotionId } from "../../lib/motions/catalog";
import { analyzeCapture } from "../../vision/analyze-capture";
import { createLivePipeline } from "../../vision/pipeline";
import { buildSyntheticCapture, type SyntheticRep } from "../../vision/testing/synthetic-hand";

function argument(name: string, fallback: string): string {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
}

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s[s.length >> 1];
}

function timeMs(fn: () => void): number {
  const start = performance.now();
  fn();
  return performance.now() - start;
}

const placement = { forearmDistal: [0.8, 0.2, 0.55] as const, forearmRadial: [0, 0.3, -1] as const, wrist: [0, 0, 0.45] as const };

function captureOf(motion: MotionId, digit: "index" | null, minutes: number) {
  // One repetition of the default profile lasts 3.4 s; enough of them to fill the requested length.
  const reps: SyntheticRep[] = Array.from({ length: Math.ceil((minutes * 60_000) / 3400) }, (_, i) => ({ peakDeg: 60 + (i % 5) * 5 }));
  return buildSyntheticCapture({ motion, side: "right", digit, condition: "against_gravity", placement, reps, noiseMm: 1, dropRate: 0.02, noHandRate: 0.02, seed: 9 });
}

function livePipeline(motion: MotionId, digit: "index" | null) {
  const capture = captureOf(motion, digit, 1);
  const rounds: number[] = [];
  for (let r = 0; r < 7; r++) {
    const pipeline = createLivePipeline({ motion, side: "right", digit, condition: "against_gravity" });
    rounds.push(timeMs(() => {
      for (const frame of capture.frames) pipeline.push(frame);
    }));
  }
  rounds.shift(); // the first round includes JIT warm-up
  const perFrameMs = median(rounds) / capture.frames.length;
  console.log(
    `live pipeline  ${motion.padEnd(14)} ${(perFrameMs * 1000).toFixed(2).padStart(6)} µs/frame  ${Math.round(1000 / perFrameMs).toLocaleString("en").padStart(9)} frames/s  (goal < 100 µs/frame)`,
  );
}

function wholeCapture(minutes: number) {
  const capture = captureOf("pip.flexion", "index", minutes);
  const text = JSON.stringify(capture);
  const jsonMs: number[] = [];
  const parseMs: number[] = [];
  const analyzeMs: number[] = [];
  let reps = 0;
  for (let r = 0; r < 4; r++) {
    jsonMs.push(timeMs(() => JSON.parse(text)));
    let parsed!: ReturnType<typeof parseCaptureText>;
    parseMs.push(timeMs(() => (parsed = parseCaptureText(text, "bench.json"))));
    analyzeMs.push(timeMs(() => (reps = analyzeCapture(parsed).reps)));
  }
  jsonMs.shift();
  parseMs.shift();
  analyzeMs.shift();
  const parse = median(parseMs);
  const analyze = median(analyzeMs);
  console.log(`capture        ${minutes} min at 30 fps: ${capture.frames.length.toLocaleString("en")} frames, ${(text.length / 1e6).toFixed(1)} MB, ${reps} repetitions found`);
  console.log(`  JSON.parse alone          ${median(jsonMs).toFixed(0).padStart(6)} ms`);
  console.log(`  parse (JSON + schema)     ${parse.toFixed(0).padStart(6)} ms`);
  console.log(`  analyze (parsed capture)  ${analyze.toFixed(0).padStart(6)} ms  ${((analyze / capture.frames.length) * 1000).toFixed(2)} µs/frame`);
  console.log(`  analyze / parse           ${(analyze / parse).toFixed(2).padStart(6)} x    (goal < 3 x)`);
}

const minutes = Number(argument("minutes", "10"));
if (!(minutes > 0)) throw new Error(`--minutes: expected a positive number, got ${argument("minutes", "")}`);
livePipeline("pip.flexion", "index");
livePipeline("wrist.flexion", null);
wholeCapture(minutes);
