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

interface Figures {
  frames: number;
  stages: Record<string, { medianUs: number; p95Us: number; meanUs: number }>;
  totalMedianUs: number;
  totalP95Us: number;
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
      const pipeline = createLivePipeline(target);
      const recorder = new CaptureRecorder(target);
      const recent = [];
      const stages = { pipeline: [], checks: [], recorder: [], draw: [], total: [] };
      for (const frame of source) {
        const t0 = performance.now();
        const update = pipeline.push({ t: frame.t, score: frame.score, hand: frame.hand, forearm: null });
        const t1 = performance.now();
        recent.push(frame);
        while (recent.length && frame.t - recent[0].t > 1500) recent.shift();
        runSetupChecks({ frames: recent, side: "right", motion: target.motion, lumaMean: 120, videoWidth: 640, videoHeight: 480, displayMirrored: true, gravitySource: "none" });
        const t2 = performance.now();
        recorder.push(frame);
        const t3 = performance.now();
        drawHandOverlay(ctx, 640, 480, { image: frame.image, videoWidth: 640, videoHeight: 480, fit: "contain", mirrored: true, motion: target.motion, digit: target.digit, angleDeg: update.smoothedDeg, targetDeg: 100 });
        const t4 = performance.now();
        stages.pipeline.push(t1 - t0); stages.checks.push(t2 - t1); stages.recorder.push(t3 - t2); stages.draw.push(t4 - t3); stages.total.push(t4 - t0);
      }
      // Drawing commands are queued; make the rasterizer finish so the last frames are not undercounted.
      ctx.getImageData(0, 0, 1, 1);
      return stages;
    })()`;
    const stages = (await page.evaluate(script)) as Record<string, number[]>;
    const stat = (values: number[]) => {
      // Skip the first 10%: JIT warm-up.
      const steady = values.slice(Math.floor(values.length / 10)).sort((a, b) => a - b);
      const at = (p: number) => steady[Math.min(steady.length - 1, Math.floor(p * steady.length))] * 1000;
      return { medianUs: at(0.5), p95Us: at(0.95), meanUs: (steady.reduce((s, v) => s + v, 0) / steady.length) * 1000 };
    };
    const figures: Figures = {
      frames: stages.total.length,
      stages: Object.fromEntries(["pipeline", "checks", "recorder", "draw"].map((k) => [k, stat(stages[k])])),
      totalMedianUs: stat(stages.total).medianUs,
      totalP95Us: stat(stages.total).p95Us,
    };
    console.log(`app-side per-frame cost in headless Chromium (${figures.frames} frames, PIP flexion, 640x480 overlay); performance.now() resolution in Chromium is 5-100 µs, so single-frame figures are coarse:`);
    for (const [name, s] of Object.entries(figures.stages)) {
      console.log(`  ${name.padEnd(9)} median ${s.medianUs.toFixed(0).padStart(5)} µs   p95 ${s.p95Us.toFixed(0).padStart(5)} µs   mean ${s.meanUs.toFixed(0).padStart(5)} µs`);
    }
    console.log(`  total     median ${figures.totalMedianUs.toFixed(0).padStart(5)} µs   p95 ${figures.totalP95Us.toFixed(0).padStart(5)} µs   (goal: under 1000 µs a frame)`);
  } finally {
    await browser.close();
    await server.close();
  }
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : String(error));
  process.exit(1);
});
