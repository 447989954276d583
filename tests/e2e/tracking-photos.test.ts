/**
 * Browser checks of the offline models and the live tracking loop on real hand photos (Debian's gcompris-qt-data,
 * fetched at test time, never committed): the built bundles load in @mediapipe/tasks-vision, the tracking loop finds
 * the hand in the fake camera and in a clip, and reports which hand it is.
 */
import path from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { MODEL_BUNDLES } from "../../scripts/models/recipe";
import { buildModels } from "../../scripts/models/build";
import { STANDARD_CLIPS, makeHandClip, type PhotoId } from "../../scripts/fixtures/hand-photos";
import {
  FIST_LARGE_MIN_DEG,
  FIST_MIN_DEG,
  meetsBar,
  OPEN_HAND_MAX_DEG,
  OPEN_NEAR_ZERO_MAX_DEG,
  readPhoto,
} from "../../scripts/accuracy/photo-check";
import type { LandmarkXYZ, TrackedFrame } from "../../vision/live";
import { handAxes, readMotion } from "../../vision/angles";
import { FINGERS, type MotionId } from "../../lib/motions/catalog";
import {
  launchChromium,
  launchWithFakeCamera,
  openHarnessPage,
  startHarnessServer,
  waitForFrames,
  type HarnessServer,
} from "../harness/tracking-harness";

const REPO_ROOT = path.resolve(__dirname, "..", "..");
// Issue 4's acceptance figure for the photo clips.
const MIN_DETECTION_RATE = 0.9;

let server: HarnessServer;
let cameraClip: string;
let photosClip: string;

beforeAll(async () => {
  buildModels({ repoRoot: REPO_ROOT });
  // Throws with a message naming apt or ffmpeg when the fixtures cannot be made.
  cameraClip = makeHandClip(STANDARD_CLIPS.openFistCamera);
  photosClip = makeHandClip(STANDARD_CLIPS.allPhotosVideo);
  server = await startHarnessServer();
});

afterAll(async () => {
  await server?.close();
});

describe("model bundles in @mediapipe/tasks-vision 0.10.35", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchChromium();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("every bundle loads and runs a detection on an image", async () => {
    // Any document of the harness origin will do; a static file keeps the tracking page from starting too.
    const page = await browser.newPage();
    await page.goto(`${server.origin}/models/.kinarc-models.json`);
    const tasksUrl = server.fileUrl(path.join(REPO_ROOT, "node_modules/@mediapipe/tasks-vision/vision_bundle.mjs"));
    // Passed as source text: the test runner rewrites `import()` inside functions it transforms.
    const script = `(async () => {
      const vision = await import(${JSON.stringify(tasksUrl)});
      const fileset = await vision.FilesetResolver.forVisionTasks(location.origin + "/mediapipe/wasm");
      const canvas = document.createElement("canvas");
      canvas.width = 640;
      canvas.height = 480;
      canvas.getContext("2d").fillRect(0, 0, 640, 480);
      const out = [];
      for (const bundle of ${JSON.stringify(MODEL_BUNDLES.map((b) => b.file))}) {
        const Task = bundle.startsWith("hand") ? vision.HandLandmarker : vision.PoseLandmarker;
        try {
          const task = await Task.createFromOptions(fileset, {
            baseOptions: { modelAssetPath: "/models/" + bundle, delegate: "CPU" },
            runningMode: "IMAGE",
          });
          const result = task.detect(canvas);
          task.close();
          out.push({ bundle, ok: Array.isArray(result.landmarks), detail: result.landmarks.length + " detections on a blank image" });
        } catch (error) {
          out.push({ bundle, ok: false, detail: String(error) });
        }
      }
      return out;
    })()`;
    const results = (await page.evaluate(script)) as { bundle: string; ok: boolean; detail: string }[];
    expect(results.map((r) => r.bundle)).toEqual(MODEL_BUNDLES.map((b) => b.file));
    for (const result of results) expect(result, result.detail).toMatchObject({ ok: true, detail: "0 detections on a blank image" });
    await page.close();
  });
});

describe("live tracking on Chromium's fake camera (open hand and fist, looping)", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchWithFakeCamera(cameraClip);
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("finds the hand on at least 90% of frames, off the main thread, with world and image landmarks", async () => {
    const page = await openHarnessPage(browser, server);
    const state = await waitForFrames(page, 60);
    expect(state.source).toBe("camera");
    expect([state.videoWidth, state.videoHeight]).toEqual([640, 480]);
    expect(state.thread).toBe("worker");
    const frames = state.frames;
    const detected = frames.filter((f) => f.hand);
    expect(detected.length / frames.length).toBeGreaterThanOrEqual(MIN_DETECTION_RATE);
    for (const frame of detected) {
      expect(frame.hand).toHaveLength(21);
      expect(frame.image).toHaveLength(21);
      // Normalised image coordinates lie in the frame (the photo sits inside the 640x480 canvas).
      for (const [x, y] of frame.image!) {
        expect(x).toBeGreaterThanOrEqual(0);
        expect(x).toBeLessThanOrEqual(1);
        expect(y).toBeGreaterThanOrEqual(0);
        expect(y).toBeLessThanOrEqual(1);
      }
      // A real hand spans well under 30 cm wrist to fingertip [common practice: adult hand length ~17-20 cm].
      expect(distance(frame.hand![0], frame.hand![12])).toBeLessThan(0.3);
    }
    // Frame times increase: the stream is in camera order.
    for (let i = 1; i < frames.length; i++) expect(frames[i].t).toBeGreaterThan(frames[i - 1].t);
    // The clip alternates open hand and fist, so the naive PIP reading must take two clearly different values.
    const pip = detected.map((f) => meanFingerFlexion(f.hand!).pip).sort((a, b) => a - b);
    const low = pip[Math.floor(pip.length * 0.1)];
    const high = pip[Math.floor(pip.length * 0.9)];
    console.log(`fake camera: ${detected.length}/${frames.length} frames with a hand; naive mean PIP flexion p10 ${low.toFixed(0)}°, p90 ${high.toFixed(0)}°`);
    expect(high - low).toBeGreaterThan(25);
    await page.close();
  });
  it("falls back to the main thread and keeps it to about half the time", async () => {
    const page = await openHarnessPage(browser, server, { thread: "main" });
    const state = await waitForFrames(page, 30);
    expect(state.thread).toBe("main");
    expect(state.frames.filter((f) => f.hand).length / state.frames.length).toBeGreaterThanOrEqual(MIN_DETECTION_RATE);
    // The governor spaces frames by at least twice their cost on the main thread (MAIN_THREAD_BUSY_SHARE = 0.5).
    const landmarks = state.timings.slice(-10).map((t) => t.landmarksMs);
    expect(state.stats!.frameIntervalMs).toBeGreaterThanOrEqual(Math.min(...landmarks) * 2 * 0.8);
    await page.close();
  });

  it("with both models on, every frame carries the full model's reading of the same picture at the same time", async () => {
    const page = await openHarnessPage(browser, server, { paired: true });
    const state = await waitForFrames(page, 45);
    expect(state.thread).toBe("worker");
    const frames = state.frames;
    expect(frames.every((f) => f.fullModel !== undefined && f.fullModel.t === f.t)).toBe(true);
    expect(frames.filter((f) => f.fullModel!.hand).length / frames.length).toBeGreaterThanOrEqual(MIN_DETECTION_RATE);
    // The same picture: where both found the hand, the wrist lands within 5% of the picture in both readings (the
    // models differ in depth, not in where the hand is; our margin).
    const both = frames.filter((f) => f.image && f.fullModel!.image);
    expect(both.length).toBeGreaterThan(0);
    for (const f of both) expect(Math.hypot(f.image![0][0] - f.fullModel!.image![0][0], f.image![0][1] - f.fullModel!.image![0][1])).toBeLessThan(0.05);
    // Each frame costs both models' time, and the governor spaces frames by it.
    const timed = state.timings.filter((t) => t.pairMs !== null);
    expect(timed.length).toBeGreaterThan(0);
    console.log(
      `both models: ${frames.length} frames, full model found the hand in ${frames.filter((f) => f.fullModel!.hand).length}; ` +
        `lite median ${medianOf(timed.map((t) => t.landmarksMs)).toFixed(1)} ms, full median ${medianOf(timed.map((t) => t.pairMs!)).toFixed(1)} ms`,
    );
    await page.close();
  });

  it("with the forearm on, also runs the pose model at a lower rate in the worker, and reports no forearm without an elbow", async () => {
    const page = await openHarnessPage(browser, server, { forearm: true });
    const state = await waitForFrames(page, 45);
    expect(state.thread).toBe("worker");
    expect(state.frames.filter((f) => f.hand).length / state.frames.length).toBeGreaterThanOrEqual(MIN_DETECTION_RATE);
    const poseRuns = state.timings.filter((t) => t.poseMs !== null);
    expect(poseRuns.length).toBeGreaterThanOrEqual(2);
    // Default pose spacing is 200 ms; camera frame times come from the page clock.
    for (let i = 1; i < poseRuns.length; i++) expect(poseRuns[i].t - poseRuns[i - 1].t).toBeGreaterThanOrEqual(200);
    expect(poseRuns.length).toBeLessThan(state.timings.length);
    // The photos end at the forearm's middle: no elbow, so no forearm direction may be claimed.
    expect(state.frames.filter((f) => f.forearm)).toHaveLength(0);
    console.log(`forearm mode: ${poseRuns.length} pose runs over ${state.timings.length} frames, pose median ${medianOf(poseRuns.map((t) => t.poseMs!)).toFixed(1)} ms`);
    await page.close();
  });
});

describe("live tracking on a clip of every photo (one second each)", () => {
  let browser: Browser;
  let frames: TrackedFrame[];
  beforeAll(async () => {
    browser = await launchChromium();
    // Frame by frame (the harness seeks to each frame): every one of the 240 frames is judged, however busy the
    // machine; real-time following of a video is covered by the fake-camera checks above.
    const page = await openHarnessPage(browser, server, { clip: server.fileUrl(photosClip), step: true, fps: 30 });
    await page.waitForFunction(() => window.kinarcHarness?.status === "ended" || window.kinarcHarness?.status === "failed", null, {
      timeout: 110_000,
      polling: 200,
    });
    const state = await page.evaluate(() => window.kinarcHarness);
    if (state.status === "failed") throw new Error(`harness: ${state.error}`);
    frames = state.frames;
  });
  afterAll(async () => {
    await browser?.close();
  });

  const photos = STANDARD_CLIPS.allPhotosVideo.photos as readonly PhotoId[];
  // Leave out the frames next to a cut: the encoder may blend or shift a frame there.
  const framesOf = (index: number) => frames.filter((f) => f.t >= index * 1000 + 50 && f.t < (index + 1) * 1000 - 50);

  it("processes every frame of the clip in order, and finds the hand on at least 90% of frames of every photo", () => {
    expect(frames).toHaveLength(240);
    expect(frames.map((f) => Math.round((f.t * 30) / 1000))).toEqual(Array.from({ length: 240 }, (_, i) => i));
    for (const [index, id] of photos.entries()) {
      const own = framesOf(index);
      expect(own.length, `${id}: frames processed`).toBeGreaterThanOrEqual(25);
      expect(own.filter((f) => f.hand).length / own.length, `${id}: detection rate`).toBeGreaterThanOrEqual(MIN_DETECTION_RATE);
    }
  });

  it("reads a fist with more finger flexion than the same hand open, seen the same way", () => {
    const rows: string[] = [];
    const summary = new Map<PhotoId, { mcp: number; pip: number; dip: number }>();
    for (const [index, id] of photos.entries()) {
      const readings = framesOf(index).flatMap((f) => (f.hand ? [meanFingerFlexion(f.hand)] : []));
      const median = (key: "mcp" | "pip" | "dip") => medianOf(readings.map((r) => r[key]));
      summary.set(id, { mcp: median("mcp"), pip: median("pip"), dip: median("dip") });
      const s = summary.get(id)!;
      rows.push(`${id.padEnd(16)} MCP ${s.mcp.toFixed(0).padStart(3)}°  PIP ${s.pip.toFixed(0).padStart(3)}°  DIP ${s.dip.toFixed(0).padStart(3)}°`);
    }
    console.log(`naive world-landmark flexion, median over frames, mean of index-little (test-only helper):\n${rows.join("\n")}`);
    // For the record, the measurement engine's raw readings on the same frames (3-D / image plane); their accuracy
    // is judged by the engine's own tests and the accuracy work, not here.
    const engineRows = photos.map((id, index) => {
      const side = id.startsWith("left") ? "left" : "right";
      const read = (motion: MotionId) => {
        const values = framesOf(index).flatMap((f) => {
          const axes = f.hand ? handAxes(f.hand, side) : null;
          if (!f.hand || !axes) return [];
          const readings = FINGERS.map((digit) => readMotion(motion, digit, f.hand!, axes, null)).filter((r) => r !== null);
          return readings.length ? [[mean(readings.map((r) => r.deg)), mean(readings.map((r) => r.imagePlaneDeg))]] : [];
        });
        return `${medianOf(values.map((v) => v[0])).toFixed(0).padStart(4)}°/${medianOf(values.map((v) => v[1])).toFixed(0).padStart(4)}°`;
      };
      return `${id.padEnd(16)} MCP ${read("mcp.flexion")}  PIP ${read("pip.flexion")}  DIP ${read("dip.flexion")}`;
    });
    console.log(`engine readMotion, median over frames, mean of index-little (3-D / image plane):\n${engineRows.join("\n")}`);
    for (const side of ["left", "right"] as const) {
      for (const view of ["palm", "back"] as const) {
        const open = summary.get(`${side}-open-${view}`)!;
        const fist = summary.get(`${side}-fist-${view}`)!;
        // A fist flexes the PIP joints to near their end range, about 100° [AAOS normal values, from memory];
        // a straight finger reads near 0°. Raw landmarks under-read that (hand-models notes), so only the ordering
        // and a conservative gap are checked here, not the clinical figures (issue 8).
        expect(fist.pip - open.pip, `${side} ${view}: PIP fist minus open`).toBeGreaterThan(20);
      }
    }
  });

  it("reads every fist with more MCP and PIP flexion than the same hand open, as the app reads them (correction on)", () => {
    // The app's own reading: createLivePipeline per finger and motion, the correction where it clearly helps, as a
    // stored attempt of these frames would read (scripts/accuracy/photo-check.ts readPhoto).
    const readings = new Map(photos.map((id, index) => [id, readPhoto(framesOf(index), id, "lite", "auto")]));
    const rows = [...readings.values()].map(
      (r) =>
        `${r.photo.padEnd(16)} MCP ${r.mcpDeg.toFixed(0).padStart(3)}°  PIP ${r.pipDeg.toFixed(0).padStart(3)}°  ` +
        `corrected ${Math.round(r.correctedShare * 100)}%  issue 4 bar (open ≤ ${OPEN_NEAR_ZERO_MAX_DEG}°, fist ≥ ${FIST_LARGE_MIN_DEG}°): ` +
        `${meetsBar(r, "issue 4") ? "met" : "NOT met"}; issue 8 bar (≤ ${OPEN_HAND_MAX_DEG}°, ≥ ${FIST_MIN_DEG}°): ${meetsBar(r) ? "met" : "NOT met"}`,
    );
    console.log(`app pipeline (lite, correction on), median over frames of the four fingers' mean:\n${rows.join("\n")}`);
    for (const side of ["left", "right"] as const) {
      for (const view of ["palm", "back"] as const) {
        const open = readings.get(`${side}-open-${view}`)!;
        const fist = readings.get(`${side}-fist-${view}`)!;
        // A fist bends MCP and PIP toward their end ranges, about 90 and 100 degrees [AAOS normal values, from
        // memory]; an open hand is near 0. 20 degrees apart is a floor the app's reading must clear at both joints.
        expect(fist.mcpDeg - open.mcpDeg, `${side} ${view}: MCP fist minus open`).toBeGreaterThan(20);
        expect(fist.pipDeg - open.pipDeg, `${side} ${view}: PIP fist minus open`).toBeGreaterThan(20);
      }
    }
  });

  it("names the hand as the person's own side, corrected for the unmirrored image", () => {
    for (const [index, id] of photos.entries()) {
      const labelled = framesOf(index).filter((f) => f.handedness);
      const side = id.startsWith("left") ? "left" : "right";
      const agreeing = labelled.filter((f) => f.handedness === side).length;
      // The package's file names (gauche/droite) say which hand each photo shows.
      expect(agreeing / labelled.length, `${id}: share of frames naming the ${side} hand`).toBeGreaterThanOrEqual(0.8);
    }
  });
});

function distance(a: LandmarkXYZ, b: LandmarkXYZ): number {
  return Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
}

/**
 * TEST-ONLY naive flexion: the unsigned angle between consecutive bone lines from the 3-D landmarks (metacarpal
 * line = wrist to MCP), averaged over index..little. Not the product's angle maths (that lives in the measurement
 * engine); it only shows open and fist apart, as in shared/notes/hand-models.md.
 */
function meanFingerFlexion(hand: LandmarkXYZ[]): { mcp: number; pip: number; dip: number } {
  const bend = (a: number, b: number, c: number) => {
    const u = [hand[b][0] - hand[a][0], hand[b][1] - hand[a][1], hand[b][2] - hand[a][2]];
    const v = [hand[c][0] - hand[b][0], hand[c][1] - hand[b][1], hand[c][2] - hand[b][2]];
    const cos = (u[0] * v[0] + u[1] * v[1] + u[2] * v[2]) / (Math.hypot(u[0], u[1], u[2]) * Math.hypot(v[0], v[1], v[2]));
    return (Math.acos(Math.min(1, Math.max(-1, cos))) * 180) / Math.PI;
  };
  const fingers = [5, 9, 13, 17];
  const mean = (f: (m: number) => number) => fingers.reduce((sum, m) => sum + f(m), 0) / fingers.length;
  return {
    mcp: mean((m) => bend(0, m, m + 1)),
    pip: mean((m) => bend(m, m + 1, m + 2)),
    dip: mean((m) => bend(m + 1, m + 2, m + 3)),
  };
}

function mean(values: number[]): number {
  return values.reduce((a, b) => a + b, 0) / values.length;
}

function medianOf(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted.length ? sorted[Math.floor(sorted.length / 2)] : NaN;
}
