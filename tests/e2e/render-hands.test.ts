import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { renderSweepClip } from "@/scripts/accuracy/render-jobs";
import { HandRenderer } from "@/scripts/accuracy/renderer";
import { loadHandRig } from "@/scripts/accuracy/rig-files";
import { CAMERA_VIEWS, frameSeeds, IMAGE_HEIGHT_PX, IMAGE_WIDTH_PX, randomFrame } from "@/scripts/accuracy/scene";

const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };
// Pure green, far from any skin colour or its shadow, so "not background" means "hand".
const BACKGROUND = { kind: "plain", colorHex: "#00ff00" } as const;
const BACKGROUND_RGB = [0, 255, 0];

/** Decodes a JPEG with Debian's ffmpeg into packed RGB bytes. */
function decodeJpeg(jpeg: Buffer): Uint8Array {
  return execFileSync("ffmpeg", ["-loglevel", "error", "-i", "pipe:0", "-f", "rawvideo", "-pix_fmt", "rgb24", "pipe:1"], {
    input: jpeg,
    maxBuffer: 16 * 1024 * 1024,
  });
}

function differsFromBackground(rgb: Uint8Array, x: number, y: number): boolean {
  const offset = (Math.round(y) * IMAGE_WIDTH_PX + Math.round(x)) * 3;
  return [0, 1, 2].some((channel) => Math.abs(rgb[offset + channel] - BACKGROUND_RGB[channel]) > 60);
}

function countFrames(file: string): number {
  const output = execFileSync("ffprobe", ["-v", "error", "-count_frames", "-select_streams", "v:0", "-show_entries",
    "stream=nb_read_frames", "-of", "csv=p=0", file]).toString();
  return Number(output.trim());
}

describe("hand render harness (headless Chromium, software WebGL)", () => {
  let renderer: HandRenderer;
  let folder: string;

  beforeAll(async () => {
    renderer = await HandRenderer.start();
    folder = mkdtempSync(path.join(os.tmpdir(), "kinarc-render-"));
  });
  afterAll(async () => {
    await renderer?.close();
    if (folder) rmSync(folder, { recursive: true, force: true });
  });

  it("draws the hand where the truth says its joints are, in every view", async () => {
    const frames = frameSeeds(21, CAMERA_VIEWS.length).map((seed, i) => {
      const frame = randomFrame(rigs, seed, { views: [CAMERA_VIEWS[i]], distanceRangeM: [0.35, 0.6] });
      return { ...frame, spec: { ...frame.spec, background: BACKGROUND } };
    });
    const images = await renderer.render(frames.map((frame) => frame.spec));
    frames.forEach((frame, i) => {
      const rgb = decodeJpeg(images[i]);
      expect(rgb.length).toBe(IMAGE_WIDTH_PX * IMAGE_HEIGHT_PX * 3);
      // Joint centres lie inside the mesh, so each projects onto hand (or forearm) pixels whatever covers it.
      // Fingertip joints sit at the skin's edge and are left out.
      const inner = frame.truth.landmarksImagePx.filter((_, index) => ![4, 8, 12, 16, 20].includes(index));
      const onHand = inner.filter(
        ([x, y]) => x >= 0 && y >= 0 && x < IMAGE_WIDTH_PX && y < IMAGE_HEIGHT_PX && differsFromBackground(rgb, x, y),
      );
      expect(onHand.length, `view ${frame.truth.view}`).toBeGreaterThanOrEqual(inner.length - 1);
      // And the picture is not all hand: the corners show the background.
      const corners = [[2, 2], [IMAGE_WIDTH_PX - 3, 2], [2, IMAGE_HEIGHT_PX - 3], [IMAGE_WIDTH_PX - 3, IMAGE_HEIGHT_PX - 3]];
      const backgroundCorners = corners.filter(([x, y]) => !differsFromBackground(rgb, x, y));
      expect(backgroundCorners.length).toBeGreaterThanOrEqual(2);
    });
  });

  it("renders the same bytes for the same frame", async () => {
    const { spec } = randomFrame(rigs, 12345);
    const [first] = await renderer.render([spec]);
    const [second] = await renderer.render([spec]);
    expect(second.equals(first)).toBe(true);
  });

  it("writes a sweep clip as MJPEG and webm with one truth row per frame", async () => {
    const clip = await renderSweepClip(
      renderer,
      rigs.right,
      { joints: ["index.pipFlexionDeg"], fromDeg: 0, toDeg: 80, cycles: 1, cycleSeconds: 1, fps: 12, view: "radial", side: "right", seed: 3, distanceM: 0.45 },
      folder,
      "pip-sweep",
    );
    const truth = JSON.parse(readFileSync(clip.truthFile, "utf8"));
    expect(clip.frameCount).toBe(13);
    expect(truth.frames).toHaveLength(13);
    expect(countFrames(clip.mjpegFile)).toBe(13);
    expect(countFrames(clip.webmFile!)).toBe(13);
    expect(truth.frames[6].truth.commandedDeg.index.pipFlexionDeg).toBeCloseTo(80, 6);
  });
});

describe("renders through the app's tracking harness", () => {
  it("finds hands in the stills and lines each result up with its own still", async () => {
    const { randomSetFrame, trackRenderedSet } = await import("@/scripts/accuracy/tracked-set");
    const set = await trackRenderedSet({ name: "e2e", seed: 424242, count: 12, models: ["lite"], makeFrame: randomSetFrame(), log: () => {} });
    const tracked = set.stills.filter((still) => still.image);
    // The notes saw most renders detected; a few odd random poses may be missed.
    expect(tracked.length).toBeGreaterThanOrEqual(8);
    const meanPixelError = (image: readonly (readonly number[])[], truth: [number, number][]) =>
      image.reduce((sum, p, k) => sum + Math.hypot(p[0] * IMAGE_WIDTH_PX - truth[k][0], p[1] * IMAGE_HEIGHT_PX - truth[k][1]), 0) / truth.length;
    const median = (values: number[]) => values.sort((a, b) => a - b)[Math.floor(values.length / 2)];
    const own = tracked.map((still) => meanPixelError(still.image!, still.truth.landmarksImagePx));
    // Against the next still's truth instead: what an off-by-one in the time mapping would give.
    const shifted = tracked.flatMap((still) => {
      const next = set.stills[set.stills.indexOf(still) + 1];
      return next ? [meanPixelError(still.image!, next.truth.landmarksImagePx)] : [];
    });
    // The rig's wrist and MCP points sit 10-20 px off the landmark model's (rendered-hands notes): allow 30 px.
    expect(median(own)).toBeLessThan(30);
    expect(median(shifted)).toBeGreaterThan(2 * median(own));
  });
});
