/**
 * The wrist's forearm line in the recommended framing, measured on renders with a fixed forearm, and the engine's
 * view classifier checked on stills of known view: renders the trials (scripts/accuracy/wrist-set.ts), tracks them
 * with the app's own code for each hand model, prints the tables and writes them into scripts/accuracy/report.md as
 * their own section (between markers, so `npm run accuracy` and this script can each rewrite their part), and the
 * neutral-reading error per group, view and model into vision/wrist-axis-validation.json for the engine.
 *
 *   npx tsx scripts/accuracy/wrist-axis.ts [--trials 6] [--per-view 12] [--models lite,full] [--reuse]
 *
 * One Chromium job: run it alone, with `nice -n 10` on a shared machine (about 10 minutes for both models).
 */
import { readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { parseArgs } from "node:util";
import { loadHandRig } from "./rig-files";
import { parseCount, parseModels } from "./run-accuracy";
import { trackRenderedSet } from "./tracked-set";
import { neutralValidationTable, viewCheckFrames, viewConfusion, withSection, wristRows, wristSectionMarkdown, wristTrialFrames, type WristSetFrame } from "./wrist-set";

/** Held out: nothing is fitted on this seed (the correction's training seed is 77000001, the main validation 20261202). */
export const WRIST_SEED = 20_261_203;

const HERE = path.dirname(fileURLToPath(import.meta.url));
const REPORT_FILE = path.join(HERE, "report.md");
/** The engine's copy of the neutral-reading error table (vision/wrist-axis.ts reads it for the stated uncertainty). */
const VALIDATION_FILE = path.join(HERE, "..", "..", "vision", "wrist-axis-validation.json");

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: { trials: { type: "string" }, "per-view": { type: "string" }, models: { type: "string" }, reuse: { type: "boolean" } },
  });
  const trials = parseCount("trials", values.trials, 6);
  const perView = parseCount("per-view", values["per-view"], 12);
  const models = parseModels(values.models);
  const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };
  const frames: WristSetFrame[] = [...wristTrialFrames(rigs, WRIST_SEED, trials), ...viewCheckFrames(rigs, WRIST_SEED, perView)];
  const set = await trackRenderedSet({
    name: "wrist",
    seed: WRIST_SEED,
    count: frames.length,
    models,
    makeFrame: (_seed, index) => frames[index],
    reuse: values.reuse,
  });
  const rows = wristRows(set.stills);
  const viewModel = models[0];
  const views = viewConfusion(set.stills.filter((s) => s.model === viewModel));
  const section = wristSectionMarkdown({ seed: WRIST_SEED, trialsPerView: trials, models, rows, views, viewModel });
  writeFileSync(REPORT_FILE, withSection(readFileSync(REPORT_FILE, "utf8"), section));
  writeFileSync(VALIDATION_FILE, `${JSON.stringify(neutralValidationTable(WRIST_SEED, rows), null, 2)}\n`);
  console.log(section);
  console.error(`section -> ${REPORT_FILE}`);
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exitCode = 2;
  });
}
