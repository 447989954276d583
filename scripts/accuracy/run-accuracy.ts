/**
 * `npm run accuracy`: renders the validation set, runs the app's own tracking code on it (tests/harness/tracking,
 * which imports vision/live unchanged) with each hand model, reads angles with the measurement engine
 * (vision/angles) and prints the error table per joint, view and model, raw and (when a fitted correction is in
 * vision/correction-coefficients.json) corrected; writes it to scripts/accuracy/report.md.
 *
 *   npm run -s accuracy -- [--per-motion 60] [--per-view 40] [--models lite,full] [--reuse]
 */
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { parseArgs } from "node:util";
import { ACCEPTANCE, meetsAcceptance, type AcceptanceKey } from "./acceptance";
import type { CorrectionModel } from "./correction";
import { MOTION_SETS } from "./motion-sets";
import { accuracyMarkdown, accuracyRows, type AccuracyRow } from "./report";
import { CAMERA_VIEWS, frameSeeds } from "./scene";
import {
  FINGER_MOTION_SETS,
  singleFingerMotionSetFrame,
  type SetFrame,
  type TrackedSet,
  CLIP_FPS,
  HOLD_MS,
  motionSetFrame,
  PLAYBACK_RATE,
  randomSetFrame,
  trackRenderedSet,
  type HandModelVariant,
} from "./tracked-set";

/** Validation renders come from this seed only; the correction is fitted on renders from other seeds. */
export const VALIDATION_SEED: number = 20_261_202;

const HERE = path.dirname(fileURLToPath(import.meta.url));
const REPORT_FILE = path.join(HERE, "report.md");
export const CORRECTION_FILE = path.join(HERE, "..", "..", "vision", "correction-coefficients.json");

export function parseModels(raw: string | undefined): HandModelVariant[] {
  const models = (raw ?? "lite,full").split(",");
  for (const model of models) if (model !== "lite" && model !== "full") throw new Error(`--models: expected lite and/or full; got '${model}'`);
  return models as HandModelVariant[];
}

export function parseCount(field: string, raw: string | undefined, fallback: number): number {
  const count = Number(raw ?? fallback);
  if (!Number.isInteger(count) || count <= 0) throw new Error(`--${field}: expected a positive whole number; got ${raw}`);
  return count;
}

function acceptanceLines(rows: AccuracyRow[]): string[] {
  const lines: string[] = [];
  for (const set of MOTION_SETS) {
    const target = ACCEPTANCE[set.id as AcceptanceKey];
    if (!target) continue;
    for (const row of rows.filter((r) => r.joint === set.label && r.method === "corrected")) {
      const s = row.summary;
      const verdict = meetsAcceptance(s, target) ? "meets" : "misses";
      lines.push(
        `- ${set.id}, ${row.view}, ${row.model}: ${verdict} (MAE ${s.meanAbsoluteErrorDeg?.toFixed(1) ?? "-"} of at most ${target.maxMaeDeg}, ` +
          `slope ${s.slope?.toFixed(2) ?? "-"}${target.slope ? ` in ${target.slope.join("-")}` : ""}, detected ${Math.round(s.detectionRate * 100)}% of at least 95%)`,
      );
    }
  }
  return lines;
}

/** Fills in which joints move in each still of a set saved before tracked sets kept it (the frames are rebuilt from the seed). */
export function withMovingKeys(set: TrackedSet, makeFrame: (frameSeed: number, index: number) => SetFrame): TrackedSet {
  if (set.stills.every((still) => still.movingKeys)) return set;
  const seeds = frameSeeds(set.seed, set.count);
  const moving = seeds.map((seed, i) => makeFrame(seed, i).movingKeys);
  return { ...set, stills: set.stills.map((still, i) => ({ ...still, movingKeys: still.movingKeys ?? (moving[i % set.count] ? [...moving[i % set.count]!] : undefined) })) };
}

/**
 * Sections other tools write into report.md between `<!-- name: begin … -->` and `<!-- name: end -->` (e.g.
 * wrist-axis.ts) are carried over from the old report, so a new accuracy run does not erase them.
 */
export function withKeptSections(report: string, previous: string): string {
  const kept = [...previous.matchAll(/<!-- ([\w-]+): begin[^>]*-->[\s\S]*?<!-- \1: end -->/g)].map((m) => m[0]);
  return kept.length ? `${report.replace(/\s*$/, "")}\n\n${kept.join("\n\n")}\n` : report;
}

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: {
      "per-view": { type: "string" },
      "per-motion": { type: "string" },
      "single-per-motion": { type: "string" },
      models: { type: "string" },
      reuse: { type: "boolean" },
    },
  });
  const perView = parseCount("per-view", values["per-view"], 40);
  const perMotion = parseCount("per-motion", values["per-motion"], 60);
  const models = parseModels(values.models);
  const motionCount = perMotion * MOTION_SETS.length;
  const motions = await trackRenderedSet({
    name: "motions", seed: VALIDATION_SEED, count: motionCount, models, makeFrame: motionSetFrame(), reuse: values.reuse,
  });
  // One finger moving, the others near rest: how a client may well do a finger test, and read very differently by
  // the landmark model than four fingers moving together.
  const singlePerMotion = parseCount("single-per-motion", values["single-per-motion"], 60);
  const singleMakeFrame = singleFingerMotionSetFrame();
  const single = withMovingKeys(
    await trackRenderedSet({
      name: "single-finger-motions", seed: VALIDATION_SEED, count: singlePerMotion * FINGER_MOTION_SETS.length, models, makeFrame: singleMakeFrame, reuse: values.reuse,
    }),
    singleMakeFrame,
  );
  const randomCount = perView * CAMERA_VIEWS.length;
  const random = await trackRenderedSet({
    name: "random", seed: VALIDATION_SEED, count: randomCount, models, makeFrame: randomSetFrame(), reuse: values.reuse,
  });

  let correction: CorrectionModel | null = null;
  if (existsSync(CORRECTION_FILE)) {
    correction = JSON.parse(readFileSync(CORRECTION_FILE, "utf8")) as CorrectionModel;
    if (correction.trainingSeed === VALIDATION_SEED || correction.fingerEstimator?.trainingSets.some((set) => set.includes(String(VALIDATION_SEED)))) {
      throw new Error(`${CORRECTION_FILE}: fitted on the validation seed; refit on another seed`);
    }
  }
  const motionRows = MOTION_SETS.flatMap((set) =>
    accuracyRows(
      motions.stills.filter((still) => still.motion === set.id),
      correction,
      [{ label: set.label, keys: set.keys }],
    ),
  );
  const motionTable = accuracyMarkdown(motionRows);
  const singleRows = FINGER_MOTION_SETS.flatMap((set) =>
    accuracyRows(
      single.stills.filter((still) => still.motion === set.id),
      correction,
      [{ label: set.label, keys: set.keys }],
    ),
  );
  const randomTable = accuracyMarkdown(accuracyRows(random.stills, correction));
  const acceptance = correction
    ? [...acceptanceLines(motionRows), "", "One finger moving, the others near rest (not issue 8's set; the same bars, for comparison):", "", ...acceptanceLines(singleRows)]
    : ["- No correction fitted yet."];
  const report = [
    "# Angle accuracy on rendered hands",
    "",
    "Written by `npm run accuracy` (scripts/accuracy/run-accuracy.ts); do not edit by hand.",
    "",
    `- Held-out renders: seed ${VALIDATION_SEED}. Test motions: ${motionCount} stills (${perMotion} per motion), each motion in the ` +
      "view the motion catalog recommends (side = radial or ulnar view; overhead = looking down), the tested joint across its range on " +
      "all four fingers together, other joints within 5 degrees of rest, camera 0.3-0.7 m (scripts/accuracy/motion-sets.ts). Random poses: " +
      `${randomCount} stills (${perView} per view), every joint random within anatomical ranges, camera 0.3-1.0 m (scripts/accuracy/scene.ts). ` +
      "Both: left and right hands, skin tones, lights and backgrounds drawn from the seed.",
    "- Truth: the commanded joint angle of the pose model (zero = the rig's rest pose).",
    "- Estimate: the app's tracking code (vision/live via tests/harness/tracking, VIDEO mode, CPU) on a webm of the stills, each held " +
      `${HOLD_MS} ms at ${CLIP_FPS} fps and played at ${PLAYBACK_RATE}x; angles from the measurement engine (vision/angles, readMotion) ` +
      "on the 3-D world landmarks or their image-plane counterpart.",
    correction
      ? `- Correction: ${correction.version}, fitted by scripts/accuracy/fit-correction.ts, never on the validation seed; coefficients in vision/correction-coefficients.json. ` +
        `Wrist and abduction: linear maps on seed ${correction.trainingSeed} (${correction.trainingStills} stills). ` +
        (correction.fingerEstimator
          ? `Finger MCP, PIP and DIP flexion: the finger estimator (vision/estimator.ts: ridge regression on the whole finger's features and their pairwise products, per joint and hand model), on ${correction.fingerEstimator.trainingSets.join(", ")}.`
          : "")
      : "- Correction: none fitted yet (run scripts/accuracy/fit-correction.ts).",
    "- Wrist rows use the render's true forearm line (the pose landmarker cannot see an upper body here): they measure the hand landmarks only.",
    "- Perfect-tracker bias: the same engine on the exact rig landmarks; the rig places wrist and MCP points a little off the " +
      "landmark model's convention and its rest pose is not straight, so part of every raw bias is convention, not tracking.",
    "- Detected: share of samples (stills x joints) with an estimate. Slope: least-squares slope of estimate on truth (1 = full size).",
    `- Renderer: ${motions.renderer}, ${motions.msPerFrame.toFixed(1)} ms a frame. Models: ${models.join(", ")}.`,
    "",
    "## Acceptance (issue 8: recommended view, after correction)",
    "",
    ...acceptance,
    "",
    "## Test motions in their recommended view",
    "",
    motionTable,
    "",
    "## Random poses in every view",
    "",
    randomTable,
    "",
    // After the random poses: readers of the test-motion tables take everything up to "## Random poses".
    "## Single-finger test motions in their recommended view",
    "",
    `Held-out seed ${VALIDATION_SEED}, ${single.count} stills (${singlePerMotion} per finger motion): one finger, drawn from the seed, moves the tested joint; ` +
      "the others stay within 5 degrees of rest. Only the moving finger is scored.",
    "",
    accuracyMarkdown(singleRows),
    "",
  ].join("\n");
  writeFileSync(REPORT_FILE, withKeptSections(report, existsSync(REPORT_FILE) ? readFileSync(REPORT_FILE, "utf8") : ""));
  console.log(["## Acceptance", ...acceptance, "", "## Test motions in their recommended view", motionTable, "", "## Random poses in every view", randomTable].join("\n"));
  console.error(`report -> ${REPORT_FILE}`);
}

// Only when run as the script: the fit imports the seed and parsers from here.
if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exitCode = 2;
  });
}
