/**
 * Harness page: runs the app's own tracking code (vision/live, imported unchanged) on a camera or a clip and keeps
 * every frame on `window.kinarcHarness` for playwright-core to read.
 *
 * Query parameters:
 *   clip=URL         play this video file instead of the camera (webm/mp4; Chromium's fake camera covers MJPEG)
 *   rate=N           clip playback rate (default 1); slower rates let more frames be processed
 *   step=1           instead of playing the clip, seek to every frame in turn and process each one (file analysis)
 *   fps=N            the clip's frame rate for step mode (default: measured from the clip's presented frames)
 *   model=lite|full  hand model (default lite)
 *   forearm=1        also run the pose landmarker for the forearm direction
 *   thread=auto|worker|main
 *   maxFps=N         cap on processed frames per second (default 30)
 *   minConfidence=N  the hand landmarker's confidence floors (default: the library's 0.5)
 *   paired=1         also read every frame with the full hand model (`TrackedFrame.fullModel`), as a self-check records
 */
import { createHandTracker, type FrameTiming, type TrackedFrame, type TrackerStats } from "../../../vision/live";
import { stepThroughClip } from "../../../vision/live/clip-stepper";

export interface HarnessState {
  status: "starting" | "running" | "ended" | "failed";
  error: string | null;
  source: "camera" | "clip";
  thread: "worker" | "main" | null;
  /** Time to create the landmarkers (model and wasm load). */
  trackerReadyMs: number | null;
  /** From asking for the camera (or starting the clip) to the first frame with a hand. */
  firstHandMs: number | null;
  videoWidth: number;
  videoHeight: number;
  frames: TrackedFrame[];
  timings: FrameTiming[];
  stats: TrackerStats | null;
  /** Durations of main-thread tasks over 50 ms (the Long Tasks API's threshold) since the page started. */
  longTasksMs: number[];
  /** Step mode: the frame rate stepped at, and frames whose presented media time fell outside their interval. */
  fps: number | null;
  offFrames: number | null;
}

declare global {
  interface Window {
    kinarcHarness: HarnessState;
  }
}

const params = new URLSearchParams(location.search);
const clip = params.get("clip");
const state: HarnessState = {
  status: "starting",
  error: null,
  source: clip ? "clip" : "camera",
  thread: null,
  trackerReadyMs: null,
  firstHandMs: null,
  videoWidth: 0,
  videoHeight: 0,
  frames: [],
  timings: [],
  stats: null,
  longTasksMs: [],
  fps: null,
  offFrames: null,
};
window.kinarcHarness = state;
// A frozen page shows up as long main-thread tasks; the benchmark reports them.
if (PerformanceObserver.supportedEntryTypes?.includes("longtask")) {
  new PerformanceObserver((list) => {
    for (const entry of list.getEntries()) state.longTasksMs.push(entry.duration);
  }).observe({ type: "longtask", buffered: true });
}
const statusLine = document.getElementById("status")!;
const video = document.getElementById("source") as HTMLVideoElement;

function numberParam(name: string, fallback: number): number {
  const raw = params.get(name);
  if (raw === null) return fallback;
  const value = Number(raw);
  if (!Number.isFinite(value) || value <= 0) throw new Error(`${name}: expected a positive number, got "${raw}"`);
  return value;
}

/** Opens the camera (playing) or loads the clip (paused, so no frame passes before the tracker is ready). */
async function openSource(): Promise<void> {
  if (clip) {
    video.src = clip;
    video.playbackRate = numberParam("rate", 1);
    // Step mode plays a moment to measure the frame rate; only a clip that is followed in real time ends this way.
    if (params.get("step") !== "1") {
      video.addEventListener("ended", () => {
        state.status = "ended";
      });
    }
    await new Promise<void>((resolve, reject) => {
      video.addEventListener("loadeddata", () => resolve(), { once: true });
      video.addEventListener("error", () => reject(new Error(`clip: could not load ${clip} (${video.error?.message ?? "unknown error"})`)), { once: true });
    });
  } else {
    video.srcObject = await navigator.mediaDevices.getUserMedia({ video: { width: 640, height: 480 }, audio: false });
    await video.play();
  }
  state.videoWidth = video.videoWidth;
  state.videoHeight = video.videoHeight;
}

async function run(): Promise<void> {
  const model = params.get("model") ?? "lite";
  if (model !== "lite" && model !== "full") throw new Error(`model: expected lite or full, got "${model}"`);
  const thread = params.get("thread") ?? "auto";
  if (thread !== "auto" && thread !== "worker" && thread !== "main") throw new Error(`thread: expected auto, worker or main, got "${thread}"`);

  const startedAt = performance.now();
  // Load the models while the camera starts, as the app does.
  const trackerPromise = createHandTracker({
    handModel: model,
    forearm: params.get("forearm") === "1",
    thread,
    maxFps: numberParam("maxFps", 30),
    minConfidence: params.get("minConfidence") === null ? undefined : numberParam("minConfidence", 0.5),
  }).then(
    (tracker) => {
      state.trackerReadyMs = performance.now() - startedAt;
      return tracker;
    },
  );
  const [tracker] = await Promise.all([trackerPromise, openSource()]);
  state.thread = tracker.thread;
  tracker.subscribe((frame) => {
    state.frames.push(frame);
    if (frame.hand && state.firstHandMs === null) state.firstHandMs = performance.now() - startedAt;
  });
  tracker.onTiming((timing) => {
    state.timings.push(timing);
    state.stats = tracker.stats();
    statusLine.textContent = `${state.thread} | frames ${state.frames.length} | with hand ${state.stats.framesWithHand} | ${timing.landmarksMs.toFixed(1)} ms`;
  });
  await tracker.warmUp(video);
  if (params.get("paired") === "1") {
    if (!(await tracker.loadPairModel())) throw new Error("paired: the second hand model did not load");
    tracker.setPaired(true);
  }
  state.status = "running";
  if (clip && params.get("step") === "1") {
    // The app's own clip path (vision/live/clip-stepper.ts), as an uploaded clip is analyzed in the browser.
    const fps = params.get("fps") === null ? undefined : numberParam("fps", 30);
    const stepped = await stepThroughClip(video, tracker, { fps, onProgress: (done, total) => (statusLine.textContent = `stepping ${done}/${total}`) });
    state.frames = stepped.frames;
    state.offFrames = stepped.offFrames;
    state.fps = stepped.fps;
    state.stats = tracker.stats();
    state.status = "ended";
    return;
  }
  tracker.start(video);
  if (clip) await video.play();
}

run().catch((error: unknown) => {
  state.status = "failed";
  state.error = error instanceof Error ? `${error.name}: ${error.message}` : String(error);
  statusLine.textContent = state.error;
});
