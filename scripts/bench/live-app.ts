/**
 * App-side per-frame cost of live tracking in headless Chromium, beside the landmarker's own (bench `tracking`):
 * the engine's live pipeline (angles, smoothing, repetitions, plane), the set-up checks, the capture recorder and
 * drawing the overlay on a 640x480 canvas, each timed separately over a synthetic hand moving through repetitions.
 * Figures only; the goal (issue 4: the app's own per-frame work under 1 ms) is judged by people, not asserted.
 *
 *   npm run bench -- live-app [--frames=3000]
 */
import path from "node:path";
import { launchChromium, startHarnessServer } from "../../tests/harness/tracking-harness";

const REPO_ROOT = path.resolve(__dirname, "..", "..");

function argument(name: string, fallback: string): string {
  const joined = process.argv.find((a) => a.startsWith(`--${name}=`));
  return joined ? joined.slice(name.length + 3) : fallback;
}

async function main() {
  const frames = Number(argument("frames", "3000"));
  if (!(frames >= 100)) throw new Error(`--frames: expected at least 100, got ${argument("frames", "")}`);
  const server = await startHarnessServer();
  const browser = await launchChromium();
  try {
    const page = await browser.newPage();
    // Any document of the harness origin will do; the modules are served (and transformed) by its Vite server.
    await page.goto(`${server.origin}/models/.kinarc-models.json`);
    const url = (file: string) => server.fileUrl(path.join(REPO_ROOT, file));
    const script = `(async () => {
      const { createLivePipeline } = await import(${JSON.stringify(url("vision/pipeline.ts"))});
      const { buildSyntheticCapture } = await import(${JSON.stringify(url("vision/testing/synthetic-hand.ts"))});
      const { runSetupChecks } = await import(${JSON.stringify(url("lib/tracking/setup-checks.ts"))});
      const { CaptureRecorder } = await import(${JSON.stringify(url("lib/tracking/capture-recorder.ts"))});
      const { drawHandOverlay } = await import(${JSON.stringify(url("components/tracking/draw-overlay.ts"))});
      const target = { motion: "pip.flexion", side: "right", digit: "middle", condition: "against_gravity" };
      const reps = Array.from({ length: 40 }, () => ({ peakDeg: 90 }));
      const capture = buildSyntheticCapture({ ...target, placement: { forearmDistal: [0, -1, 0], forearmRadial: [-1, 0, 0], wrist: [0, 0.08, 0.45] }, reps, noiseMm: 1, seed: 5 });
      // Image landmarks from the world ones through a webcam-like pinhole (focal 600 px at 640x480).
      const source = capture.frames.slice(0, ${frames}).map((f) => ({
        t: f.t, score: f.score, handedness: "right", hand: f.hand,
        image: f.hand ? f.hand.map(([x, y, z]) => [(320 + (600 * x) / z) / 640, (240 + (600 * y) / z) / 480, 0]) : null,
      }));
      const canvas = document.createElement("canvas");
      canvas.width = 640; canvas.height = 480;
      document.body.append(canvas);
      const ctx = canvas.getContext("2d");
      // Chromium rounds performance.now() to 100 µs on pages that are not cross-origin isolated, so each stage is
      // timed over whole batches of frames and divided, rather than frame by frame.
      const BATCH = 100;
      const stages = { pipeline: [], checks: [], recorder: [], draw: [], together: [] };
      const updates = [];
      const pipeline = createLivePipeline(target);
      const recorder = new CaptureRecorder(target);
      const recent = [];
      const windows = source.map((frame) => {
        recent.push(frame);
        while (recent.length && frame.t - recent[0].t > 1500) recent.shift();
        return [...recent];
      });
      const draw = (frame, angle) => drawHandOverlay(ctx, 640, 480, { image: frame.image, videoWidth: 640, videoHeight: 480, fit: "contain", mirrored: true, motion: target.motion, digit: target.digit, angleDeg: angle, targetDeg: 100 });
      const check = (i) => runSetupChecks({ frames: windows[i], side: "right", motion: target.motion, lumaMean: 120, videoWidth: 640, videoHeight: 480, displayMirrored: true, gravitySource: "none" });
      const timeBatches = (name, run) => {
        for (let start = 0; start + BATCH <= source.length; start += BATCH) {
          const t0 = performance.now();
          for (let i = start; i < start + BATCH; i++) run(i);
          // Drawing is queued; reading a pixel makes the rasterizer finish the batch inside the timing.
          if (name === "draw" || name === "together") ctx.getImageData(0, 0, 1, 1);
          stages[name].push((performance.now() - t0) / BATCH);
        }
      };
      timeBatches("pipeline", (i) => { updates[i] = pipeline.push({ t: source[i].t, score: source[i].score, hand: source[i].hand, forearm: null, image: source[i].image, imageAspect: 640 / 480 }); });
      timeBatches("checks", (i) => check(i));
      timeBatches("recorder", (i) => recorder.push(source[i]));
      timeBatches("draw", (i) => draw(source[i], updates[i].smoothedDeg));
      const second = createLivePipeline(target);
      const secondRecorder = new CaptureRecorder(target);
      timeBatches("together", (i) => {
        const update = second.push({ t: source[i].t, score: source[i].score, hand: source[i].hand, forearm: null, image: source[i].image, imageAspect: 640 / 480 });
        check(i);
        secondRecorder.push(source[i]);
        draw(source[i], update.smoothedDeg);
      });
      return stages;
    })()`;
    const stages = (await page.evaluate(script)) as Record<string, number[]>;
    const stat = (batches: number[]) => {
      // Leave out the first tenth of the batches: JIT warm-up.
      const steady = batches.slice(Math.floor(batches.length / 10));
      return { meanUs: (steady.reduce((s, v) => s + v, 0) / steady.length) * 1000, worstBatchUs: Math.max(...steady) * 1000 };
    };
    console.log(
      `app-side per-frame cost in headless Chromium (${frames} frames of a synthetic hand, PIP flexion, 640x480 overlay; each figure is a mean over batches of 100 frames, since the page's clock ticks in 100 µs):`,
    );
    for (const name of ["pipeline", "checks", "recorder", "draw", "together"]) {
      const s = stat(stages[name]);
      console.log(`  ${name.padEnd(9)} ${s.meanUs.toFixed(1).padStart(7)} µs/frame   worst batch ${s.worstBatchUs.toFixed(1).padStart(7)} µs/frame${name === "together" ? "   (goal: under 1000 µs a frame)" : ""}`);
    }
  } finally {
    await browser.close();
    await server.close();
  }
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : String(error));
  process.exit(1);
});
