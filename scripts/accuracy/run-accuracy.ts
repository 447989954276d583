/**
 * `npm run accuracy`: renders the validation set, runs the app's own tracking code on it (tests/harness/tracking,
 * which imports vision/live unchanged) with each hand model, reads angles with the measurement engine
 * (vision/angles) and prints the error table per joint, view and model, raw and (when a fitted correction is in
 * scripts/accuracy/correction.json) corrected; writes it to scripts/accuracy/report.md.
 *
 *   npm run -s accuracy -- [--per-view 40] [--models lite,full] [--reuse]
 */
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { parseArgs } from "node:util";
import type { CorrectionModel } from "./correction";
import { accuracyMarkdown, accuracyRows } from "./report";
import { CAMERA_VIEWS } from "./scene";
import { CLIP_FPS, HOLD_MS, PLAYBACK_RATE, trackRenderedSet, type HandModelVariant } from "./tracked-set";

/** Validation renders come from this seed only; the correction is fitted on renders from other seeds. */
export const VALIDATION_SEED: number = 20_261_202;

const HERE = path.dirname(fileURLToPath(import.meta.url));
const REPORT_FILE = path.join(HERE, "report.md");
export const CORRECTION_FILE = path.join(HERE, "correction.json");

export function parseModels(raw: string | undefined): HandModelVariant[] {
  const models = (raw ?? "lite,full").split(",");
  for (const model of models) if (model !== "lite" && model !== "full") throw new Error(`--models: expected lite and/or full; got '${model}'`);
  return models as HandModelVariant[];
}

export function parsePerView(raw: string | undefined, fallback: number): number {
  const perView = Number(raw ?? fallback);
  if (!Number.isInteger(perView) || perView <= 0) throw new Error(`--per-view: expected a positive whole number; got ${raw}`);
  return perView;
}

async function main(): Promise<void> {
  const { values } = parseArgs({ options: { "per-view": { type: "string" }, models: { type: "string" }, reuse: { type: "boolean" } } });
  const perView = parsePerView(values["per-view"], 40);
  const models = parseModels(values.models);
  const count = perView * CAMERA_VIEWS.length;
  const set = await trackRenderedSet(VALIDATION_SEED, count, models, { reuse: values.reuse });

  let correction: CorrectionModel | null = null;
  if (existsSync(CORRECTION_FILE)) {
    correction = JSON.parse(readFileSync(CORRECTION_FILE, "utf8")) as CorrectionModel;
    if (correction.trainingSeed === VALIDATION_SEED) throw new Error(`${CORRECTION_FILE}: fitted on the validation seed; refit on another seed`);
  }
  const table = accuracyMarkdown(accuracyRows(set.stills, correction));
  const report = [
    "# Angle accuracy on rendered hands",
    "",
    "Written by `npm run accuracy` (scripts/accuracy/run-accuracy.ts); do not edit by hand.",
    "",
    `- Validation set: seed ${VALIDATION_SEED}, ${count} stills (${perView} per view), random poses within anatomical ranges, ` +
      "left and right hands, camera 0.3-1.0 m, skin tones, lights and backgrounds drawn from the seed (scripts/accuracy/scene.ts).",
    "- Truth: the commanded joint angle of the pose model (zero = the rig's rest pose).",
    "- Estimate: the app's tracking code (vision/live via tests/harness/tracking, VIDEO mode, CPU) on a webm of the stills, each held " +
      `${HOLD_MS} ms at ${CLIP_FPS} fps and played at ${PLAYBACK_RATE}x; angles from the measurement engine (vision/angles, readMotion) ` +
      "on the 3-D world landmarks or their image-plane counterpart.",
    correction
      ? `- Correction: ${correction.version}, fitted on seed ${correction.trainingSeed} (${correction.trainingStills} stills, never the validation seed) by scripts/accuracy/fit-correction.ts; coefficients in scripts/accuracy/correction.json.`
      : "- Correction: none fitted yet (run scripts/accuracy/fit-correction.ts).",
    "- Wrist rows use the render's true forearm line (the pose landmarker cannot see an upper body here): they measure the hand landmarks only.",
    "- Perfect-tracker bias: the same engine on the exact rig landmarks; the rig places wrist and MCP points a little off the " +
      "landmark model's convention and its rest pose is not straight, so part of every raw bias is convention, not tracking.",
    "- Detected: share of stills where the tracker returned a hand. Slope: least-squares slope of estimate on truth (1 = full size).",
    "- Views are of random poses, so most motions are not in their recommended view here; read a row as that view's figure for all poses.",
    `- Renderer: ${set.renderer}, ${set.msPerFrame.toFixed(1)} ms a frame. Models: ${models.join(", ")}.`,
    "",
    table,
    "",
  ].join("\n");
  writeFileSync(REPORT_FILE, report);
  console.log(table);
  console.error(`report -> ${REPORT_FILE}`);
}

// Only when run as the script: the fit imports the seed and parsers from here.
if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exitCode = 2;
  });
}
