/**
 * The gain of side-on wrist flexion/extension read in the picture (vision/wrist-axis.ts `sideOnWristFlexion`), fitted on
 * training clips only.
 *
 * Read in the picture, the turn of the wrist-to-middle-knuckle line over-reads the wrist's own turn by a few per cent
 * (held-out slopes 1.04-1.12; scripts/accuracy/README.md, "View policy and the wrist's forearm line"). The fit is a
 * calibration line read the classical way (reading = a + b * truth on the training frames, then truth = reading / b;
 * ISO 11095:1996 linear calibration, inverse use): one slope per hand model over clips seen from either side (the
 * per-side slopes are printed and kept beside it; the engine cannot tell the side reliably side-on). The intercept is
 * left out of the engine: the straight-wrist reading already sets the zero, and it is printed to show it is small.
 *
 *   npx tsx scripts/accuracy/wrist-picture-fit.ts [--seeds 77000401,77000402] [--write]
 *
 * Reads the saved tracking of the training clips (make it with `npm run -s accuracy:clips -- --seeds S --motions
 * wrist.flexion,wrist.extension --models lite,full --reuse --out /tmp/x.md`, and again with `--condition
 * gravity_minimized`), never a held-out seed. Only readings made against a straight-wrist reading count: those read
 * against how the hand was first seen carry an offset that is not the gain's business. `--write` writes
 * vision/wrist-picture-gain.json, which the engine reads.
 */
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { parseArgs } from "node:util";
import type { Condition } from "@/lib/motions/catalog";
import type { HandModel, WristPictureFit } from "@/vision/correction";
import { planClips, readClip, readSavedTracking, type ClipPlan, type ClipTruthFile } from "./clip-validation";
import { RENDER_OUTPUT_ROOT } from "./renderer";
import { leastSquares } from "./stats";

export const TRAINING_SEEDS = [77_000_401, 77_000_402] as const;
const CONDITIONS: readonly Condition[] = ["against_gravity", "gravity_minimized"];
const MODELS: readonly HandModel[] = ["lite", "full"];
const GAIN_FILE = path.resolve(__dirname, "../../vision/wrist-picture-gain.json");

export interface PictureSample {
  model: HandModel;
  side: "ulnar" | "radial";
  seed: number;
  truthDeg: number;
  readingDeg: number;
}

/** One calibration line: reading = intercept + slope * truth, and the gain that undoes the slope (the engine's type). */
export type PictureFit = Omit<WristPictureFit, "bySide">;

export function fitPictureGain(samples: readonly Pick<PictureSample, "truthDeg" | "readingDeg">[]): PictureFit | null {
  const line = leastSquares(
    samples.map((s) => s.truthDeg),
    samples.map((s) => s.readingDeg),
  );
  if (!line || !(line.slope > 0)) return null;
  return { slope: round(line.slope, 4), interceptDeg: round(line.intercept, 2), gain: round(1 / line.slope, 4), frames: samples.length };
}

function round(value: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(value * f) / f;
}

function sideOf(plan: ClipPlan): "ulnar" | "radial" {
  if (plan.view !== "ulnar" && plan.view !== "radial") throw new Error(`${plan.name}: expected a side view (ulnar or radial); got ${plan.view}`);
  return plan.view;
}

/** The training frames read in the picture against a straight-wrist reading, with correction off (gain 1). */
export function pictureSamples(seeds: readonly number[], conditions: readonly Condition[] = CONDITIONS): PictureSample[] {
  const samples: PictureSample[] = [];
  for (const seed of seeds) {
    const folder = path.join(RENDER_OUTPUT_ROOT, "clip-validation", String(seed));
    for (const condition of conditions) {
      for (const plan of planClips(seed, 10, condition, ["wrist.flexion", "wrist.extension"])) {
        const truth = JSON.parse(readFileSync(path.join(folder, `${plan.name}.json`), "utf8")) as ClipTruthFile;
        for (const model of MODELS) {
          const file = path.join(folder, `${plan.name}-${model}.tracked.json`);
          if (!existsSync(file)) throw new Error(`${file}: no saved tracking; track the training clips first (see the header)`);
          const reading = readClip(plan, model, null, readSavedTracking(file), truth, "raw");
          if (reading.method !== "image_plane" || reading.forearmSource !== "neutral-reading") continue;
          for (const s of reading.samples) {
            if (s.estimateDeg !== null) samples.push({ model, side: sideOf(plan), seed, truthDeg: s.truthDeg, readingDeg: s.estimateDeg });
          }
        }
      }
    }
  }
  return samples;
}

async function main(): Promise<void> {
  const { values } = parseArgs({ options: { seeds: { type: "string" }, conditions: { type: "string" }, write: { type: "boolean" } } });
  const conditions = values.conditions ? (values.conditions.split(",") as Condition[]) : CONDITIONS;
  const badCondition = conditions.find((c) => !CONDITIONS.includes(c));
  if (badCondition !== undefined) throw new Error(`--conditions: expected some of ${CONDITIONS.join(", ")}; got '${badCondition}'`);
  const seeds = values.seeds ? values.seeds.split(",").map(Number) : [...TRAINING_SEEDS];
  const bad = seeds.find((s) => !Number.isInteger(s) || String(s).startsWith("2026"));
  if (bad !== undefined) throw new Error(`--seeds: expected training seeds (77000xxx), never a held-out one; got ${bad}`);
  const samples = pictureSamples(seeds, conditions);
  const lines = ["| model | side | seed | frames | slope | intercept ° | gain |", "| --- | --- | --- | ---: | ---: | ---: | ---: |"];
  const gains: Record<string, PictureFit & { bySide: Record<string, PictureFit> }> = {};
  const row = (model: string, side: string, seed: string, fit: PictureFit) =>
    `| ${model} | ${side} | ${seed} | ${fit.frames} | ${fit.slope.toFixed(3)} | ${fit.interceptDeg.toFixed(2)} | ${fit.gain.toFixed(3)} |`;
  for (const model of MODELS) {
    const bySide: Record<string, PictureFit> = {};
    for (const side of ["ulnar", "radial"] as const) {
      const mine = samples.filter((s) => s.model === model && s.side === side);
      for (const seed of seeds) {
        const fit = fitPictureGain(mine.filter((s) => s.seed === seed));
        if (fit) lines.push(row(model, side, String(seed), fit));
      }
      const all = fitPictureGain(mine);
      if (!all) continue;
      lines.push(row(model, side, "all", all));
      bySide[side] = all;
    }
    // The engine's gain: both sides together (its view classifier cannot tell the thumb side reliably side-on).
    const pooled = fitPictureGain(samples.filter((s) => s.model === model));
    if (!pooled) continue;
    lines.push(row(model, "both sides", "all", pooled));
    gains[model] = { ...pooled, bySide };
  }
  process.stdout.write(`${lines.join("\n")}\n`);
  if (values.write) {
    const out = {
      method: "side-on wrist flexion/extension read in the picture: truth = reading * gain (gain = 1 / slope of reading on truth), per hand model over both sides toward the camera",
      fittedOn: { seeds, conditions, clipsPerMotion: 10, motions: ["wrist.flexion", "wrist.extension"] },
      gains,
    };
    writeFileSync(GAIN_FILE, `${JSON.stringify(out, null, 2)}\n`);
    process.stdout.write(`wrote ${path.relative(process.cwd(), GAIN_FILE)}\n`);
  }
}

if (!process.env.VITEST && path.resolve(process.argv[1] ?? "") === path.resolve(__filename)) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? (error.stack ?? error.message) : error);
    process.exitCode = 1;
  });
}
