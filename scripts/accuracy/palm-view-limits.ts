/**
 * Why finger flexion seen from the palm reads flat: a diagnostic on training clips (never a held-out seed).
 *
 * Seen from the palm, a finger bending at the MCP or PIP turns toward the camera, so in the picture its segment only
 * shortens, by the cosine of the bend. Three questions, each answered from the clips' truth (the renderer's own joint
 * positions in the picture) beside what the trackers report:
 *
 * 1. How much of that shortening do the trackers' picture points show? Per clip motion, the moving segment's length in
 *    the picture (MCP-PIP for MCP clips, PIP-DIP for PIP clips) over the palm's (wrist to middle MCP), fitted against
 *    the commanded angle: slope per 90 degrees and Pearson's r, for the true points and for each model's.
 * 2. Could even perfect picture points tell a straight finger from one bent 20 degrees? The whole finger's length in
 *    the picture (MCP to tip, over the palm's) from the true points, by band of the commanded MCP angle.
 * 3. What the engine makes of it: its median error (estimate - truth) by band of the commanded angle, raw and as
 *    shipped, per model.
 *
 *   npx tsx scripts/accuracy/palm-view-limits.ts [--seed 77000409] [--out scripts/accuracy/palm-view-limits.md]
 *
 * Reads `<motion>.flexion-palm[-varied]-<seed>-*` clips rendered and tracked by clip-validation.ts (`--view palm`).
 */
import { readdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { parseArgs } from "node:util";
import { FINGERS } from "@/lib/motions/catalog";
import { DIGIT_CHAIN, MIDDLE_MCP, WRIST } from "@/vision/landmarks";
import { createLivePipeline } from "@/vision/pipeline";
import type { TrackedFrame } from "@/vision/live";
import { readSavedTracking, type ClipTruthFile } from "./clip-validation";
import { getPoseAngle } from "./hand-pose";
import { RENDER_OUTPUT_ROOT } from "./renderer";
import { leastSquares, nearestRankPercentile, pearson } from "./stats";
import type { HandModelVariant } from "./tracked-set";

/** The training seed whose palm-view clips this reads unless told otherwise (SEED_NOTES in clip-validation.ts). */
export const PALM_VIEW_TRAINING_SEED = 77_000_409;
const MODELS: readonly HandModelVariant[] = ["lite", "full"];
const MOTIONS = ["mcp", "pip"] as const;
type Motion = (typeof MOTIONS)[number];
/** Bands of the commanded angle, degrees: lower bound inclusive, upper exclusive. */
export const ANGLE_BANDS: readonly (readonly [number, number])[] = [
  [0, 5],
  [5, 15],
  [15, 25],
  [25, 40],
  [40, 60],
  [60, 120],
];

type Point = readonly number[];
type Finger = (typeof FINGERS)[number];

/**
 * The picture length of the segment `from`-`to` over the palm's (wrist to middle MCP). `xScale` turns x into y's
 * unit: the picture's width over its height for points in [0, 1] (the trackers'), 1 for pixels. Null when the palm
 * has no length in the picture or a point is missing.
 */
export function pictureLengthRatio(points: readonly Point[], from: number, to: number, xScale: number): number | null {
  const length = (a: Point | undefined, b: Point | undefined) => (a && b ? Math.hypot((b[0] - a[0]) * xScale, b[1] - a[1]) : Number.NaN);
  const palm = length(points[WRIST], points[MIDDLE_MCP]);
  const segment = length(points[from], points[to]);
  if (!(palm > 1e-9) || !Number.isFinite(segment)) return null;
  return segment / palm;
}

export interface Shortening {
  samples: number;
  /** Change of the length ratio over 90 degrees of bend (negative: the segment shortens as it bends). */
  per90: number | null;
  r: number | null;
}

/** The least-squares change of a length ratio with the commanded angle, per 90 degrees, and Pearson's r. */
export function shortening(truthDeg: readonly number[], ratio: readonly number[]): Shortening {
  const fit = leastSquares(truthDeg, ratio);
  return { samples: truthDeg.length, per90: fit ? fit.slope * 90 : null, r: pearson(truthDeg, ratio) };
}

export interface BandSpread {
  band: readonly [number, number];
  samples: number;
  p10: number | null;
  median: number | null;
  p90: number | null;
}

/** Per band of the truth, the 10th, 50th and 90th nearest-rank percentiles of the values that fall in it. */
export function bandSpreads(rows: readonly { truthDeg: number; value: number }[], bands = ANGLE_BANDS): BandSpread[] {
  return bands.map((band) => {
    const values = rows.filter((r) => r.truthDeg >= band[0] && r.truthDeg < band[1]).map((r) => r.value);
    return { band, samples: values.length, p10: nearestRankPercentile(values, 0.1), median: nearestRankPercentile(values, 0.5), p90: nearestRankPercentile(values, 0.9) };
  });
}

interface Clip {
  motion: Motion;
  /** A hand of its own build (`--proportions varied`), not the mesh's. */
  varied: boolean;
  truth: ClipTruthFile & { sweep: { side: "left" | "right" } };
  tracked: Record<HandModelVariant, TrackedFrame[]>;
}

function readClips(seed: number): Clip[] {
  const folder = path.join(RENDER_OUTPUT_ROOT, "clip-validation", String(seed));
  const pattern = new RegExp(`^(mcp|pip)\\.flexion-palm(-varied)?-${seed}-\\d+-\\d+\\.json$`);
  const clips = readdirSync(folder)
    .filter((name) => pattern.test(name))
    .map((name) => ({
      motion: name.slice(0, 3) as Motion,
      varied: name.includes("-varied-"),
      truth: JSON.parse(readFileSync(path.join(folder, name), "utf8")) as Clip["truth"],
      tracked: Object.fromEntries(MODELS.map((model) => [model, readSavedTracking(path.join(folder, name.replace(/\.json$/, `-${model}.tracked.json`)))])) as Clip["tracked"],
    }));
  if (!clips.length) throw new Error(`--seed: no palm-view MCP or PIP clips of seed ${seed} in ${folder}; render them with clip-validation.ts --view palm`);
  return clips;
}

const commanded = (clip: Clip, index: number, digit: Finger, motion: Motion): number =>
  getPoseAngle(clip.truth.frames[index].truth.commandedDeg, `${digit}.${motion}FlexionDeg`);

function moving(motion: Motion, digit: Finger): [number, number] {
  const [mcp, pip, dip] = DIGIT_CHAIN[digit];
  return motion === "mcp" ? [mcp, pip] : [pip, dip];
}

function fmt(value: number | null, digits = 2): string {
  return value === null ? "-" : value.toFixed(digits);
}

function shorteningTable(clips: readonly Clip[]): string[] {
  const lines = ["| clips | points | samples | change per 90° | r | share of the true change |", "| --- | --- | ---: | ---: | ---: | ---: |"];
  for (const motion of MOTIONS) {
    const mine = clips.filter((c) => c.motion === motion);
    const collect = (source: "truth" | HandModelVariant) => {
      const truthDeg: number[] = [];
      const ratio: number[] = [];
      for (const clip of mine)
        clip.truth.frames.forEach((frame, i) => {
          const tracked = source === "truth" ? null : clip.tracked[source][i];
          const points = source === "truth" ? frame.truth.landmarksImagePx : tracked?.image;
          if (!points) return;
          const xScale = source === "truth" ? 1 : (tracked?.imageAspect ?? 1);
          for (const digit of FINGERS) {
            const value = pictureLengthRatio(points, ...moving(motion, digit), xScale);
            if (value === null) continue;
            truthDeg.push(commanded(clip, i, digit, motion));
            ratio.push(value);
          }
        });
      return shortening(truthDeg, ratio);
    };
    const truth = collect("truth");
    lines.push(`| ${motion.toUpperCase()} flexion | true | ${truth.samples} | ${fmt(truth.per90)} | ${fmt(truth.r)} | 100% |`);
    for (const model of MODELS) {
      const s = collect(model);
      const share = s.per90 !== null && truth.per90 ? `${Math.round((s.per90 / truth.per90) * 100)}%` : "-";
      lines.push(`| ${motion.toUpperCase()} flexion | ${model} | ${s.samples} | ${fmt(s.per90)} | ${fmt(s.r)} | ${share} |`);
    }
  }
  return lines;
}

function wholeFingerTable(clips: readonly Clip[]): string[] {
  const lines = ["| build | MCP band ° | samples | p10 | median | p90 |", "| --- | --- | ---: | ---: | ---: | ---: |"];
  for (const varied of [false, true]) {
    const rows: { truthDeg: number; value: number }[] = [];
    for (const clip of clips.filter((c) => c.motion === "mcp" && c.varied === varied)) {
      clip.truth.frames.forEach((frame, i) => {
        for (const digit of FINGERS) {
          const [mcp, , , tip] = DIGIT_CHAIN[digit];
          const value = pictureLengthRatio(frame.truth.landmarksImagePx, mcp, tip, 1);
          if (value !== null) rows.push({ truthDeg: commanded(clip, i, digit, "mcp"), value });
        }
      });
    }
    for (const b of bandSpreads(rows)) lines.push(`| ${varied ? "varied" : "mesh"} | ${b.band[0]}-${b.band[1]} | ${b.samples} | ${fmt(b.p10)} | ${fmt(b.median)} | ${fmt(b.p90)} |`);
  }
  return lines;
}

function engineTable(clips: readonly Clip[]): string[] {
  const lines = [`| clips | model | reading | ${ANGLE_BANDS.map(([lo, hi]) => `${lo}-${hi}°`).join(" | ")} |`, `| --- | --- | --- | ${ANGLE_BANDS.map(() => "---:").join(" | ")} |`];
  for (const motion of MOTIONS)
    for (const model of MODELS)
      for (const correction of ["off", "auto"] as const) {
        const rows: { truthDeg: number; value: number }[] = [];
        for (const clip of clips.filter((c) => c.motion === motion))
          for (const digit of FINGERS) {
            const pipeline = createLivePipeline({ motion: `${motion}.flexion`, side: clip.truth.sweep.side, digit, condition: "gravity_minimized", handModel: model, correction });
            clip.tracked[model].forEach((frame, i) => {
              const update = pipeline.push({ t: frame.t, score: frame.score ?? 0, hand: frame.hand ?? null, image: frame.image, imageAspect: frame.imageAspect });
              if (update.angleDeg === null || i >= clip.truth.frames.length) return;
              const truthDeg = commanded(clip, i, digit, motion);
              rows.push({ truthDeg, value: update.angleDeg - truthDeg });
            });
          }
        const cells = bandSpreads(rows).map((b) => fmt(b.median, 0));
        lines.push(`| ${motion.toUpperCase()} flexion | ${model} | ${correction === "off" ? "raw" : "engine"} | ${cells.join(" | ")} |`);
      }
  return lines;
}

async function main(): Promise<void> {
  const { values } = parseArgs({ options: { seed: { type: "string" }, out: { type: "string" } } });
  const seed = values.seed === undefined ? PALM_VIEW_TRAINING_SEED : Number(values.seed);
  if (!Number.isInteger(seed) || seed <= 0) throw new Error(`--seed: expected a positive whole number, got '${values.seed}'`);
  const clips = readClips(seed);
  const text = [
    "# Finger flexion seen from the palm: what the picture holds",
    "",
    `Written by \`npx tsx scripts/accuracy/palm-view-limits.ts --seed ${seed}\` (see its header); do not edit by hand. Training seed ${seed}: ${clips.length} palm-view clips of the MCP and PIP test motions (all four fingers together; the mesh's hand and hands of varied build), tracked by both models.`,
    "",
    "## 1. The moving segment's shortening in the picture",
    "",
    "Length in the picture of the segment that turns toward the camera (MCP-PIP in MCP clips, PIP-DIP in PIP clips) over the palm's (wrist to middle MCP), against the commanded angle, every frame and finger. `true` uses the renderer's joint positions, the models their picture points.",
    "",
    ...shorteningTable(clips),
    "",
    "## 2. The whole finger's picture length, true points, by MCP band",
    "",
    "MCP to fingertip over wrist to middle MCP, from the renderer's joint positions. A bend of θ toward the camera shortens a segment by the factor cos θ: 1.5% at 10°, 6% at 20° (plane geometry).",
    "",
    ...wholeFingerTable(clips),
    "",
    "## 3. The engine's median error by band of the commanded angle (estimate - truth, °)",
    "",
    ...engineTable(clips),
    "",
  ].join("\n");
  if (values.out) writeFileSync(values.out, text);
  console.log(text);
}

if (process.argv[1]?.endsWith("palm-view-limits.ts")) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exitCode = 2;
  });
}
