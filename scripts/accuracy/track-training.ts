/**
 * Renders and tracks a training set for the angle correction and saves it under tests/.cache/renders/tracked/, where
 * fit-correction.ts reads it. Refuses the validation seed.
 *
 *   npx tsx scripts/accuracy/track-training.ts --set motions|finger-motions|single-finger-motions|fingers|hand-shapes|hand-shapes-down|hand-shapes-side --seed 77000002 --count 600 [--models lite,full]
 */
import { parseArgs } from "node:util";
import { fingerFlexionFrame, HAND_SHAPE_DOWN_VIEWS, HAND_SHAPE_SIDE_VIEWS, handShapeFrame, MOTION_SETS, motionFrame } from "./motion-sets";
import { loadHandRig } from "./rig-files";
import { parseCount, parseModels, VALIDATION_SEED } from "./run-accuracy";
import { FINGER_MOTION_SETS, singleFingerMotionSetFrame, trackRenderedSet, type SetFrame } from "./tracked-set";


function rigs() {
  return { left: loadHandRig("left"), right: loadHandRig("right") };
}

export const TRAINING_SET_KINDS: Record<string, () => (frameSeed: number, index: number) => SetFrame> = {
  motions: () => {
    const r = rigs();
    return (frameSeed, index) => motionFrame(r, frameSeed, MOTION_SETS[index % MOTION_SETS.length]);
  },
  "finger-motions": () => {
    const r = rigs();
    return (frameSeed, index) => motionFrame(r, frameSeed, FINGER_MOTION_SETS[index % FINGER_MOTION_SETS.length]);
  },
  "single-finger-motions": singleFingerMotionSetFrame,
  fingers: () => {
    const r = rigs();
    return (frameSeed, index) => fingerFlexionFrame(r, frameSeed, index);
  },
  "hand-shapes": () => {
    const r = rigs();
    return (frameSeed, index) => handShapeFrame(r, frameSeed, index);
  },
  "hand-shapes-down": () => {
    const r = rigs();
    return (frameSeed, index) => handShapeFrame(r, frameSeed, index, HAND_SHAPE_DOWN_VIEWS);
  },
  "hand-shapes-side": () => {
    const r = rigs();
    return (frameSeed, index) => handShapeFrame(r, frameSeed, index, HAND_SHAPE_SIDE_VIEWS);
  },
};

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: { set: { type: "string" }, seed: { type: "string" }, count: { type: "string" }, models: { type: "string" } },
  });
  const kind = values.set ?? "";
  if (!(kind in TRAINING_SET_KINDS)) throw new Error(`--set: expected ${Object.keys(TRAINING_SET_KINDS).join(" or ")}; got '${values.set}'`);
  const seed = parseCount("seed", values.seed, Number.NaN);
  // The validation seed is refused except for a held-out single-finger set, which run-accuracy reports and no fit reads.
  if (seed === VALIDATION_SEED && kind !== "single-finger-motions") throw new Error(`--seed: ${VALIDATION_SEED} is the validation seed; expected a training seed`);
  const count = parseCount("count", values.count, kind === "motions" ? 100 * MOTION_SETS.length : 600);
  const set = await trackRenderedSet({ name: kind, seed, count, models: parseModels(values.models), makeFrame: TRAINING_SET_KINDS[kind]() });
  console.log(`${kind} seed ${seed}: ${set.stills.filter((s) => s.hand).length}/${set.stills.length} tracked stills`);
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exitCode = 2;
});
