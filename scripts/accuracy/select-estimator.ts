/**
 * Model selection for the finger estimator on training seeds only (never the validation seed): the ridge penalty and
 * how much the fingers-flexed-together stills count, judged the way issue 8 judges the result (the tested joint of
 * the MCP, PIP and DIP test motions, in their recommended views: MAE and slope). With --holdout it fits on --sets and
 * scores on the held-out training set; without, 3-fold cross-validation over the test-motion stills, grouped by still.
 * `--clip-seeds` adds the tracked finger clips of those training seeds (scripts/accuracy/clip-training.ts) to the fit,
 * each frame weighted by each of `--clip-weights`; `--clip-holdout` scores on the clips of other training seeds too
 * (rows `clip ulnar`), every frame of the tested joint.
 *
 *   npx tsx scripts/accuracy/select-estimator.ts [--sets a,b] [--holdout finger-motions-77000002-900] [--models lite]
 *     [--clip-seeds 77000401] [--clip-weights 0,0.3,1] [--clip-holdout 77000402] [--clip-every 3]
 *     [--clip-conditions against_gravity,gravity_minimized] [--clip-holdout-conditions against_gravity]
 *     [--clip-shapes alone,dip-follows] [--dip-clip-weights 0,1,3] [--clip-holdout-shapes alone,dip-follows] [--joints pip]
 *
 * `--clip-shapes` names the finger clips fitted on: the tested joint bent `alone` (default) and PIP clips whose DIP
 * bends along (`dip-follows`, rendered with `clip-validation.ts --dip-follows 0.7`), a frame of the latter counting each
 * of `--dip-clip-weights` times the clip weight; `--clip-holdout-shapes` scores on those shapes, rows `clip <view> dip70`.
 */
import { parseArgs } from "node:util";
import { applyFingerFit, DOMAIN_MARGIN_SD, FINGER_JOINTS, inTrainingDomain, type FingerJoint } from "@/vision/estimator";
import { CLIP_CONDITIONS, CLIP_SHAPES, clipFingerSamples, clipFrameWeight, clipShapeOf, isClipSample, sampleSource, type ClipCondition, type ClipShape } from "./clip-training";
import { HUBER_DEG } from "./correction";
import { fingerSamples, fitFingerJoint, loadTrackedSet, sampleWeight, type FingerSample } from "./estimator-fit";
import { FINGER_FLEXION_SET } from "./motion-sets";
import { summarizeErrors } from "./stats";

const FOLDS = 3;

function foldOf(sample: FingerSample): number {
  // Test motions take turns by still index (six motions in the full set), so fold by index / 6 to keep every motion in every fold.
  return Math.floor(Number(sample.stillId.split("#")[1]) / 6) % FOLDS;
}

/** A test-motion still: what cross-validation scores (clip frames, when added, only ever train). */
function isTestMotion(sample: FingerSample): boolean {
  return !isClipSample(sample) && sample.motion !== null && sample.motion !== FINGER_FLEXION_SET;
}

function scoreJoint(
  train: FingerSample[],
  test: FingerSample[],
  joint: FingerJoint,
  lambda: number,
  togetherWeight: number,
  marginSd: number,
  restingWeight: number,
  clipWeight = 1,
  dipClipWeight = 1,
) {
  const weightOf = (s: FingerSample) => sampleWeight(s, joint, togetherWeight, restingWeight) * clipFrameWeight(s, clipWeight, dipClipWeight);
  const rows = train.filter((s) => weightOf(s) > 0);
  const fit = fitFingerJoint(rows.map((s) => s.base), rows.map((s) => s.truthDeg[joint]), {
    ridgeLambda: lambda,
    huberDeg: HUBER_DEG,
    weights: rows.map(weightOf),
    sources: rows.map(sampleSource),
  });
  // Outside the training domain the engine keeps the raw angle; scored the same way, with the share kept.
  return test
    // Scored as the report scores: the tested joint of every finger in four-finger stills, the moving finger in single ones.
    .filter((s) => sampleWeight(s, joint, 0, 0) === 1)
    .map((s) => {
      const inDomain = inTrainingDomain(fit, s.base, marginSd);
      return {
        view: `${s.stillId.startsWith("single") ? "single " : isClipSample(s) ? "clip " : ""}${s.view}${clipShapeOf(s) === "dip-follows" ? " dip70" : ""}`,
        truthDeg: s.truthDeg[joint],
        estimateDeg: inDomain ? applyFingerFit(fit, s.base) : s.base[FINGER_JOINTS.indexOf(joint)],
        inDomain,
      };
    });
}

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: {
      sets: { type: "string" },
      holdout: { type: "string" },
      models: { type: "string" },
      lambdas: { type: "string" },
      weights: { type: "string" },
      margins: { type: "string" },
      resting: { type: "string" },
      "clip-seeds": { type: "string" },
      "clip-weights": { type: "string" },
      "clip-holdout": { type: "string" },
      "clip-every": { type: "string" },
      "clip-conditions": { type: "string" },
      "clip-holdout-conditions": { type: "string" },
      "clip-shapes": { type: "string" },
      "clip-holdout-shapes": { type: "string" },
      "dip-clip-weights": { type: "string" },
      joints: { type: "string" },
    },
  });
  const setNames = (values.sets ?? "motions-77000001-600,fingers-77000101-600").split(",");
  const all = setNames.flatMap((name) => fingerSamples(loadTrackedSet(name), name));
  const seedList = (text: string | undefined) => (text ? text.split(",").map(Number) : []);
  const clipEvery = Number(values["clip-every"] ?? 3);
  const clipSeeds = seedList(values["clip-seeds"]);
  const clipHoldoutSeeds = seedList(values["clip-holdout"]);
  const clipWeights = (values["clip-weights"] ?? "1").split(",").map(Number);
  const stillHoldout = values.holdout ? fingerSamples(loadTrackedSet(values.holdout), values.holdout) : [];
  const models = (values.models ?? "lite,full").split(",");
  const conditionList = (text: string | undefined) => (text ? (text.split(",") as ClipCondition[]) : CLIP_CONDITIONS);
  const shapeList = (text: string | undefined): ClipShape[] => {
    const shapes = (text ?? "alone").split(",");
    const unknown = shapes.find((shape) => !(CLIP_SHAPES as readonly string[]).includes(shape));
    if (unknown) throw new Error(`--clip-shapes: expected ${CLIP_SHAPES.join(" or ")}; got '${unknown}'`);
    return shapes as ClipShape[];
  };
  const clipTrain = models.flatMap((model) =>
    clipSeeds.length ? clipFingerSamples(clipSeeds, model, clipEvery, conditionList(values["clip-conditions"]), shapeList(values["clip-shapes"])) : [],
  );
  const clipHoldout = models.flatMap((model) =>
    clipHoldoutSeeds.length
      ? clipFingerSamples(clipHoldoutSeeds, model, 1, conditionList(values["clip-holdout-conditions"]), shapeList(values["clip-holdout-shapes"]))
      : [],
  );
  const dipClipWeights = (values["dip-clip-weights"] ?? "1").split(",").map(Number);
  const joints = values.joints ? (values.joints.split(",") as FingerJoint[]) : FINGER_JOINTS;
  const fitsDipFollowing = clipTrain.some((c) => clipShapeOf(c) === "dip-follows");
  all.push(...clipTrain);
  const holdout = values.holdout || clipHoldout.length ? [...stillHoldout, ...clipHoldout] : null;
  const lambdas = (values.lambdas ?? "3,10,30").split(",").map(Number);
  const weights = (values.weights ?? "0,0.1,0.3").split(",").map(Number);
  const margins = (values.margins ?? String(DOMAIN_MARGIN_SD)).split(",").map(Number);
  const restingWeights = (values.resting ?? "1").split(",").map(Number);
  for (const model of models) {
    for (const joint of joints) {
      for (const lambda of lambdas) {
        for (const weight of weights) for (const marginSd of margins) for (const resting of restingWeights) for (const clipWeight of clipWeights) for (const dipClipWeight of dipClipWeights) {
          const own = all.filter((s) => s.model === model);
          const results = holdout
            ? scoreJoint(own, holdout.filter((s) => s.model === model), joint, lambda, weight, marginSd, resting, clipWeight, dipClipWeight)
            : Array.from({ length: FOLDS }, (_, fold) =>
                scoreJoint(
                  own.filter((s) => !isTestMotion(s) || foldOf(s) !== fold),
                  own.filter((s) => isTestMotion(s) && foldOf(s) === fold),
                  joint,
                  lambda,
                  weight,
                  marginSd,
                  resting,
                  clipWeight,
                  dipClipWeight,
                ),
              ).flat();
          const cells = [...new Set(results.map((r) => r.view))].sort().map((view) => {
            const s = summarizeErrors(results.filter((r) => r.view === view));
            const kept = results.filter((r) => r.view === view && r.inDomain).length / Math.max(1, results.filter((r) => r.view === view).length);
            return `${view} MAE ${s.meanAbsoluteErrorDeg?.toFixed(1)} slope ${s.slope?.toFixed(2)} estimator ${Math.round(kept * 100)}%`;
          });
          console.log(`${model} ${joint} lambda ${lambda} together-weight ${weight} margin ${marginSd} sd resting ${resting}${clipSeeds.length ? ` clip-weight ${clipWeight}` : ""}${fitsDipFollowing ? ` dip-clip-weight ${dipClipWeight}` : ""}: ${cells.join(" | ")}`);
        }
      }
    }
  }
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exitCode = 2;
});
