/**
 * Held-out clips: continuous motions, measured the way Kinarc measures a client (issue 8's bars on its real path).
 *
 * The still-based report (run-accuracy.ts) jumps from one random pose to the next, so the tracker must find the hand
 * afresh on every still; a client moves continuously and the tracker follows the hand from frame to frame. Here each
 * test motion is rendered as a clip (a still start, then two cycles from rest to a drawn end of range and back, 30 fps)
 * in the view vision/view-policy.ts recommends for it against gravity, tracked frame by frame by the app's own code
 * (tests/harness/tracking, step mode, as analyze-clip), turned into a capture by the upload's own builder
 * (vision/live/clip-capture.ts: for wrist motions the straight-wrist reading from the still start) and read by the
 * engine's capture analysis (vision/analyze-capture.ts, correction as shipped). Finger motions move all four fingers
 * together, as the self-check asks; each finger is read from the same frames.
 *
 * Per frame: truth = the commanded angle, estimate = the engine's angle for that frame (null when it reported none).
 * Per clip and finger: the peak of the best repetition against the truth's end of range, and the repetition count.
 * The seeds are held out: nothing is fitted on them (SEED_NOTES says what else each was used for).
 *
 *   npx tsx scripts/accuracy/clip-validation.ts [--clips 10] [--seeds 20261209,20261207,20261205] [--models lite,full] [--reuse]
 *     [--condition against_gravity|gravity_minimized] [--motions wrist.flexion,wrist.extension] [--out FILE] [--per-clip]
 *
 * `--view palm,back,down` renders the same clips in those views instead (named `<motion>-<view>-...`): the training
 * clips of the whole-hand-shape estimators (hand-shape-fit.ts) and their held-out check; write those with `--out`.
 *
 * `--one-finger` moves one finger only (index, middle, ring, little in turn), its neighbours straight, and scores that
 * finger: clips named `<motion>-alone-...` (what a finger tested on its own reads); write those with `--out`.
 * `--digits little` (with `--one-finger`): only those fingers move, in turn; the clips are named `<motion>-alone-little-...`.
 *
 * `--proportions varied` renders every clip with a hand of its own build (scene.ts `sampleProportions`: palm, finger and
 * bone lengths, girth), named `<motion>...-varied-...`; the reports so far show the mesh's one hand. Write with `--out`.
 *
 * `--turn-in 30` opens every clip with the hand turned 30 degrees palm-first toward the camera, turning back over 1.5 s
 * before the still start (named `...-turn30-...`; finger motions only; write with `--out`): does a hand the tracker
 * misses edge-on get found that way and then followed?
 *
 * `--dip-follows 0.7` (with `--motions pip.flexion`): each finger's DIP bends along with its PIP, 0.7 times as far (named
 * `...-dip70-...`; write with `--out`): the PIP read as most people bend it, not alone.
 * `--track-fps 15` tracks the clips stepping through every second frame, as a camera at 15 frames a second would give
 * them (saved apart, `<clip>-<model>-f15.tracked.json`; truth taken at the tracked frames' times); write with `--out`.
 *
 * Each seed's section ends with the engine's finger readings split by finger ("By finger"): a view may see some fingers
 * well and hide others, and derive-uncertainty.ts gives each finger its own interval where every seed was split.
 *
 * `--condition gravity_minimized` renders the same motions in the view the policy recommends with gravity minimized
 * (the thumb side, from above a hand resting on its edge) and writes clip-report-gravity-minimized.md instead.
 */
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { parseArgs } from "node:util";
import type { Browser } from "playwright-core";
import type { Condition, Digit, MotionId } from "@/lib/motions/catalog";
import { analyzeCapture } from "@/vision/analyze-capture";
import { ClipCaptureError, clipCapture } from "@/vision/live/clip-capture";
import type { LandmarkXYZ, TrackedFrame } from "@/vision/live/types";
import { handSpan, handSpanBand, viewPolicy } from "@/vision/view-policy";
import { launchChromium, openHarnessPage, startHarnessServer, waitForFrames, type HarnessServer } from "../../tests/harness/tracking-harness";
import { FINGERS, getPoseAngle, proportionedRig, type HandProportions, type PoseKey } from "./hand-pose";
import { renderSweepClip, runFfmpeg } from "./render-jobs";
import { HandRenderer, RENDER_OUTPUT_ROOT } from "./renderer";
import { loadHandRig } from "./rig-files";
import type { HandRig, HandSide } from "./rig";
import type { SweepOptions } from "./sweep";
import { uniformFloat64 } from "pure-rand/distribution/uniformFloat64";
import { CAMERA_VIEWS, frameSeeds, IMAGE_HEIGHT_PX, IMAGE_WIDTH_PX, makeRng, PROPORTION_RANGES, sampleProportions, type CameraView, type FrameTruth } from "./scene";
import { nearestRankPercentile, summarizeErrors, type ErrorSample, type ErrorSummary } from "./stats";
import { ACCEPTANCE, meetsAcceptance, MIN_DETECTION, type AcceptanceKey } from "./acceptance";
import { parseCount, parseModels } from "./run-accuracy";
import type { HandModelVariant } from "./tracked-set";

/** The report's seeds, first the one the acceptance lines of the README quote. */
export const CLIP_VALIDATION_SEEDS = [20_261_210, 20_261_209, 20_261_207, 20_261_205] as const;
/** Said of each seed whose thumb-side finger rows were read again from saved tracking under engine analysis-7. */
const REREAD_UNDER_ANALYSIS_7 =
  " With gravity minimized (thumb side), its finger clips' saved tracking was read again under engine analysis-7 (commit cd34a2a: the finger estimator's view fit follows the engine's view of the frame, chosen on calibration seeds 77000407-77000408), and those rows are that reading; its wrist rows stand as read before (the change does not touch the wrist).";
/** Seeds whose saved finger clips were read again when the side-on whole-hand-shape fit went in. */
const REREAD_UNDER_CORRECTION_9 =
  " Under kinarc-correction-9 (the side-on whole-hand-shape fit reads frames the side-view estimator declines) the saved tracking of its finger clips was read again where this machine still had it (seed 20261222 in both test positions; seeds 20261210 and 20261207 with gravity minimized), and those rows are that reading; the rest stand as read before.";
/** What each held-out seed was used for besides measuring: the honest provenance of its figures. */
export const SEED_NOTES: Record<number, string> = {
  20261239:
    "Fresh check of the PIP fits trained on the PIP bent alone and with its DIP bending along: the PIP flexion test motion, 8 clips with the PIP alone and 8 with each finger's DIP bending along at 0.7 of its PIP (`--dip-follows 0.7`), both models, in each test position. Little-finger side (against gravity): checks kinarc-correction-10, rendered and tracked while that fit was made and read once after it and its table were committed. Thumb side (gravity minimized): checks kinarc-correction-11 (the thumb side's PIP fit trained the same way), rendered and tracked while that fit was made and read once after it and its table were committed. Rule written before reading each: for each shape, every engine row and every two-model (both) row holds at least 85% of its frames and 80% of its peaks inside the stated ±; otherwise this seed becomes an interval source for that shape in that position. Nothing is fitted on it.",
  20261237:
    "Held-out still set of the side-on whole-hand-shape fit (kinarc-correction-9; scripts/accuracy/hand-shape-fit.ts holdout --family side): 300 whole-hand shapes seen from the thumb side and the little-finger side in turn, both models, rendered after the fit was written and read once. Rule written before reading (scripts/accuracy/README.md): in each cell the fit reads the frames the side-view estimator declines only where it lowers their MAE by more than two standard errors; those frames take their own interval from this set. Nothing is fitted on it.",
  20261238:
    "Fresh check of the PIP intervals widened for a DIP bending along (derived from training seed 77000412's clips, where the engine over-read the PIP by 9-10 degrees): the PIP flexion test motion from both test positions with each finger's DIP bending along at 0.7 of its PIP (`--dip-follows 0.7`), 8 clips each, both models; rendered and tracked after the widened table was committed, read once. Rule written before reading: every engine row and every two-model (both) row holds at least 85% of its frames and 80% of its peaks inside the stated ±; otherwise this seed becomes a source too. Nothing is fitted on it. When the PIP fits were trained on this motion as well, its clips were rendered and tracked again here from the same seed (the first tracking was no longer on this machine; detection came out a few points apart) and read under kinarc-correction-10 (against gravity, the little-finger side's fit) and kinarc-correction-11 (gravity minimized, the thumb side's), nothing fitted on them.",
  77000412:
    "Training seed for a study, never fitted on: the PIP flexion test motion from both test positions (8 clips each, both models), once as the reports draw it (the PIP alone) and once with each finger's DIP bending along at 0.7 of its PIP (`--dip-follows 0.7`), as most people bend a finger: does the engine read the PIP as truly when the DIP goes with it? Its DIP-along clips were rendered and tracked again here from the same seed (the first tracking was no longer on this machine) and read under kinarc-correction-10 (little-finger side) and kinarc-correction-11 (thumb side), never fitted on: those fits' clips are seeds 77000401-77000405.",
  77000411:
    "Training seed of the side-on whole-hand-shape fit (kinarc-correction-9): 400 whole-hand-shape stills from the thumb side and the little-finger side (track-training.ts --set hand-shapes-side).",
  20261236:
    "Fresh check of the set-up advice to show the palm for a moment when the hand is not found from the thumb side (chosen on training seed 77000410, where it took the tracker from 95% (lite) and 92% (full) of frames to 100%): the finger test motions from the thumb side (gravity minimized), 10 clips per motion, hands of varied build, both models, every clip opening with the hand turned 30 degrees palm-first and turning back (`--turn-in 30`); rendered and tracked after that advice was committed, read once. Rule written before reading: every engine row detects at least 95% of frames (issue 8's detection bar), with frames inside the stated ± at least 85% and peaks at least 80%; otherwise the advice is not credited with the thumb side's detection. Nothing is fitted on it.",
  77000410:
    "Training seed for the set-up advice, never fitted on: the finger test motions from the thumb side (gravity minimized), 10 clips per motion, hands of varied build, both models, each clip once as drawn and once opening with the hand turned 30 degrees palm-first toward the camera and turning back (`--turn-in 30`), to see whether a hand the tracker never finds edge-on is found that way and then followed.",
  77000409:
    "Training seed for diagnosis, never fitted on: the MCP and PIP test motions seen from the palm (`--view palm`, 8 clips per motion), the mesh's hand and hands of varied build, both models; read many times (the build study, palm-view-limits.ts). Its palm-view PIP peaks fell outside the stated interval too often (65-83%), so its rows became a source of the palm view's intervals (derive-uncertainty.ts CLIP_REPORT_FILES; the worst seed stands), checked on seed 20261235.",
  20261235:
    "Fresh check of the palm view's intervals after training seed 77000409 became one of their sources: the MCP and PIP test motions seen from the palm, 10 clips per motion, the mesh's hand and hands of varied build, both models; rendered and tracked after that change was committed, read once. Rule written before reading: where every engine row's frames inside the stated ± reach at least 85% and its peaks at least 80%, the palm view's intervals stand; a row below either makes this seed a source too (the worst seed stands). Nothing is fitted on it.",
  20261234:
    "Hands of varied build (`--proportions varied`: each clip's hand drawn with its own palm, finger and bone lengths and girth), every motion against gravity and the finger motions with gravity minimized, 10 clips per motion, both models: rendered and tracked after that option was committed, read once. It asks whether the intervals stated from the mesh's one hand hold for other hands. Rule written before reading: where a row's frames inside the stated ± reach at least 85% and its peaks at least 80% (40 readings at a nominal 90%: about two standard errors), the stated intervals stand for other builds; a row below either makes this seed's rows a source of that cell's interval (the worst seed stands), checked on a fresh seed. Nothing is fitted on it.",
  20261233:
    "The fresh check of the index, middle and ring fingers' own lone intervals: rendered and tracked like 20261232 (`--one-finger --digits index,middle,ring`, against gravity, 24 clips per motion, 8 per finger, both models) at the same time, and read once (`--reuse`) after those intervals were committed. Not read by derive-uncertainty.ts; nothing is fitted on it.",
  20261232:
    "The index, middle and ring fingers each bent on its own (`--one-finger --digits index,middle,ring`), against gravity, seen from the little-finger side, 24 clips per motion (8 per finger), both models: rendered and tracked after the lone-finger rule (commit a43972a) and the little finger's figures were committed, read once. Its per-finger rows are the source of those fingers' lone intervals; nothing is fitted on it.",
  20261231:
    "The fresh check of the little finger's own lone interval from two seeds (20261229 and 20261230): rendered and tracked like them (`--one-finger --digits little`, against gravity, 12 clips per motion, both models) while the second seed was being added, and read once (`--reuse`) after that was committed. Not read by derive-uncertainty.ts; nothing is fitted on it.",
  20261230:
    "Rendered and tracked like 20261229 (`--one-finger --digits little`, against gravity, 12 clips per motion, both models) as the fresh check of the little finger's lone interval from that seed alone (commit f4faabb), and read once (`--reuse`) after it was committed: frames inside the stated ± 89-99%, but peaks only 73-83% for PIP and DIP (its peaks read lower than 20261229's: lite PIP peak MAE 15.1 against 7.8 deg). It was then added as the interval's second source (the worst seed stands), checked on 20261231. Nothing is fitted on it.",
  20261229:
    "The little finger bent on its own (`--one-finger --digits little`), against gravity, seen from the little-finger side, 12 clips per motion, both models: rendered and tracked while the rule giving a lone finger its own interval (derive-uncertainty.ts ONE_FINGER_CLIP_REPORT_FILES, commit a43972a) was being written, and read once after it was committed. The finger and view were chosen on training seed 77000406 (every finger bent alone, seen from either side). Its per-finger rows are the source of that finger's lone interval; nothing is fitted on it.",
  20261228:
    "The third fresh check of the thumb-side framing band for the fingers: rendered and tracked like 20261225 (`--framing setup`, 12 clips per motion) after the wrist's bound and the view instruction were committed (commit ba91be2); read once, after. Nothing is fitted on it.",
  20261227:
    "The fresh check of the wrist's thumb-side framing bound: rendered and tracked (gravity minimized, wrist flexion and extension, both models, 12 clips per motion, `--framing setup`) after the bound was committed (commit ba8564b; set on calibration seeds 77000407-77000408); read once, after. Nothing is fitted on it.",
  20261226:
    "The second fresh check of the thumb-side framing band: rendered and tracked like 20261225 (`--framing setup`, 12 clips per motion) after that seed's figures were committed (commit c49471a); read once, after. Nothing is fitted on it.",
  20261225:
    "Rendered and tracked (gravity minimized, finger motions, both models, 12 clips per motion, `--framing setup`) after the set-up check's thumb-side framing band was committed (commit 5fa7b50; set on calibration seeds 77000407-77000408); read once, after. Nothing is fitted on it.",
  20261224:
    "Rendered and tracked (gravity minimized, finger motions, both models) after engine analysis-7 (commit cd34a2a: the finger estimator's view fit follows the engine's view of the frame, chosen on calibration seeds 77000407-77000408) was committed, while the thumb-side intervals were re-derived under it; read once, after those were committed. Nothing is fitted on it.",
  20261222:
    "The frame-rate check, read once: rendered and tracked (against gravity, finger and wrist motions, both models) at the clips' own 30 frames a second and again through every third frame (`--track-fps 10`, a camera at 10 frames a second), after the resting angle's settings were put in time (engine analysis-4, commit ed073b9). With gravity minimized (thumb side, finger and wrist motions, both models) it was rendered and tracked while the side-on view rule (engine analysis-5, commit 6611209) was being chosen on training seeds, and read once after it was committed, at 30 frames a second and tracked at 10; the analysis-4 reading at 30 was written aside before the change and read after. Read a second time under analysis-6 (commit 78935f7: oblique and from-above frames keep their 3-D view), a revision prompted by the real photos, not by this seed; these tables are that second reading. Nothing is fitted on it." + REREAD_UNDER_ANALYSIS_7 + REREAD_UNDER_CORRECTION_9,
  20261221:
    "Rendered and tracked (against gravity, finger and wrist motions, both models) while the peak figures (clipPeakP90Deg from the clip reports' peak P90, one model and both together) were being committed; read once, after. Nothing is fitted on it." + REREAD_UNDER_ANALYSIS_7,
  20261218:
    "Rendered and tracked (against gravity, finger motions, both models) after the two-model peak rule was revised (vision/model-pair.ts, commit ccbbff1); read once with it (model-agreement.ts). Nothing is fitted on it.",
  20261217:
    "Rendered and tracked (finger motions, both conditions, both models) after the two-model reading's rule (vision/model-pair.ts) was committed; read once with it (model-agreement.ts). Nothing is fitted on it.",
  20261216:
    "Rendered and tracked (against gravity, finger motions) while the little-finger-side per-finger intervals (byDigit, from seeds 20261210, 20261209, 20261207 and 20261205) were being committed; read once, after. Nothing is fitted on it.",
  20261215:
    "Rendered and tracked while the per-finger intervals (derive-uncertainty.ts byDigit, from seeds 20261210 and 20261207) were being committed; read once, after. Its finger clips with gravity minimized were rendered and tracked again and re-read under engine analysis-6 (commit 78935f7, the side-on view rule, chosen on training seeds) for the two-model report; these tables are that reading. Nothing is fitted on it." + REREAD_UNDER_ANALYSIS_7,
  20261214:
    "Rendered and tracked after the one-finger handling (the therapist's `oneFinger`, the single-finger cells from report.md's stills) was committed; read once. Nothing is fitted on it.",
  20261210:
    "Never looked at before these figures were written: rendered and tracked while the picture-feature fit (kinarc-correction-6) was being chosen on training seeds 77000401-77000405, read only after it was committed to." + REREAD_UNDER_ANALYSIS_7 + REREAD_UNDER_CORRECTION_9,
  20261209:
    "Read first under kinarc-correction-5 (rendered and tracked while it was chosen on training seeds 77000401-77000403, read after it was committed to); its wrist figures since moved with the side-on thumb-offset rule (10 mm).",
  20261207: "Never looked at before these figures were written (rendered after the engine's depth mirror was settled)." + REREAD_UNDER_ANALYSIS_7 + REREAD_UNDER_CORRECTION_9,
  20261205:
    "Looked at while developing the depth mirror (vision/depth-mirror.ts): its first rule, which anchored a clip on its first frame, turned one MCP clip here over and was replaced by the anatomical rule. Nothing was fitted on it.",
};
export const CLIP_FPS = 30;
const CYCLES = 2;
const CYCLE_SECONDS = 2.5;
const REPORT_FILES: Record<Condition, string> = {
  against_gravity: path.join(__dirname, "clip-report.md"),
  gravity_minimized: path.join(__dirname, "clip-report-gravity-minimized.md"),
};
const CONDITION_WORDS: Record<Condition, string> = { against_gravity: "against gravity", gravity_minimized: "with gravity minimized" };
const HARNESS_PORT = Number(process.env.KINARC_ACCURACY_PORT ?? 4324);

export interface ClipMotion {
  motion: MotionId;
  label: string;
  /** Which of issue 8's bars (and which report row) the motion belongs to: wrist extension is read with wrist flexion. */
  bar: AcceptanceKey;
  /** Joints moved together, all through the same angles. */
  joints: readonly PoseKey[];
  /** How the engine's positive angle relates to the commanded angle (extension is negative wrist flexion). */
  sign: 1 | -1;
  /** The drawn end of range, commanded degrees. */
  toDeg: [number, number];
  digits: readonly (Digit | null)[];
  holdSeconds: number;
}

const fingerKeys = (joint: "mcpFlexionDeg" | "pipFlexionDeg" | "dipFlexionDeg") => FINGERS.map((finger) => `${finger}.${joint}` as PoseKey);

/** Ends of range within the rig's ranges and the motion catalog's normal values (lib/motions/catalog.ts). */
export const CLIP_MOTIONS: readonly ClipMotion[] = [
  { motion: "mcp.flexion", label: "MCP flexion", bar: "mcp.flexion", joints: fingerKeys("mcpFlexionDeg"), sign: 1, toDeg: [55, 90], digits: FINGERS, holdSeconds: 1 },
  { motion: "pip.flexion", label: "PIP flexion", bar: "pip.flexion", joints: fingerKeys("pipFlexionDeg"), sign: 1, toDeg: [60, 100], digits: FINGERS, holdSeconds: 1 },
  { motion: "dip.flexion", label: "DIP flexion", bar: "dip.flexion", joints: fingerKeys("dipFlexionDeg"), sign: 1, toDeg: [45, 80], digits: FINGERS, holdSeconds: 1 },
  { motion: "wrist.flexion", label: "wrist flexion", bar: "wrist.flexion", joints: ["wrist.flexionDeg"], sign: 1, toDeg: [45, 80], digits: [null], holdSeconds: 3 },
  { motion: "wrist.extension", label: "wrist extension", bar: "wrist.flexion", joints: ["wrist.flexionDeg"], sign: -1, toDeg: [-70, -40], digits: [null], holdSeconds: 3 },
];

export interface ClipPlan {
  name: string;
  motion: ClipMotion;
  side: HandSide;
  view: CameraView;
  condition: Condition;
  seed: number;
  toDeg: number;
  distanceM: number;
  /** One finger bends, the others stay straight (`--one-finger`): read as the app reads a finger tested on its own. */
  oneFinger?: boolean;
  /** A hand built unlike the mesh (`--proportions varied`): drawn per clip, rendered by `proportionedRig`. */
  proportions?: HandProportions;
  /** The clip opens with the hand turned this far palm-first toward the camera, turning back over `TURN_IN_SECONDS` (`--turn-in`). */
  turnInDeg?: number;
  /** Each finger's DIP bends along with its PIP at this ratio (`--dip-follows`; PIP flexion clips only). */
  dipFollows?: number;
}

/** How long a `--turn-in` clip takes to turn back to its view, seconds. */
export const TURN_IN_SECONDS = 1.5;

/**
 * `--turn-in DEG`: the same clips, each opening with the hand turned DEG palm-first toward the camera and turning back
 * before the still start, as a client might show the palm for a moment so the tracker finds the hand (named
 * `<prefix>-turnDEG-<seed>-...`). Finger motions only: a wrist clip's still start is its straight-wrist reading.
 */
export function withTurnIn(plans: readonly ClipPlan[], seed: number, turnInDeg: number): ClipPlan[] {
  if (!(Number.isInteger(turnInDeg) && turnInDeg > 0 && turnInDeg <= 90)) throw new Error(`--turn-in: expected whole degrees from 1 to 90; got '${turnInDeg}'`);
  const wrist = plans.find((plan) => plan.motion.digits[0] === null);
  if (wrist) throw new Error(`--turn-in: expected finger motions only (a wrist clip's still start is its straight-wrist reading); got ${wrist.motion.motion}`);
  return plans.map((plan) => ({ ...plan, name: plan.name.replace(`-${seed}-`, `-turn${turnInDeg}-${seed}-`), turnInDeg }));
}

/**
 * `--dip-follows R`: PIP flexion clips in which each finger's DIP bends along with its PIP, R times as far (named
 * `<prefix>-dipR*100-<seed>-...`), as most people's fingers do in active PIP flexion [common practice: the DIP is hard
 * to keep straight while the PIP bends]; the test motions the reports show bend the PIP alone. The PIP is scored
 * against its own commanded angle.
 */
export function withDipFollowing(plans: readonly ClipPlan[], seed: number, ratio: number): ClipPlan[] {
  if (!(Number.isFinite(ratio) && ratio > 0 && ratio <= 1.5)) throw new Error(`--dip-follows: expected a ratio above 0 and at most 1.5; got '${ratio}'`);
  const other = plans.find((plan) => plan.motion.motion !== "pip.flexion");
  if (other) throw new Error(`--dip-follows: expected PIP flexion clips only (--motions pip.flexion); got ${other.motion.motion}`);
  return plans.map((plan) => ({ ...plan, name: plan.name.replace(`-${seed}-`, `-dip${Math.round(ratio * 100)}-${seed}-`), dipFollows: ratio }));
}

/** `--proportions`: the mesh's own hand (every report so far) or, per clip, a hand drawn by `sampleProportions`. */
export type ProportionsMode = "mesh" | "varied";

export function parseProportions(raw: string | undefined): ProportionsMode {
  if (raw === undefined || raw === "mesh") return "mesh";
  if (raw !== "varied") throw new Error(`--proportions: expected mesh or varied; got '${raw}'`);
  return raw;
}

/** Camera distances of the held-out clips, metres. */
export const CLIP_DISTANCE_M: readonly [number, number] = [0.3, 0.7];
/**
 * `--framing setup`: distances where a hand usually spans the set-up check's thumb-side band (vision/view-policy.ts
 * `FRAMING.thumbSideFingerSpan`, 0.4-0.6 of the picture's shorter side); ours, from the calibration clips (seeds
 * 77000407-77000408), where a hand spanned about 0.6 at 0.4 m and 0.4 at 0.6 m. The band itself then decides
 * (`setupAccepts`), so the draw only needs to cover it.
 */
export const SETUP_FRAMING_DISTANCE_M: readonly [number, number] = [0.38, 0.62];

/**
 * `setup`: clips drawn at `SETUP_FRAMING_DISTANCE_M` (named `<motion>[-gm]-setup-...`, apart from the others) and kept
 * only where the set-up check accepts their first frame; `filter`: the usual clips, kept only where it accepts theirs.
 */
export type Framing = "setup" | "filter";

export function parseFraming(raw: string | undefined): Framing | null {
  if (raw === undefined) return null;
  if (raw !== "setup" && raw !== "filter") throw new Error(`--framing: expected setup or filter; got '${raw}'`);
  return raw;
}

/** The hand's span in a clip's first frame as the set-up check measures it (vision/view-policy.ts handSpan, as the set-up check), from the truth's landmarks. */
export function firstFrameSpan(truth: ClipTruthFile): number {
  const image = truth.frames[0].truth.landmarksImagePx.map(([x, y]) => [x / IMAGE_WIDTH_PX, y / IMAGE_HEIGHT_PX, 0] as LandmarkXYZ);
  return handSpan(image, IMAGE_WIDTH_PX, IMAGE_HEIGHT_PX);
}

/**
 * Whether the app's set-up check would let this clip's attempt start as far as the hand's size goes: its first frame
 * (the still start, fingers straight) spans the band the check asks for the motion, test position and digit. A live
 * attempt cannot start outside it; an upload can, and these figures do not cover it.
 */
export function setupAccepts(plan: Pick<ClipPlan, "motion" | "condition">, truth: ClipTruthFile): boolean {
  const band = handSpanBand(plan.motion.motion, plan.condition, plan.motion.digits[0]);
  const span = firstFrameSpan(truth);
  return span >= band.min && span <= band.max;
}

/** The clips of one seed: for each motion, `count` clips alternating right and left hands, each drawn from its own seed. */
/** Clip seeds per motion drawn up front, so a plan with more clips keeps the clips of a smaller one. */
const SEEDS_PER_MOTION = 100;

/**
 * `view` replaces the recommended view (e.g. the palm or the back toward the camera, for the whole-hand-shape
 * estimators); such clips are named `<motion>-<view>-<seed>-<i>-<clipSeed>`, apart from the recommended-view ones.
 */
export function planClips(
  seed: number,
  count: number,
  condition: Condition = "against_gravity",
  motions?: readonly MotionId[],
  viewOverride?: CameraView,
  oneFinger = false,
  framing: Framing | null = null,
  aloneDigits: readonly Digit[] = FINGERS,
  proportionsMode: ProportionsMode = "mesh",
): ClipPlan[] {
  const bad = aloneDigits.find((digit) => !FINGERS.includes(digit as (typeof FINGERS)[number]));
  if (bad !== undefined || aloneDigits.length === 0) throw new Error(`--digits: expected some of ${FINGERS.join(", ")}; got '${bad ?? ""}'`);
  // Every finger in turn keeps the first names; a chosen few are named for them, so their renders never share a name.
  const digitsTag = aloneDigits.length === FINGERS.length && aloneDigits.every((d, i) => d === FINGERS[i]) ? "" : `-${aloneDigits.join("+")}`;
  if (count > SEEDS_PER_MOTION) throw new Error(`--clips: expected at most ${SEEDS_PER_MOTION}; got ${count}`);
  const unknown = motions?.filter((motion) => !CLIP_MOTIONS.some((m) => m.motion === motion)) ?? [];
  if (unknown.length) throw new Error(`--motions: expected some of ${CLIP_MOTIONS.map((m) => m.motion).join(", ")}; got ${unknown.join(", ")}`);
  // Render seeds from the set's own generator (as scene.ts frameSeeds): neighbouring seeds start xoroshiro128+ alike.
  const seeds = frameSeeds(seed, CLIP_MOTIONS.length * SEEDS_PER_MOTION);
  return CLIP_MOTIONS.flatMap((allFingers, m) =>
    Array.from({ length: count }, (_, i) => {
      const motion = oneFinger ? aloneMotion(allFingers, aloneDigits[i % aloneDigits.length]) : allFingers;
      const clipSeed = seeds[m * SEEDS_PER_MOTION + i];
      const draws = makeRng(clipSeed ^ 0x2545f491);
      // The first number of a freshly seeded generator depends little on small seeds; it is not used.
      uniformFloat64(draws);
      const toDeg = motion.toDeg[0] + (motion.toDeg[1] - motion.toDeg[0]) * uniformFloat64(draws);
      const [near, far] = framing === "setup" ? SETUP_FRAMING_DISTANCE_M : CLIP_DISTANCE_M;
      const distanceM = near + (far - near) * uniformFloat64(draws);
      const view = viewOverride ?? (viewPolicy(motion.motion, condition, motion.digits[0]).recommended[0] as CameraView);
      const side: HandSide = i % 2 === 0 ? "right" : "left";
      // Against gravity keeps its first names (and cached renders); the other condition's clips are named apart.
      const base = viewOverride ? `${motion.motion}-${viewOverride}` : condition === "against_gravity" ? motion.motion : `${motion.motion}-gm`;
      const prefix = `${base}${oneFinger ? `-alone${digitsTag}` : ""}${framing === "setup" ? "-setup" : ""}${proportionsMode === "varied" ? "-varied" : ""}`;
      const name = `${prefix}-${seed}-${i}-${clipSeed}`;
      // From a generator of its own, so the mesh's clips keep every draw they had.
      const proportions = proportionsMode === "varied" ? sampleProportions(makeRng(clipSeed ^ 0x5bd1e995)) : undefined;
      return {
        name, motion, side, view, condition, seed: clipSeed, toDeg, distanceM,
        ...(oneFinger ? { oneFinger: true } : {}),
        ...(proportions ? { proportions } : {}),
      };
    }),
  ).filter((plan) => (!motions || motions.includes(plan.motion.motion)) && (!oneFinger || plan.motion.digits[0] !== null));
}

/**
 * `--one-finger`: the finger motion with only `digit` moving, its neighbours straight (the way a therapist isolates
 * one finger), scored for that finger alone. Named `<motion>-alone-...`, apart from the four-finger clips.
 */
export function aloneMotion(motion: ClipMotion, digit: Digit): ClipMotion {
  if (motion.digits[0] === null) return motion;
  return { ...motion, joints: motion.joints.filter((joint) => joint.startsWith(`${digit}.`)), digits: [digit] };
}

export interface ClipTruthFile {
  frameCount: number;
  frames: { index: number; timeMs: number; truth: FrameTruth }[];
}

/** The hand a plan is rendered with: the mesh's, or rebuilt to the plan's proportions. */
export function planRig(plan: ClipPlan): HandRig {
  return plan.proportions ? proportionedRig(loadHandRig(plan.side), plan.proportions) : loadHandRig(plan.side);
}

/** The sweep a plan renders: a still start, then `cycles` (the reports' 2) from rest to its end of range and back. */
export function planSweep(plan: ClipPlan, cycles = CYCLES): SweepOptions {
  return {
    joints: plan.motion.joints,
    fromDeg: 0,
    toDeg: plan.toDeg,
    cycles,
    cycleSeconds: CYCLE_SECONDS,
    fps: CLIP_FPS,
    view: plan.view,
    side: plan.side,
    seed: plan.seed,
    distanceM: plan.distanceM,
    holdSeconds: plan.motion.holdSeconds,
    ...(plan.turnInDeg ? { turnInDeg: plan.turnInDeg, turnInSeconds: TURN_IN_SECONDS } : {}),
    ...(plan.dipFollows ? { followers: { joints: fingerKeys("dipFlexionDeg"), ratio: plan.dipFollows } } : {}),
  };
}

async function renderClips(plans: readonly ClipPlan[], folder: string, reuse: boolean): Promise<void> {
  const todo = plans.filter((plan) => !(reuse && existsSync(path.join(folder, `${plan.name}.webm`)) && existsSync(path.join(folder, `${plan.name}.json`))));
  if (!todo.length) return;
  const renderer = await HandRenderer.start();
  try {
    for (const plan of todo) {
      await renderSweepClip(renderer, planRig(plan), planSweep(plan), folder, plan.name);
      process.stderr.write(`rendered ${plan.name}\n`);
    }
  } finally {
    await renderer.close();
  }
}

/**
 * A copy of a rendered clip with fresh grain in every frame (ffmpeg's noise filter, temporal and uniform, seeded):
 * a render's still stretch is the same picture frame after frame, where a camera's never is, so a palm detection
 * that fails once fails for the whole stretch. An experiment (`--sensor-noise`); the reports use the clean renders.
 */
function addSensorNoise(from: string, to: string, strength: number, seed: number): Promise<void> {
  const filter = `noise=all_seed=${seed % 2_147_483_647}:alls=${strength}:allf=t+u`;
  return runFfmpeg(["-i", from, "-vf", filter, "-c:v", "libvpx", "-b:v", "2M", to]);
}

/** A clip's saved tracking; tracking saved before frames carried the picture's aspect gets the renders' own size. */
export function readSavedTracking(file: string): TrackedFrame[] {
  return (JSON.parse(readFileSync(file, "utf8")) as TrackedFrame[]).map((frame) => (frame.imageAspect ? frame : { ...frame, imageAspect: IMAGE_WIDTH_PX / IMAGE_HEIGHT_PX }));
}

/**
 * Which of a clip's frames a camera at `fps` would have given, from a clip at `clipFps`: frame i is kept where
 * floor(i × fps / clipFps) steps up, so 20 of 30 keeps two frames in three, evenly spread. Every frame at or above the clip's rate.
 */
export function framesAtRate(count: number, fps: number, clipFps: number): number[] {
  if (!(fps > 0)) throw new Error(`fps: expected a positive number, got ${fps}`);
  const ratio = Math.min(1, fps / clipFps);
  const kept: number[] = [];
  for (let i = 0; i < count; i++) if (Math.floor(i * ratio) !== Math.floor((i - 1) * ratio)) kept.push(i);
  return kept;
}

/**
 * The clip's truth at the times of frames tracked at a lower rate (`--track-fps`): for each tracked frame the truth
 * frame at the same time (within a millisecond). The stepper stops before the clip's last frame when that falls between
 * its steps, so the count follows the tracked frames, not framesAtRate.
 */
export function truthAtTimes(truth: ClipTruthFile, frames: readonly Pick<TrackedFrame, "t">[]): ClipTruthFile {
  const at = frames.map((frame) => {
    const i = Math.round(frame.t / (1000 / CLIP_FPS));
    const match = truth.frames[i];
    if (!match || Math.abs(match.timeMs - frame.t) > 1) throw new Error(`no truth frame at ${frame.t.toFixed(1)} ms (the clip has ${truth.frameCount} frames)`);
    return match;
  });
  return { ...truth, frameCount: at.length, frames: at };
}

/** Saved tracking's file suffix for a clip tracked at `fps` frames a second instead of its own (`--track-fps`). */
export function trackedRateSuffix(fps: number | null): string {
  return fps === null ? "" : `-f${fps}`;
}

/** "second", "third", ... for the frame step of `--track-fps`. */
export function ordinalStep(step: number): string {
  const words = ["", "", "second", "third", "fourth", "fifth", "sixth"];
  return words[step] ?? `${step}th`;
}

/** `--track-fps 15`: a whole divisor of the clips' own rate below it, so the tracker sees evenly spaced frames. */
export function parseTrackFps(raw: string | undefined): number | null {
  if (raw === undefined) return null;
  const value = Number(raw);
  if (raw.trim() === "" || !Number.isInteger(value) || value < 1 || value >= CLIP_FPS || CLIP_FPS % value !== 0) {
    throw new Error(`--track-fps: expected a whole divisor of ${CLIP_FPS} below it (15, 10, 6, 5, 3, 2 or 1); got '${raw}'`);
  }
  return value;
}

async function trackClips(
  plans: readonly ClipPlan[],
  folder: string,
  model: HandModelVariant,
  reuse: boolean,
  minConfidence?: number,
  sensorNoise?: number,
  trackFps: number | null = null,
): Promise<Map<string, TrackedFrame[]>> {
  const tracked = new Map<string, TrackedFrame[]>();
  // Tracking with other confidence floors than the library's, of noisier copies, or at a lower rate is kept apart.
  const floors = minConfidence === undefined ? "" : `-c${Math.round(minConfidence * 100)}`;
  const noise = sensorNoise === undefined ? "" : `-n${sensorNoise}`;
  const savedOf = (plan: ClipPlan) => path.join(folder, `${plan.name}-${model}${floors}${noise}${trackedRateSuffix(trackFps)}.tracked.json`);
  const clipOf = (plan: ClipPlan) => path.join(folder, `${plan.name}${noise}.webm`);
  for (const plan of plans) if (reuse && existsSync(savedOf(plan))) tracked.set(plan.name, readSavedTracking(savedOf(plan)));
  const todo = plans.filter((plan) => !tracked.has(plan.name));
  if (!todo.length) return tracked;
  if (sensorNoise !== undefined) {
    for (const plan of todo) if (!existsSync(clipOf(plan))) await addSensorNoise(path.join(folder, `${plan.name}.webm`), clipOf(plan), sensorNoise, plan.seed);
  }
  let server: HarnessServer | null = null;
  let browser: Browser | null = null;
  try {
    server = await startHarnessServer({ port: HARNESS_PORT, allowDirs: [folder] });
    browser = await launchChromium();
    for (const plan of todo) {
      const page = await openHarnessPage(browser, server, {
        clip: server.fileUrl(clipOf(plan)),
        step: true,
        fps: trackFps ?? CLIP_FPS,
        model,
        minConfidence,
      });
      const state = await waitForFrames(page, Number.MAX_SAFE_INTEGER, 15 * 60_000);
      await page.close();
      writeFileSync(savedOf(plan), JSON.stringify(state.frames));
      tracked.set(plan.name, state.frames);
      process.stderr.write(`tracked ${plan.name} (${model})\n`);
    }
  } finally {
    await browser?.close();
    await server?.close();
  }
  return tracked;
}

/**
 * How the engine reads: as shipped; without the depth mirror (vision/depth-mirror.ts), to show what it changes; raw
 * (no correction, no depth mirror), the landmarks' own angles.
 */
export const CLIP_VARIANTS = ["engine", "without depth mirror", "raw"] as const;
export type ClipVariant = (typeof CLIP_VARIANTS)[number];

export interface ClipReading {
  plan: ClipPlan;
  variant: ClipVariant;
  model: HandModelVariant;
  digit: Digit | null;
  samples: ErrorSample[];
  /** Per frame, the engine's stated 90% half-width (null where it gave no angle). */
  uncertaintiesDeg: (number | null)[];
  truthPeakDeg: number;
  peakDeg: number | null;
  /** The engine's stated 90% half-width of the peak (null where it gave none). */
  peakUncertaintyDeg: number | null;
  reps: number;
  neutralUsed: boolean | null;
  forearmSource: string | null;
  method: string;
}

/** The engine's reading of one clip for one finger (or the wrist), frame by frame against the truth. */
export function readClip(
  plan: ClipPlan,
  model: HandModelVariant,
  digit: Digit | null,
  frames: readonly TrackedFrame[],
  truth: ClipTruthFile,
  variant: ClipVariant = "engine",
): ClipReading {
  if (frames.length !== truth.frameCount) throw new Error(`${plan.name} (${model}): tracked ${frames.length} frames, the clip has ${truth.frameCount}`);
  const target = { motion: plan.motion.motion, side: plan.side, digit, condition: plan.condition };
  const key = digit ? (plan.motion.joints.find((joint) => joint.startsWith(`${digit}.`)) as PoseKey) : plan.motion.joints[0];
  const truthDeg = truth.frames.map((frame) => plan.motion.sign * getPoseAngle(frame.truth.commandedDeg, key));
  let built;
  try {
    built = clipCapture(target, frames, plan.name);
  } catch (error) {
    // The tracker never found the hand: every frame of the reading counts as undetected.
    if (!(error instanceof ClipCaptureError)) throw error;
    return {
      plan,
      variant,
      model,
      digit,
      samples: truthDeg.map((value) => ({ truthDeg: value, estimateDeg: null })),
      uncertaintiesDeg: truthDeg.map(() => null),
      truthPeakDeg: Math.max(...truthDeg),
      peakDeg: null,
      peakUncertaintyDeg: null,
      reps: 0,
      neutralUsed: plan.motion.bar === "wrist.flexion" ? false : null,
      forearmSource: null,
      method: "none",
    };
  }
  const angles: (number | null)[] = [];
  const uncertainties: (number | null)[] = [];
  const analysis = analyzeCapture(plan.oneFinger ? { ...built.capture, oneFinger: true } : built.capture, {
    handModel: model,
    correction: variant === "raw" ? "off" : "auto",
    depthMirror: variant === "engine",
    onUpdate: (update) => {
      angles.push(update.angleDeg);
      uncertainties.push(update.uncertaintyDeg);
    },
  });
  return {
    plan,
    variant,
    model,
    digit,
    samples: truthDeg.map((value, i) => ({ truthDeg: value, estimateDeg: angles[i] ?? null })),
    uncertaintiesDeg: truthDeg.map((_, i) => uncertainties[i] ?? null),
    truthPeakDeg: Math.max(...truthDeg),
    peakDeg: analysis.peakDeg,
    peakUncertaintyDeg: analysis.uncertaintyDeg,
    reps: analysis.reps,
    neutralUsed: plan.motion.bar === "wrist.flexion" ? analysis.neutral !== null : null,
    forearmSource: analysis.forearmSource,
    method: analysis.method,
  };
}

/** One reading's line for `--per-clip`: where a group's error comes from. */
function perClipLine(r: ClipReading): string {
  const s = summarizeErrors(r.samples);
  return `| ${r.plan.name} | ${r.model} | ${r.plan.side} | ${r.digit ?? "-"} | ${r.plan.toDeg.toFixed(0)} | ${r.truthPeakDeg.toFixed(1)} | ${fmt(r.peakDeg)} | ${fmt(s.meanAbsoluteErrorDeg)} | ${fmt(s.biasDeg)} | ${r.reps} | ${r.forearmSource ?? "-"} | ${r.method} |`;
}

export interface ClipRow {
  label: string;
  variant: ClipVariant;
  bar: AcceptanceKey;
  view: CameraView;
  model: HandModelVariant;
  readings: number;
  frames: ErrorSummary;
  peakMaeDeg: number | null;
  peakWorstDeg: number | null;
  /**
   * 90% of the readings' peaks lie within this of the truth's end of range (nearest rank; readings read against how the
   * hand was first seen, forearm line capture-start, are left out: they carry their own pooled figure). Null with none.
   */
  peakP90Deg: number | null;
  /** The same for every detected frame of those readings (frameErrorP90): the half-width that held 90% of frames. */
  framesP90Deg: number | null;
  repsRight: number;
  neutralUsed: string;
  /** Share of detected frames whose error lies within the engine's stated 90% interval (null with none). */
  withinStated: number | null;
  /** Share of readings with a peak whose peak error lies within the peak's stated interval (null with none). */
  peakWithinStated: number | null;
}

export function summarizeClipReadings(readings: readonly ClipReading[]): Omit<ClipRow, "label" | "variant" | "bar" | "view" | "model"> {
  const peaks = readings.filter((r) => r.peakDeg !== null).map((r) => r.peakDeg! - r.truthPeakDeg);
  const wrist = readings.filter((r) => r.neutralUsed !== null);
  return {
    readings: readings.length,
    frames: summarizeErrors(readings.flatMap((r) => r.samples)),
    peakMaeDeg: peaks.length ? peaks.reduce((a, e) => a + Math.abs(e), 0) / peaks.length : null,
    peakWorstDeg: peaks.length ? peaks.reduce((worst, e) => (Math.abs(e) > Math.abs(worst) ? e : worst), 0) : null,
    peakP90Deg: peakErrorP90(readings),
    framesP90Deg: frameErrorP90(readings),
    repsRight: readings.filter((r) => r.reps === CYCLES).length,
    neutralUsed: wrist.length ? `${wrist.filter((r) => r.neutralUsed).length}/${wrist.length}` : "-",
    withinStated: statedCoverage(readings),
    peakWithinStated: peakCoverage(readings),
  };
}

/**
 * The 90th percentile (nearest rank) of the readings' absolute peak errors: the half-width that held 90% of peaks, the
 * figure derive-uncertainty.ts gives a cell's peak. Readings read against capture start are left out (see ClipRow).
 */
export function peakErrorP90(readings: readonly (Pick<ClipReading, "peakDeg" | "truthPeakDeg"> & { forearmSource?: string | null })[]): number | null {
  const errors = readings.filter((r) => r.peakDeg !== null && r.forearmSource !== "capture-start").map((r) => Math.abs(r.peakDeg! - r.truthPeakDeg));
  return nearestRankPercentile(errors, 0.9);
}

/**
 * The 90th percentile (nearest rank) of the absolute errors of every detected frame, readings read against capture
 * start left out as for the peak: derive-uncertainty.ts keeps a cell's interval at least this wide, where errors have
 * heavier tails than the normal rule (2.06 × MAE) assumes.
 */
export function frameErrorP90(readings: readonly (Pick<ClipReading, "samples"> & { forearmSource?: string | null })[]): number | null {
  const errors: number[] = [];
  for (const r of readings) {
    if (r.forearmSource === "capture-start") continue;
    for (const s of r.samples) if (s.estimateDeg !== null) errors.push(Math.abs(s.estimateDeg - s.truthDeg));
  }
  return nearestRankPercentile(errors, 0.9);
}

/**
 * How often the stated interval holds for the peak, the figure a grade rests on: the share of readings with a peak
 * whose error lies inside the interval stated for it (a reading without a stated interval counts as outside).
 */
export function peakCoverage(readings: readonly Pick<ClipReading, "peakDeg" | "truthPeakDeg" | "peakUncertaintyDeg">[]): number | null {
  const peaked = readings.filter((r) => r.peakDeg !== null);
  if (!peaked.length) return null;
  return peaked.filter((r) => r.peakUncertaintyDeg !== null && Math.abs(r.peakDeg! - r.truthPeakDeg) <= r.peakUncertaintyDeg).length / peaked.length;
}

/**
 * How often the stated uncertainty holds: the share of detected frames (with a stated interval) whose error is within
 * it. The engine states a 90% interval, so about 0.9 is honest, well below is overconfident, near 1 is cautious.
 */
export function statedCoverage(readings: readonly Pick<ClipReading, "samples" | "uncertaintiesDeg">[]): number | null {
  let frames = 0;
  let within = 0;
  for (const r of readings) {
    r.samples.forEach((sample, i) => {
      const stated = r.uncertaintiesDeg[i];
      if (sample.estimateDeg === null || stated === null || stated === undefined) return;
      frames += 1;
      if (Math.abs(sample.estimateDeg - sample.truthDeg) <= stated) within += 1;
    });
  }
  return frames ? within / frames : null;
}

const fmt = (value: number | null, digits = 1) => (value === null ? "-" : value.toFixed(digits));
const pct = (value: number | null) => (value === null ? "-" : `${Math.round(value * 100)}%`);

function verdict(row: Pick<ClipRow, "bar" | "frames">): string {
  const target = ACCEPTANCE[row.bar];
  const { meanAbsoluteErrorDeg: mae, slope, detectionRate } = row.frames;
  const parts = [`MAE ${fmt(mae, 2)} of at most ${target.maxMaeDeg}`];
  parts.push(target.slope ? `slope ${fmt(slope, 2)} in ${target.slope[0]}-${target.slope[1]}` : `slope ${fmt(slope, 2)}`);
  parts.push(`detected ${pct(detectionRate)} of at least ${MIN_DETECTION * 100}%`);
  return `${meetsAcceptance(row.frames, target) ? "meets" : "misses"} (${parts.join(", ")})`;
}

/** Wrist readings the engine read against how the hand was first seen (no straight-wrist reading), per model. */
export interface WithoutStraightWristRow {
  model: HandModelVariant;
  readings: number;
  frames: ErrorSummary;
  peakMaeDeg: number | null;
  clips: string[];
}

export function withoutStraightWristRows(readings: readonly ClipReading[]): WithoutStraightWristRow[] {
  const models = [...new Set(readings.map((r) => r.model))];
  return models.map((model) => {
    const mine = readings.filter((r) => r.model === model);
    const summary = summarizeClipReadings(mine);
    return { model, readings: mine.length, frames: summary.frames, peakMaeDeg: summary.peakMaeDeg, clips: mine.map((r) => r.plan.name) };
  });
}

/** The report's table header of those readings (scripts/accuracy/derive-uncertainty.ts finds the table by it). */
export const WITHOUT_STRAIGHT_WRIST_HEADER = "| forearm line | model | readings | frames | detected | bias ° | MAE ° | peak MAE ° | clips |";

/** One finger's engine readings of a finger motion in one view and model: where a group's error comes from. */
export interface FingerRow {
  label: string;
  view: CameraView;
  model: HandModelVariant;
  digit: Digit;
  summary: Omit<ClipRow, "label" | "variant" | "bar" | "view" | "model">;
}

/** The engine's readings of finger motions split by finger, in the order of `FINGERS`. */
export function fingerRows(label: string, view: CameraView, model: HandModelVariant, readings: readonly ClipReading[]): FingerRow[] {
  return FINGERS.flatMap((digit) => {
    const mine = readings.filter((r) => r.variant === "engine" && r.digit === digit);
    return mine.length ? [{ label, view, model, digit, summary: summarizeClipReadings(mine) }] : [];
  });
}

/** The report's header of the per-finger table (derive-uncertainty.ts parseClipFingerRows finds it by its "finger" column). */
const BY_FINGER_HEADER = "| motion | view | model | finger | readings | detected | bias ° | MAE ° | slope | within 10° | peak MAE ° | frame P90 ° | within stated ± |";

export interface ClipSection {
  seed: number;
  clips: number;
  rows: readonly ClipRow[];
  /** The engine's finger readings split by finger (absent in reports written before it). */
  byFinger?: readonly FingerRow[];
  /** `--framing`: per motion, the clips drawn and those the set-up check accepts (`setupAccepts`), which alone are read. */
  framing?: readonly { label: string; drawn: number; kept: number }[];
}

export function clipReport(
  sections: readonly ClipSection[],
  meta: { glName: string; condition?: Condition; views?: readonly CameraView[]; withoutStraightWrist?: readonly WithoutStraightWristRow[]; oneFinger?: boolean; trackFps?: number | null; framing?: Framing | null; proportions?: ProportionsMode },
): string {
  const distances = meta.framing === "setup" ? SETUP_FRAMING_DISTANCE_M : CLIP_DISTANCE_M;
  const condition = meta.condition ?? "against_gravity";
  const where = meta.views
    ? `seen from ${meta.views.join(", ")} (views other than the recommended one, read by the whole-hand-shape estimators where they apply; issue 8's bars are set for the recommended view and are shown for reference)`
    : `in the view vision/view-policy.ts recommends ${CONDITION_WORDS[condition]}`;
  const title = meta.views
    ? `# Angle accuracy on held-out clips (continuous motion, seen from ${meta.views.join(", ")})`
    : condition === "against_gravity"
      ? "# Angle accuracy on held-out clips (continuous motion)"
      : `# Angle accuracy on held-out clips (continuous motion, ${CONDITION_WORDS[condition]})`;
  const fingers = meta.oneFinger
    ? "One finger moves in each clip (index, middle, ring and little in turn), the others straight, read as the app reads a finger tested on its own (capture `oneFinger`: the single-finger error); issue 8's bars are set for four fingers together and are shown for reference."
    : "Finger motions move all four fingers together; each finger is a reading.";
  const lines = [
    meta.oneFinger ? title.replace(/\)$/, ", one finger on its own)") : title,
    "",
    "Written by `npx tsx scripts/accuracy/clip-validation.ts` (see its header); do not edit by hand.",
    "",
    `- Held-out clips: per motion, half right hands and half left, each a still start ` +
      `(1 s; 3 s for the wrist, the straight-wrist reading), then ${CYCLES} cycles of ${CYCLE_SECONDS} s from rest to an end of range drawn from the seed and back, ${CLIP_FPS} fps, ` +
      `camera ${distances[0]}-${distances[1]} m, skin, light and background drawn from the seed, ${where}. ${fingers} Nothing is fitted on these seeds.`,
    ...(meta.framing
      ? [
          `- Framing (\`--framing ${meta.framing}\`): only clips whose first frame (the still start) the app's set-up check accepts for the hand's size are read (vision/view-policy.ts handSpanBand, which the set-up check holds a live attempt to: from the thumb side a finger's hand spans 0.4-0.6 of the picture's shorter side, a wrist's at most 0.6); a live attempt cannot start outside that band, an upload can. Each seed says how many of its clips were kept.`,
        ]
      : []),
    "- Path: the app's tracking code frame by frame (step mode, as analyze-clip and the upload review), the upload's capture builder, the engine's capture analysis as shipped (correction where it clearly helps, wrist read against the clip's straight-wrist reading, depth mirror on); `without depth mirror` and `raw` (no correction, no depth mirror) for comparison. Side-on wrist flexion/extension is read in the picture (vision/wrist-axis.ts) in every reading, raw included; the finger estimator reads each finger's picture points as well as its 3-D ones (vision/estimator.ts PICTURE_FEATURES).",
    "- Frames: every frame of every reading; detected = the engine reported an angle. Peak: the best repetition's peak against the truth's end of range. Repetitions: readings with exactly the clip's cycles. Within stated ±: the share of detected frames whose error lies inside the 90% interval the engine stated for that frame (vision/uncertainty.ts; about 90% is honest, far less is overconfident); peak within stated ±: the same for each reading's peak and the interval stated for it. Peak P90: 90% of the readings' peaks lie within this many degrees of the truth (nearest rank; readings read against how the hand was first seen are left out), the figure derive-uncertainty.ts gives the peak's interval; frame P90: the same over every detected frame, the least width derive-uncertainty.ts gives a frame's interval.",
    ...(meta.trackFps
      ? [
          `- Tracked at ${meta.trackFps} frames a second (\`--track-fps ${meta.trackFps}\`): the tracker stepped through every ${ordinalStep(CLIP_FPS / meta.trackFps)} frame of each clip, as a camera at that rate gives them, and each reading's truth is taken at those frames' times.`,
        ]
      : []),
    ...(meta.proportions === "varied"
      ? [
          `- Hands of varied build (\`--proportions varied\`): each clip's hand is the mesh rebuilt with proportions of its own (scripts/accuracy/scene.ts sampleProportions: palm and each digit ${PROPORTION_RANGES.palm[0]}-${PROPORTION_RANGES.palm[1]} of the mesh's length, each bone a further ${PROPORTION_RANGES.bone[0]}-${PROPORTION_RANGES.bone[1]}, girth ${PROPORTION_RANGES.girth[0]}-${PROPORTION_RANGES.girth[1]}; our own ranges), where the other reports show the mesh's one hand. The stated intervals come from that one hand.`,
        ]
      : []),
    `- Renderer: ${meta.glName}.`,
  ];
  for (const section of sections) {
    const rows = section.rows;
    lines.push(
      "",
      `## Seed ${section.seed} (${section.clips} clips per motion)`,
      "",
      SEED_NOTES[section.seed] ?? "Held out from every fit.",
      "",
      ...(section.framing ? [`Kept by the set-up check's framing: ${section.framing.map((f) => `${f.label} ${f.kept} of ${f.drawn}`).join(", ")}.`, ""] : []),
      meta.views
        ? "### Against issue 8's bars (for reference: not the recommended view)"
        : meta.oneFinger
          ? "### Against issue 8's bars (for reference: the bars are for four fingers together)"
          : "### Acceptance (issue 8: recommended view, after correction, every frame)",
      "",
      ...rows.filter((row) => row.variant === "engine").map((row) => `- ${row.label}, ${row.view}, ${row.model}: ${verdict(row)}`),
      "",
      "| motion | view | model | reading | readings | frames | detected | bias ° | MAE ° | slope | within 5° | within 10° | peak MAE ° | worst peak error ° | peak P90 ° | frame P90 ° | repetitions right | straight-wrist reading used | within stated ± | peak within stated ± |",
      "| --- | --- | --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |",
      ...rows.map(
        (row) =>
          `| ${row.label} | ${row.view} | ${row.model} | ${row.variant} | ${row.readings} | ${row.frames.samples} | ${pct(row.frames.detectionRate)} | ${fmt(row.frames.biasDeg)} | ${fmt(row.frames.meanAbsoluteErrorDeg, 2)} | ` +
          `${fmt(row.frames.slope, 2)} | ${pct(row.frames.within5)} | ${pct(row.frames.within10)} | ${fmt(row.peakMaeDeg)} | ${fmt(row.peakWorstDeg)} | ${fmt(row.peakP90Deg)} | ${fmt(row.framesP90Deg)} | ${row.repsRight}/${row.readings} | ${row.neutralUsed} | ${pct(row.withinStated)} | ${pct(row.peakWithinStated)} |`,
      ),
    );
    if (section.byFinger?.length) {
      lines.push(
        "",
        "### By finger (engine)",
        "",
        "The engine's finger readings above, split by finger: which fingers the view sees well and which it hides.",
        "",
        BY_FINGER_HEADER,
        "| --- | --- | --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |",
        ...section.byFinger.map(
          (row) =>
            `| ${row.label} | ${row.view} | ${row.model} | ${row.digit} | ${row.summary.readings} | ${pct(row.summary.frames.detectionRate)} | ${fmt(row.summary.frames.biasDeg)} | ` +
            `${fmt(row.summary.frames.meanAbsoluteErrorDeg, 2)} | ${fmt(row.summary.frames.slope, 2)} | ${pct(row.summary.frames.within10)} | ${fmt(row.summary.peakMaeDeg)} | ${fmt(row.summary.framesP90Deg)} | ${pct(row.summary.withinStated)} |`,
        ),
      );
    }
  }
  if (meta.withoutStraightWrist?.length) {
    lines.push(
      "",
      "## Wrist readings without a straight-wrist reading",
      "",
      "Engine readings above whose straight-wrist hold the tracker missed (no hand in it, or the hand first found when it was already moving), " +
        "so the wrist was read against how the hand was first seen (forearm line `capture-start`), pooled over the seeds of this report. " +
        "Their frame error sets the uncertainty of every wrist reading made that way (scripts/accuracy/derive-uncertainty.ts, vision/uncertainty.ts).",
      "",
      WITHOUT_STRAIGHT_WRIST_HEADER,
      "| --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | --- |",
      ...meta.withoutStraightWrist.map(
        (row) =>
          `| capture-start | ${row.model} | ${row.readings} | ${row.frames.samples} | ${pct(row.frames.detectionRate)} | ${fmt(row.frames.biasDeg)} | ${fmt(row.frames.meanAbsoluteErrorDeg, 2)} | ` +
          `${fmt(row.peakMaeDeg)} | ${row.clips.join(", ")} |`,
      ),
    );
  }
  lines.push("");
  return lines.join("\n");
}

/**
 * `--min-confidence 0.3`: track with other hand-landmarker confidence floors than the library's 0.5 (an experiment;
 * the tracking is saved apart, e.g. `-lite-c30.tracked.json`, and the shipped app keeps the library's floors).
 */
export function parseMinConfidence(raw: string | undefined): number | undefined {
  if (raw === undefined) return undefined;
  const value = Number(raw);
  if (raw.trim() === "" || !(value > 0 && value < 1)) throw new Error(`--min-confidence: expected a number between 0 and 1; got '${raw}'`);
  return value;
}

/** `--sensor-noise 6`: track grainy copies of the clips (addSensorNoise; ffmpeg's noise strength, 1-100). */
export function parseSensorNoise(raw: string | undefined): number | undefined {
  if (raw === undefined) return undefined;
  const value = Number(raw);
  if (raw.trim() === "" || !Number.isInteger(value) || value < 1 || value > 100) throw new Error(`--sensor-noise: expected a whole number from 1 to 100; got '${raw}'`);
  return value;
}

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: {
      clips: { type: "string" },
      seeds: { type: "string" },
      models: { type: "string" },
      reuse: { type: "boolean" },
      condition: { type: "string" },
      motions: { type: "string" },
      out: { type: "string" },
      "per-clip": { type: "boolean" },
      view: { type: "string" },
      "min-confidence": { type: "string" },
      "sensor-noise": { type: "string" },
      "one-finger": { type: "boolean" },
      "track-fps": { type: "string" },
      framing: { type: "string" },
      digits: { type: "string" },
      proportions: { type: "string" },
      "turn-in": { type: "string" },
      "dip-follows": { type: "string" },
    },
  });
  // --turn-in 30: every clip opens with the hand turned palm-first toward the camera and turning back, named `-turn30-`.
  const turnInDeg = values["turn-in"] === undefined ? null : Number(values["turn-in"]);
  if (turnInDeg !== null && !values.out) throw new Error("--turn-in: expected --out FILE (the committed reports open on the still start)");
  if (turnInDeg !== null && values.framing) throw new Error("--turn-in: expected no --framing (the set-up check's framing is read off the first frame, which a turn-in turns)");
  // --dip-follows 0.7: PIP flexion clips whose DIP bends along at that ratio, named `-dip70-`.
  const dipFollows = values["dip-follows"] === undefined ? null : Number(values["dip-follows"]);
  if (dipFollows !== null && !values.out) throw new Error("--dip-follows: expected --out FILE (the committed reports bend the PIP alone)");
  // --proportions varied: every clip's hand drawn unlike the mesh (palm, finger and bone lengths, girth), named `-varied-`.
  const proportionsMode = parseProportions(values.proportions);
  if (proportionsMode === "varied" && !values.out) throw new Error("--proportions: expected --out FILE (the committed reports show the mesh's own hand)");
  // --digits little: with --one-finger, only those fingers move (in turn), named `<motion>-alone-little-...`.
  const aloneDigits = values.digits ? (values.digits.split(",") as Digit[]) : undefined;
  if (aloneDigits && !values["one-finger"]) throw new Error("--digits: expected --one-finger too (four-finger clips move every finger)");
  const framing = parseFraming(values.framing);
  if (framing && !values.out) throw new Error("--framing: expected --out FILE (the committed reports read every clip)");
  const minConfidence = parseMinConfidence(values["min-confidence"]);
  // --track-fps 15: the tracker steps through every second frame, as a camera at 15 frames a second would give them.
  const trackFps = parseTrackFps(values["track-fps"]);
  if (trackFps !== null && !values.out) throw new Error("--track-fps: expected --out FILE (the committed reports are read at the clips' own rate)");
  const sensorNoise = parseSensorNoise(values["sensor-noise"]);
  // --view palm,back,down: the clips in those views instead of the recommended one (the whole-hand-shape views).
  const views = values.view ? (values.view.split(",") as CameraView[]) : undefined;
  const badView = views?.find((view) => !CAMERA_VIEWS.includes(view));
  if (badView !== undefined) throw new Error(`--view: expected some of ${CAMERA_VIEWS.join(", ")}; got '${badView}'`);
  const motions = values.motions ? (values.motions.split(",") as MotionId[]) : undefined;
  const perClip: string[] = [];
  const withoutStraight: ClipReading[] = [];
  const condition = (values.condition ?? "against_gravity") as Condition;
  if (!(condition in REPORT_FILES)) throw new Error(`--condition: expected against_gravity or gravity_minimized; got '${values.condition}'`);
  const clips = parseCount("clips", values.clips, 10);
  const seeds = values.seeds ? values.seeds.split(",").map((raw) => parseCount("seeds", raw, 0)) : [...CLIP_VALIDATION_SEEDS];
  const models = parseModels(values.models);
  const reuse = values.reuse ?? false;
  if (values["one-finger"] && !values.out) throw new Error("--one-finger: expected --out FILE (the held-out reports hold four-finger clips only)");
  const sections: ClipSection[] = [];
  for (const seed of seeds) {
    const folder = path.join(RENDER_OUTPUT_ROOT, "clip-validation", String(seed));
    mkdirSync(folder, { recursive: true });
    const oneFinger = values["one-finger"] ?? false;
    const planned = views
      ? views.flatMap((view) => planClips(seed, clips, condition, motions, view, oneFinger, framing, aloneDigits, proportionsMode))
      : planClips(seed, clips, condition, motions, undefined, oneFinger, framing, aloneDigits, proportionsMode);
    const turned = turnInDeg === null ? planned : withTurnIn(planned, seed, turnInDeg);
    const drawn = dipFollows === null ? turned : withDipFollowing(turned, seed, dipFollows);
    await renderClips(drawn, folder, reuse);
    const plans = framing ? drawn.filter((plan) => setupAccepts(plan, JSON.parse(readFileSync(path.join(folder, `${plan.name}.json`), "utf8")) as ClipTruthFile)) : drawn;
    const framingCounts = framing
      ? [...new Set(drawn.map((plan) => plan.motion.label))].map((label) => ({
          label,
          drawn: drawn.filter((plan) => plan.motion.label === label).length,
          kept: plans.filter((plan) => plan.motion.label === label).length,
        }))
      : undefined;
    const rows: ClipRow[] = [];
    const byFinger: FingerRow[] = [];
    for (const model of models) {
      const tracked = await trackClips(plans, folder, model, reuse, minConfidence, sensorNoise, trackFps);
      for (const group of ["mcp.flexion", "pip.flexion", "dip.flexion", "wrist.flexion"] as const) {
        for (const view of [...new Set(plans.map((plan) => plan.view))]) {
          const groupPlans = plans.filter((plan) => plan.motion.bar === group && plan.view === view);
          if (!groupPlans.length) continue;
          const label = group === "wrist.flexion" ? "wrist flexion (+) / extension (-)" : groupPlans[0].motion.label;
          for (const variant of CLIP_VARIANTS) {
            const readings = groupPlans.flatMap((plan) => {
              const whole = JSON.parse(readFileSync(path.join(folder, `${plan.name}.json`), "utf8")) as ClipTruthFile;
              const truth = trackFps === null ? whole : truthAtTimes(whole, tracked.get(plan.name)!);
              return plan.motion.digits.map((digit) => readClip(plan, model, digit, tracked.get(plan.name)!, truth, variant));
            });
            if (values["per-clip"] && variant === "engine") perClip.push(...readings.map(perClipLine));
            if (variant === "engine") withoutStraight.push(...readings.filter((r) => r.forearmSource === "capture-start"));
            if (variant === "engine" && group !== "wrist.flexion") byFinger.push(...fingerRows(label, view, model, readings));
            rows.push({ label, variant, bar: group, view, model, ...summarizeClipReadings(readings) });
          }
        }
      }
    }
    sections.push({ seed, clips, rows, byFinger, ...(framingCounts ? { framing: framingCounts } : {}) });
  }
  const renderer = await HandRenderer.start();
  const glName = await renderer.glRenderer();
  await renderer.close();
  const text = clipReport(sections, { glName, condition, views, withoutStraightWrist: withoutStraightWristRows(withoutStraight), oneFinger: values["one-finger"] ?? false, trackFps, framing, proportions: proportionsMode });
  writeFileSync(values.out ?? REPORT_FILES[condition], text);
  process.stdout.write(text);
  if (perClip.length) process.stdout.write(["", "| clip | model | side | digit | to ° | truth peak ° | peak ° | frame MAE ° | bias ° | reps | forearm | method |", ...perClip, ""].join("\n"));
}

// Run only as the entry point: other scripts import readClip and planClips without starting a render.
if (!process.env.VITEST && path.resolve(process.argv[1] ?? "") === path.resolve(__filename)) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? (error.stack ?? error.message) : error);
    process.exitCode = 1;
  });
}
