/**
 * Tracking benchmark: the app's tracking loop (vision/live, via the harness page) in headless Chromium, fed by the
 * fake camera with a 640x480 clip of a real hand. Prints frames per second, per-frame landmark time and the time to
 * the first tracked frame. Figures only; goals are judged by people, not asserted.
 *
 *   npm run bench -- tracking [--model=lite|full] [--seconds=10] [--thread=auto|worker|main] [--forearm] [--paired]
 *
 * `--paired` reads every frame with the full model too, as a self-check of finger flexion records.
 */
import { STANDARD_CLIPS, makeHandClip } from "../fixtures/hand-photos";
import { launchWithFakeCamera, openHarnessPage, readHarness, startHarnessServer, waitForFrames } from "../../tests/harness/tracking-harness";

/** `--name value` or `--name=value` (the second form passes through `npm run bench`, which takes bare words as names). */
function argument(name: string, fallback: string): string {
  const joined = process.argv.find((a) => a.startsWith(`--${name}=`));
  if (joined) return joined.slice(name.length + 3);
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
}

function percentile(values: number[], p: number): number {
  if (values.length === 0) return NaN;
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))];
}

async function main() {
  const model = argument("model", "lite");
  if (model !== "lite" && model !== "full") throw new Error(`--model: expected lite or full, got ${model}`);
  const thread = argument("thread", "auto");
  if (thread !== "auto" && thread !== "worker" && thread !== "main") throw new Error(`--thread: expected auto, worker or main, got ${thread}`);
  const seconds = Number(argument("seconds", "10"));
  if (!(seconds > 0)) throw new Error(`--seconds: expected a positive number, got ${argument("seconds", "")}`);
  const forearm = process.argv.includes("--forearm");
  const paired = process.argv.includes("--paired");
  if (paired && model !== "lite") throw new Error("--paired: pairs the full model with the lite one; leave --model at lite");

  const clip = makeHandClip(STANDARD_CLIPS.openFistCamera);
  const server = await startHarnessServer();
  const browser = await launchWithFakeCamera(clip);
  try {
    const page = await openHarnessPage(browser, server, { model, thread, forearm, paired });
    // Warm-up: the first frames include wasm compilation and graph start-up.
    const warm = await waitForFrames(page, 30);
    const from = { frames: warm.frames.length, timings: warm.timings.length, longTasks: warm.longTasksMs.length, at: performance.now() };
    await page.waitForTimeout(seconds * 1000);
    const state = await readHarness(page);
    const elapsedS = (performance.now() - from.at) / 1000;
    const timings = state.timings.slice(from.timings);
    const landmarks = timings.map((t) => t.landmarksMs);
    const roundTrip = timings.map((t) => t.roundTripMs);
    const overhead = timings.map((t) => t.roundTripMs - t.landmarksMs - (t.poseMs ?? 0) - (t.pairMs ?? 0));
    const pairs = timings.flatMap((t) => (t.pairMs === null ? [] : [t.pairMs]));
    const poses = timings.flatMap((t) => (t.poseMs === null ? [] : [t.poseMs]));
    const withHand = state.frames.slice(from.frames).filter((f) => f.hand).length;
    const processed = state.frames.length - from.frames;
    const fmt = (v: number) => v.toFixed(1);
    console.log(
      `tracking benchmark: hand model ${model}${paired ? " and full on every frame" : ""}, ${state.videoWidth}x${state.videoHeight} fake camera, thread ${state.thread}${forearm ? ", with pose" : ""}`,
    );
    console.log(`  frames per second          ${fmt(processed / elapsedS)} (${processed} frames in ${fmt(elapsedS)} s, hand found in ${withHand})`);
    console.log(`  landmarks per frame (ms)   median ${fmt(percentile(landmarks, 50))}  p90 ${fmt(percentile(landmarks, 90))}`);
    if (pairs.length) console.log(`  full model per frame (ms)  median ${fmt(percentile(pairs, 50))}  p90 ${fmt(percentile(pairs, 90))}`);
    if (poses.length) console.log(`  pose per run (ms)          median ${fmt(percentile(poses, 50))}  p90 ${fmt(percentile(poses, 90))}  (${poses.length} runs)`);
    console.log(`  frame round trip (ms)      median ${fmt(percentile(roundTrip, 50))}  p90 ${fmt(percentile(roundTrip, 90))}`);
    console.log(`  transfer + loop (ms)       median ${fmt(percentile(overhead, 50))}  p90 ${fmt(percentile(overhead, 90))}`);
    console.log(`  models ready after (ms)    ${fmt(state.trackerReadyMs ?? NaN)}`);
    console.log(`  first tracked frame (ms)   ${fmt(state.firstHandMs ?? NaN)} after the camera was asked for`);
    const longTasks = state.longTasksMs.filter((_, i) => i >= from.longTasks);
    console.log(`  main-thread tasks > 50 ms  ${longTasks.length} while tracking${longTasks.length ? `, longest ${fmt(Math.max(...longTasks))} ms` : ""}`);
    console.log(`  skipped camera frames      ${state.stats?.skippedFrames ?? 0}, frame interval now ${fmt(state.stats?.frameIntervalMs ?? NaN)} ms`);
  } finally {
    await browser.close();
    await server.close();
  }
}

main().catch((error: unknown) => {
  console.error(`bench: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
