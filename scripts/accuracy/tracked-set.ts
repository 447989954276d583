/**
 * A rendered set run through the app's own tracking code (tests/harness/tracking imports vision/live unchanged):
 * render stills from a seed, hold each in a webm clip, play it in the harness page with each hand model, and keep
 * the tracked landmarks beside each still's truth. Shared by the accuracy report and the correction fit, which use
 * different seeds.
 */
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import type { TrackedFrame } from "@/vision/live";
import type { Vec3 } from "@/vision/vec";
import { launchChromium, openHarnessPage, startHarnessServer, waitForFrames } from "../../tests/harness/tracking-harness";
import { renderStillsClip } from "./render-jobs";
import { HandRenderer, RENDER_OUTPUT_ROOT } from "./renderer";
import { MOTION_SETS, motionFrame } from "./motion-sets";
import type { PoseKey } from "./hand-pose";
import type { RenderFrameSpec } from "./render-spec";
import { framesForStills, type TrackedStill } from "./report";
import { loadHandRig } from "./rig-files";
import { CAMERA_VIEWS, frameSeeds, randomFrame, type FrameTruth } from "./scene";

/** Ports 4320-4329 belong to the render and accuracy tools. */
const HARNESS_PORT = Number(process.env.KINARC_ACCURACY_PORT ?? 4321);
export const HOLD_MS = 200;
export const CLIP_FPS = 15;
/**
 * Slow playback leaves the tracker time for two or more video frames of every still even when the frame governor
 * widens its interval on a loaded machine (seen here: 270 ms between processed frames with other jobs running).
 */
export const PLAYBACK_RATE = 0.3;

export type HandModelVariant = "lite" | "full";

export interface TrackedSet {
  seed: number;
  count: number;
  stills: TrackedStill[];
  renderer: string;
  msPerFrame: number;
}

async function trackClip(clipFile: string, model: HandModelVariant, mediaMs: number): Promise<TrackedFrame[]> {
  const server = await startHarnessServer(HARNESS_PORT);
  const browser = await launchChromium();
  try {
    const page = await openHarnessPage(browser, server, { clip: server.fileUrl(clipFile), rate: PLAYBACK_RATE, model, thread: "worker" });
    await waitForFrames(page, Number.MAX_SAFE_INTEGER, mediaMs / PLAYBACK_RATE + 120_000);
    // Results of the last frames arrive just after the clip ends.
    await page.waitForTimeout(1000);
    return await page.evaluate(() => window.kinarcHarness.frames);
  } finally {
    await browser.close();
    await server.close();
  }
}

export interface SetFrame {
  spec: RenderFrameSpec;
  truth: FrameTruth;
  /** The motion a motion-set still shows. */
  motion?: string;
  movingKeys?: readonly PoseKey[];
  /** The named whole-hand shape of a hand-shape still (motion-sets.ts handShapeFrame). */
  shape?: string;
}

/** Random poses in every view in turn: the general set. */
export function randomSetFrame(): (frameSeed: number, index: number) => SetFrame {
  const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };
  return (frameSeed, index) => randomFrame(rigs, frameSeed, { views: [CAMERA_VIEWS[index % CAMERA_VIEWS.length]] });
}

/** Each test motion in turn, in its recommended view. */
export function motionSetFrame(): (frameSeed: number, index: number) => SetFrame {
  const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };
  return (frameSeed, index) => motionFrame(rigs, frameSeed, MOTION_SETS[index % MOTION_SETS.length]);
}

/** The finger joints' test motions only (MCP, PIP, DIP flexion). */
export const FINGER_MOTION_SETS = MOTION_SETS.filter((set) => ["mcp.flexion", "pip.flexion", "dip.flexion"].includes(set.id));

/** The finger motions in turn, one finger moving (scripts/accuracy/motion-sets.ts motionFrame, singleFinger). */
export function singleFingerMotionSetFrame(): (frameSeed: number, index: number) => SetFrame {
  const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };
  return (frameSeed, index) => motionFrame(rigs, frameSeed, FINGER_MOTION_SETS[index % FINGER_MOTION_SETS.length], true);
}

/**
 * Renders `count` stills from `seed` with `makeFrame` and tracks them with each model. With `reuse`, a set saved by
 * an earlier run with the same name, seed, count and models is read back instead.
 */
export async function trackRenderedSet(options: {
  name: string;
  seed: number;
  count: number;
  models: readonly HandModelVariant[];
  makeFrame: (frameSeed: number, index: number) => SetFrame;
  reuse?: boolean;
  log?: (line: string) => void;
}): Promise<TrackedSet> {
  const { name, seed, count, models, makeFrame, reuse = false, log = console.error } = options;
  const folder = path.join(RENDER_OUTPUT_ROOT, "tracked");
  mkdirSync(folder, { recursive: true });
  const base = path.join(folder, `set-${name}-${seed}-${count}`);
  const savedFile = `${base}-${models.join("-")}.json`;
  if (reuse && existsSync(savedFile)) {
    log(`reusing ${savedFile}`);
    return JSON.parse(readFileSync(savedFile, "utf8")) as TrackedSet;
  }
  const frames = frameSeeds(seed, count).map((frameSeed, i) => makeFrame(frameSeed, i));
  const clipFile = `${base}.webm`;
  const renderer = await HandRenderer.start();
  let glName: string;
  let msPerFrame: number;
  try {
    glName = await renderer.glRenderer();
    ({ msPerFrame } = await renderStillsClip(renderer, frames.map((f) => f.spec), clipFile, { holdMs: HOLD_MS, fps: CLIP_FPS }));
  } finally {
    await renderer.close();
  }
  log(`rendered ${count} ${name} stills from seed ${seed} (${msPerFrame.toFixed(1)} ms a frame) -> ${clipFile}`);
  const stills: TrackedStill[] = [];
  for (const model of models) {
    const started = Date.now();
    const tracked = await trackClip(clipFile, model, count * HOLD_MS);
    const chosen = framesForStills(tracked, count, HOLD_MS, CLIP_FPS);
    chosen.forEach((frame, i) =>
      stills.push({
        truth: frames[i].truth,
        ...(frames[i].motion ? { motion: frames[i].motion } : {}),
        ...(frames[i].movingKeys ? { movingKeys: [...frames[i].movingKeys!] } : {}),
        ...(frames[i].shape ? { shape: frames[i].shape } : {}),
        model,
        hand: (frame?.hand as Vec3[] | null) ?? null,
        image: (frame?.image as Vec3[] | null) ?? null,
        score: frame?.score ?? 0,
      }),
    );
    log(`${model}: ${tracked.length} frames tracked, ${chosen.filter(Boolean).length}/${count} stills with a hand (${((Date.now() - started) / 1000).toFixed(0)} s)`);
  }
  const set: TrackedSet = { seed, count, stills, renderer: glName, msPerFrame };
  writeFileSync(savedFile, JSON.stringify(set));
  return set;
}
