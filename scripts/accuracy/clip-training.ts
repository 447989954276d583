/**
 * Training samples for the finger estimator from rendered clips: continuous motions tracked the way the app tracks a
 * client (the tracker follows the hand from frame to frame), where the still sets make it find the hand afresh in
 * every picture. Clips of training seeds only (77 000 000 and up), rendered and tracked by clip-validation.ts
 * (`--seeds 77000401 --motions mcp.flexion,pip.flexion,dip.flexion`), read from its cache folder.
 *
 * Each tracked frame is read through the engine's depth mirror (vision/depth-mirror.ts), as the pipeline reads it, and
 * gives one sample per finger, its truth the commanded angles of that frame. Every `everyNth` frame is kept: neighbouring
 * frames of a clip are nearly the same picture.
 */
import { existsSync, readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import type { Side } from "@/lib/motions/catalog";
import { handAxes, type HandAxes } from "@/vision/angles";
import { PalmContinuity } from "@/vision/depth-mirror";
import { ESTIMATOR_FINGERS, FINGER_JOINTS, modelFingerFeatures, type FingerJoint, type FingerPicture } from "@/vision/estimator";
import type { HandLandmarks } from "@/vision/landmarks";
import type { TrackedFrame } from "@/vision/live/types";
import { ESTIMATOR_MODEL_FEATURES, fingerPoseKey, type FingerSample } from "./estimator-fit";
import { getPoseAngle } from "./hand-pose";
import { RENDER_OUTPUT_ROOT } from "./renderer";
import { IMAGE_HEIGHT_PX, IMAGE_WIDTH_PX, type FrameTruth } from "./scene";

/** Seeds below this are held out (the validation seeds are 2026120x); clip training seeds start here. */
export const FIRST_TRAINING_SEED = 77_000_000;

/**
 * Finger test motions: clip-validation names them `<motion>-<seed>-<i>-<clipSeed>` against gravity (seen from the
 * little-finger side) and `<motion>-gm-<seed>-...` with gravity minimized (the thumb side, from above); a PIP clip
 * whose DIP bends along (`--dip-follows 0.7`) carries `dip70-` before its seed.
 */
const CLIP_NAME = /^(mcp|pip|dip)\.flexion-(gm-)?(dip\d+-)?(\d+)-\d+-\d+$/;

export const CLIP_CONDITIONS = ["against_gravity", "gravity_minimized"] as const;
export type ClipCondition = (typeof CLIP_CONDITIONS)[number];

/**
 * The shape of a finger clip: the tested joint bent `alone` (the test position holds the finger's other joints
 * straight), or a PIP clip whose DIP bends along with it (`dip-follows`), as most people bend a finger.
 */
export const CLIP_SHAPES = ["alone", "dip-follows"] as const;
export type ClipShape = (typeof CLIP_SHAPES)[number];

/** The shape of a clip by its name, or null for a name that is not a finger test clip. */
export function clipShapeOfName(name: string): ClipShape | null {
  const match = CLIP_NAME.exec(name);
  return match ? (match[3] ? "dip-follows" : "alone") : null;
}

interface ClipTruth {
  frameCount: number;
  frames: { index: number; truth: FrameTruth }[];
}

/** Where a sample's `stillId` says it came from a clip frame (`clip:<name>#<frame>`), not a still. */
const CLIP_SAMPLE_PREFIX = "clip:";

/** The shape of a clip sample (null for a still), read from its `stillId`. */
export function clipShapeOf(sample: Pick<FingerSample, "stillId">): ClipShape | null {
  if (!isClipSample(sample)) return null;
  return clipShapeOfName(sample.stillId.slice(CLIP_SAMPLE_PREFIX.length).split("#")[0]);
}

/**
 * How much a sample counts beyond its joint's own weighting: a clip frame `clipWeight` (a still 1), and a frame of a
 * DIP-along PIP clip `dipFollowsWeight` times that. Shared by the fit (fit-correction.ts) and its selection
 * (select-estimator.ts), so both weigh a frame alike.
 */
export function clipFrameWeight(sample: Pick<FingerSample, "stillId">, clipWeight: number, dipFollowsWeight: number): number {
  return (isClipSample(sample) ? clipWeight : 1) * (clipShapeOf(sample) === "dip-follows" ? dipFollowsWeight : 1);
}

/** Whether a finger sample is a clip frame: it weighs by the clip weight and forms its own training-domain source. */
export function isClipSample(sample: Pick<FingerSample, "stillId">): boolean {
  return sample.stillId.startsWith(CLIP_SAMPLE_PREFIX);
}

/** The training-domain source of a sample (estimator-fit.ts FingerFitOptions.sources). */
export function sampleSource(sample: Pick<FingerSample, "stillId">): "clips" | "stills" {
  return isClipSample(sample) ? "clips" : "stills";
}

export function clipFolder(seed: number): string {
  return path.join(RENDER_OUTPUT_ROOT, "clip-validation", String(seed));
}

/** The names of a seed's clips (truth file and tracking for `model` both saved) that `keep` accepts, sorted. */
export function trackedClipNames(seed: number, model: string, keep: (name: string) => boolean): string[] {
  const folder = clipFolder(seed);
  if (!existsSync(folder)) return [];
  return readdirSync(folder)
    .filter((file) => file.endsWith(".json") && !file.endsWith(".tracked.json"))
    .map((file) => file.slice(0, -".json".length))
    .filter((name) => keep(name) && existsSync(path.join(folder, `${name}-${model}.tracked.json`)))
    .sort();
}

/** The names of a seed's tracked finger clips for one hand model, of the conditions and shapes asked. */
export function fingerClipNames(
  seed: number,
  model: string,
  conditions: readonly ClipCondition[] = CLIP_CONDITIONS,
  shapes: readonly ClipShape[] = ["alone"],
): string[] {
  return trackedClipNames(seed, model, (name) => {
    const match = CLIP_NAME.exec(name);
    if (!match) return false;
    const shape: ClipShape = match[3] ? "dip-follows" : "alone";
    return shapes.includes(shape) && conditions.includes(match[2] ? "gravity_minimized" : "against_gravity");
  });
}

/** A kept clip frame as the pipeline reads it: the hand and axes after the depth mirror, and the frame's picture. */
export interface MirroredClipFrame {
  index: number;
  hand: HandLandmarks;
  axes: HandAxes;
  picture: FingerPicture | null;
}

/**
 * Every `everyNth` frame of a tracked clip with a readable hand, read through the engine's depth mirror
 * (vision/depth-mirror.ts) as the pipeline reads it: every frame goes through the mirror check (its reference follows
 * the clip; a frame without a hand resets it), only every n-th is kept.
 */
export function mirroredClipFrames(frames: readonly TrackedFrame[], side: Side, everyNth: number): MirroredClipFrame[] {
  const continuity = new PalmContinuity(side);
  const kept: MirroredClipFrame[] = [];
  frames.forEach((frame, index) => {
    if (!frame.hand) {
      continuity.reset();
      return;
    }
    const seenAxes = handAxes(frame.hand, side);
    if (!seenAxes) return;
    const { hand, axes } = continuity.check(frame.hand, seenAxes);
    if (index % everyNth !== 0) return;
    const picture = frame.image ? { image: frame.image, aspect: frame.imageAspect ?? IMAGE_WIDTH_PX / IMAGE_HEIGHT_PX } : null;
    kept.push({ index, hand, axes, picture });
  });
  return kept;
}

/**
 * Samples of one clip: one per finger per kept frame with a readable hand. `stillId` is `clip:<name>#<frame>`, so a
 * cross-validation can keep a clip's frames together.
 */
export function clipFrameSamples(name: string, model: string, frames: readonly TrackedFrame[], truth: ClipTruth, everyNth: number): FingerSample[] {
  if (frames.length !== truth.frameCount) throw new Error(`${name} (${model}): tracked ${frames.length} frames, the clip has ${truth.frameCount}`);
  const motion = CLIP_NAME.exec(name)?.[1];
  if (!motion) throw new Error(`${name}: expected a finger clip named <mcp|pip|dip>.flexion-[gm-][dip70-]<seed>-<i>-<clipSeed>`);
  const side = truth.frames[0].truth.side as Side;
  const samples: FingerSample[] = [];
  for (const { index, hand, axes, picture } of mirroredClipFrames(frames, side, everyNth)) {
    const commanded = truth.frames[index].truth.commandedDeg;
    for (const finger of ESTIMATOR_FINGERS) {
      const base = modelFingerFeatures(ESTIMATOR_MODEL_FEATURES, hand, side, finger, axes, picture);
      if (!base) continue;
      samples.push({
        model,
        stillId: `${CLIP_SAMPLE_PREFIX}${name}#${index}`,
        motion: `${motion}.flexion`,
        view: truth.frames[index].truth.view,
        finger,
        moving: null,
        base,
        truthDeg: Object.fromEntries(FINGER_JOINTS.map((joint) => [joint, getPoseAngle(commanded, fingerPoseKey(finger, joint))])) as Record<FingerJoint, number>,
      });
    }
  }
  return samples;
}

/**
 * Samples from every tracked finger clip of the training seeds (of the conditions and shapes asked; by default the
 * tested joint bent alone), for one hand model.
 */
export function clipFingerSamples(
  seeds: readonly number[],
  model: string,
  everyNth = 3,
  conditions: readonly ClipCondition[] = CLIP_CONDITIONS,
  shapes: readonly ClipShape[] = ["alone"],
): FingerSample[] {
  return seeds.flatMap((seed) => {
    if (!Number.isInteger(seed) || seed < FIRST_TRAINING_SEED) throw new Error(`clip training seed ${seed}: expected a training seed (${FIRST_TRAINING_SEED} or above); held-out seeds are never fitted on`);
    const folder = clipFolder(seed);
    const names = fingerClipNames(seed, model, conditions, shapes);
    for (const shape of shapes) {
      if (!names.some((name) => clipShapeOfName(name) === shape)) {
        const how = shape === "dip-follows" ? " --motions pip.flexion --dip-follows 0.7" : "";
        throw new Error(`${folder}: no tracked finger clips (${shape}) for ${model}; render them with clip-validation.ts --seeds ${seed}${how}`);
      }
    }
    return names.flatMap((name) => {
      const frames = JSON.parse(readFileSync(path.join(folder, `${name}-${model}.tracked.json`), "utf8")) as TrackedFrame[];
      const truth = JSON.parse(readFileSync(path.join(folder, `${name}.json`), "utf8")) as ClipTruth;
      return clipFrameSamples(name, model, frames, truth, everyNth);
    });
  });
}
