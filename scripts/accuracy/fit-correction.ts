/**
 * Fits the angle correction on training renders (seed TRAINING_SEED, never the validation seed) tracked by the app's
 * own tracking code, and writes scripts/accuracy/correction.json. Re-run after changing the tracker, the engine's
 * angle maths or the render set; the version string in the file changes only when the model's form changes.
 *
 *   npx tsx scripts/accuracy/fit-correction.ts [--per-view 60] [--per-motion 40] [--models lite,full] [--reuse]
 */
import { writeFileSync } from "node:fs";
import { parseArgs } from "node:util";
import { fitCorrection, type CorrectionSample } from "./correction";
import { estimateAngles, ESTIMATED_KEYS } from "./estimates";
import { getPoseAngle } from "./hand-pose";
import { CORRECTION_FILE, parseModels, parsePerView, VALIDATION_SEED } from "./run-accuracy";
import { CAMERA_VIEWS } from "./scene";
import { MOTION_SETS } from "./motion-sets";
import { motionSetFrame, randomSetFrame, trackRenderedSet } from "./tracked-set";

export const TRAINING_SEED: number = 77_000_001;

function round(value: number): number {
  return Math.round(value * 1e6) / 1e6;
}

async function main(): Promise<void> {
  if (TRAINING_SEED === VALIDATION_SEED) throw new Error("TRAINING_SEED must differ from VALIDATION_SEED");
  const { values } = parseArgs({
    options: { "per-view": { type: "string" }, "per-motion": { type: "string" }, models: { type: "string" }, reuse: { type: "boolean" } },
  });
  const models = parseModels(values.models);
  // Trained on both kinds of set the report shows, from the training seed only.
  const random = await trackRenderedSet({
    name: "random", seed: TRAINING_SEED, count: parsePerView(values["per-view"], 60) * CAMERA_VIEWS.length, models,
    makeFrame: randomSetFrame(), reuse: values.reuse,
  });
  const motions = await trackRenderedSet({
    name: "motions", seed: TRAINING_SEED, count: parsePerView(values["per-motion"], 40) * MOTION_SETS.length, models,
    makeFrame: motionSetFrame(), reuse: values.reuse,
  });
  const count = random.count + motions.count;
  const samples: CorrectionSample[] = [];
  for (const still of [...random.stills, ...motions.stills]) {
    if (!still.hand) continue;
    const estimates = estimateAngles(still.hand, still.truth.side, still.truth.forearmCameraDir);
    for (const key of ESTIMATED_KEYS) {
      const estimate = estimates[key];
      if (estimate) samples.push({ model: still.model, key, estimate, truthDeg: getPoseAngle(still.truth.commandedDeg, key) });
    }
  }
  const model = fitCorrection(samples, { trainingSeed: TRAINING_SEED, trainingStills: count });
  for (const groups of Object.values(model.groups)) {
    for (const fit of Object.values(groups)) {
      fit.coefficients = fit.coefficients.map(round);
      fit.trainingMaeDeg = round(fit.trainingMaeDeg);
    }
  }
  writeFileSync(CORRECTION_FILE, `${JSON.stringify(model, null, 2)}\n`);
  for (const [handModel, groups] of Object.entries(model.groups)) {
    for (const [group, fit] of Object.entries(groups)) {
      console.log(`${handModel} ${group}: ${fit.trainingSamples} samples, training MAE ${fit.trainingMaeDeg.toFixed(1)} deg`);
    }
  }
  console.error(`correction -> ${CORRECTION_FILE}`);
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exitCode = 2;
});
