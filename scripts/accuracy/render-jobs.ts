import { spawn } from "node:child_process";
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import type { RenderFrameSpec } from "./render-spec";
import type { HandRenderer } from "./renderer";
import type { HandRig, HandSide } from "./rig";
import { frameSeeds, randomFrame, type FrameTruth, type RandomFrameOptions } from "./scene";
import { buildSweepFrames, type SweepOptions } from "./sweep";

/** Frames sent to the page per round trip: enough to hide the trip, few enough to keep memory small. */
const BATCH_SIZE = 12;

export interface RenderedSetLabel {
  file: string;
  seed: number;
  truth: FrameTruth;
}

export interface RenderedSet {
  setSeed: number;
  folder: string;
  labelsFile: string;
  frames: RenderedSetLabel[];
  msPerFrame: number;
}

/** Renders `count` random labelled frames from `setSeed` into `folder` (JPEGs plus labels.json). */
export async function renderRandomSet(
  renderer: HandRenderer,
  rigs: Record<HandSide, HandRig>,
  setSeed: number,
  count: number,
  folder: string,
  options: RandomFrameOptions = {},
): Promise<RenderedSet> {
  if (!Number.isInteger(count) || count <= 0) throw new Error(`count: expected a positive whole number; got ${count}`);
  mkdirSync(path.join(folder, "frames"), { recursive: true });
  const seeds = frameSeeds(setSeed, count);
  const labels: RenderedSetLabel[] = [];
  const started = performance.now();
  for (let start = 0; start < count; start += BATCH_SIZE) {
    const batch = seeds.slice(start, start + BATCH_SIZE).map((seed) => randomFrame(rigs, seed, options));
    const images = await renderer.render(batch.map((frame) => frame.spec));
    batch.forEach((frame, offset) => {
      const file = path.join("frames", `${String(start + offset).padStart(6, "0")}.jpg`);
      writeFileSync(path.join(folder, file), images[offset]);
      labels.push({ file, seed: frame.seed, truth: frame.truth });
    });
  }
  const msPerFrame = (performance.now() - started) / count;
  const labelsFile = path.join(folder, "labels.json");
  writeFileSync(labelsFile, JSON.stringify({ setSeed, count, options, frames: labels }, null, 1));
  return { setSeed, folder, labelsFile, frames: labels, msPerFrame };
}

export interface RenderedClip {
  mjpegFile: string;
  webmFile: string | null;
  truthFile: string;
  frameCount: number;
  msPerFrame: number;
}

/** Runs Debian's ffmpeg quietly (overwriting its output), feeding `input` on stdin; rejects with its error text. */
export function runFfmpeg(args: string[], input: Buffer[] = []): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn("ffmpeg", ["-hide_banner", "-loglevel", "error", "-y", ...args], { stdio: ["pipe", "ignore", "pipe"] });
    let stderr = "";
    child.stderr.on("data", (chunk) => (stderr += chunk));
    child.on("error", (error) => reject(new Error(`ffmpeg could not start (is Debian's ffmpeg installed?): ${error.message}`)));
    child.on("close", (code) => (code === 0 ? resolve() : reject(new Error(`ffmpeg exited with ${code}: ${stderr.trim()}`))));
    for (const frame of input) child.stdin.write(frame);
    child.stdin.end();
  });
}

/**
 * Renders a sweep as a clip: `<name>.mjpeg` (what Chromium's fake camera reads), optionally `<name>.webm`
 * (what a video element plays), and `<name>.json` with each frame's time and truth.
 */
export async function renderSweepClip(
  renderer: HandRenderer,
  rig: HandRig,
  options: SweepOptions,
  folder: string,
  name: string,
  { webm = true }: { webm?: boolean } = {},
): Promise<RenderedClip> {
  const frames = buildSweepFrames(rig, options);
  mkdirSync(folder, { recursive: true });
  const images: Buffer[] = [];
  const started = performance.now();
  for (let start = 0; start < frames.length; start += BATCH_SIZE) {
    images.push(...(await renderer.render(frames.slice(start, start + BATCH_SIZE).map((frame) => frame.spec))));
  }
  const msPerFrame = (performance.now() - started) / frames.length;
  const mjpegFile = path.join(folder, `${name}.mjpeg`);
  // Re-muxed by ffmpeg rather than concatenated here, so the file is what ffmpeg itself would call MJPEG.
  await runFfmpeg(["-f", "image2pipe", "-framerate", String(options.fps), "-c:v", "mjpeg", "-i", "-", "-c:v", "copy", "-f", "mjpeg", mjpegFile], images);
  let webmFile: string | null = null;
  if (webm) {
    webmFile = path.join(folder, `${name}.webm`);
    await runFfmpeg(
      ["-f", "image2pipe", "-framerate", String(options.fps), "-c:v", "mjpeg", "-i", "-", "-c:v", "libvpx", "-b:v", "2M",
        "-deadline", "realtime", "-cpu-used", "8", "-pix_fmt", "yuv420p", webmFile],
      images,
    );
  }
  const truthFile = path.join(folder, `${name}.json`);
  const { basePose, ...described } = options;
  writeFileSync(
    truthFile,
    JSON.stringify(
      {
        sweep: { ...described, basePose: basePose ?? "rest" },
        fps: options.fps,
        frameCount: frames.length,
        frames: frames.map((frame) => ({ index: frame.index, timeMs: frame.timeMs, truth: frame.truth })),
      },
      null,
      1,
    ),
  );
  return { mjpegFile, webmFile, truthFile, frameCount: frames.length, msPerFrame };
}

/**
 * Renders stills into one webm clip, each held for `holdMs` of media time (so a tracker that reads the clip's clock
 * can tell which still a result belongs to: still = floor(t / holdMs)). Held over several video frames so a
 * tracker that follows the hand from frame to frame gets a settled result on the later ones.
 */
export async function renderStillsClip(
  renderer: HandRenderer,
  specs: RenderFrameSpec[],
  file: string,
  { holdMs, fps }: { holdMs: number; fps: number },
): Promise<{ msPerFrame: number }> {
  if (!(holdMs > 0) || !(fps > 0)) throw new Error(`holdMs and fps: expected positive numbers, got ${holdMs} and ${fps}`);
  mkdirSync(path.dirname(file), { recursive: true });
  const images: Buffer[] = [];
  const started = performance.now();
  for (let start = 0; start < specs.length; start += BATCH_SIZE) {
    images.push(...(await renderer.render(specs.slice(start, start + BATCH_SIZE))));
  }
  const msPerFrame = (performance.now() - started) / specs.length;
  await runFfmpeg(
    // Constant frame rate: webm defaults to variable, which would drop the repeats that hold each still.
    ["-f", "image2pipe", "-framerate", `1000/${holdMs}`, "-c:v", "mjpeg", "-i", "-", "-fps_mode", "cfr", "-r", String(fps), "-c:v", "libvpx",
      "-b:v", "3M", "-deadline", "realtime", "-cpu-used", "8", "-pix_fmt", "yuv420p", file],
    images,
  );
  return { msPerFrame };
}
