/**
 * Fits kinarc-wrist-neutral-1 (scripts/accuracy/wrist-set.ts): renders wrist trials from a training seed (never the
 * wrist validation seed of scripts/accuracy/wrist-axis.ts), tracks them with the app's own code and writes the per
 * group, view and model line from the raw reading against a neutral reading to the truth into
 * scripts/accuracy/wrist-neutral-fit.json. Then re-run scripts/accuracy/wrist-axis.ts (--reuse) to measure it on the
 * held-out trials (the `fitted` rows). The engine does not use it: it did not carry over (see report.md).
 *
 *   npx tsx scripts/accuracy/wrist-fit.ts [--trials 12] [--models lite,full] [--reuse]
 */
import { writeFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { parseArgs } from "node:util";
import { loadHandRig } from "./rig-files";
import { parseCount, parseModels } from "./run-accuracy";
import { trackRenderedSet } from "./tracked-set";
import { WRIST_SEED } from "./wrist-axis";
import { fitWristNeutral, neutralRawSamples, wristTrialFrames } from "./wrist-set";

export const WRIST_TRAINING_SEED: number = 77_000_301;

const FIT_FILE = path.join(path.dirname(fileURLToPath(import.meta.url)), "wrist-neutral-fit.json");

async function main(): Promise<void> {
  const { values } = parseArgs({ options: { trials: { type: "string" }, models: { type: "string" }, reuse: { type: "boolean" } } });
  if (WRIST_TRAINING_SEED === WRIST_SEED) throw new Error("the training seed must differ from the validation seed");
  const trials = parseCount("trials", values.trials, 12);
  const models = parseModels(values.models);
  const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };
  const frames = wristTrialFrames(rigs, WRIST_TRAINING_SEED, trials);
  const set = await trackRenderedSet({ name: "wrist-training", seed: WRIST_TRAINING_SEED, count: frames.length, models, makeFrame: (_s, i) => frames[i], reuse: values.reuse });
  const fit = fitWristNeutral(WRIST_TRAINING_SEED, neutralRawSamples(set.stills));
  writeFileSync(FIT_FILE, `${JSON.stringify(fit, null, 2)}\n`);
  for (const c of fit.cells) console.log(`${c.group} | ${c.view} | ${c.model}: truth = ${c.intercept.toFixed(1)} + ${c.slope.toFixed(3)} x raw (${c.samples} samples)`);
  console.error(`fit -> ${FIT_FILE}`);
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exitCode = 2;
  });
}
