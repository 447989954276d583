/**
 * The landmarkers and one detection step, shared by the worker and the main-thread fallback.
 * Models and wasm are served by the app itself (built by `npm run models`); nothing is fetched from elsewhere.
 */
import { FilesetResolver, HandLandmarker, PoseLandmarker } from "@mediapipe/tasks-vision";

type WasmFileset = Awaited<ReturnType<typeof FilesetResolver.forVisionTasks>>;
import { forearmDirection, handFrame } from "./landmark-results";
import type { LandmarkXYZ, TrackedFrame } from "./types";

export interface DetectorConfig {
  /** Absolute URLs: a worker resolves relative ones against its own script, not the page. */
  wasmBaseUrl: string;
  handModelUrl: string;
  poseModelUrl: string | null;
  poseIntervalMs: number;
  inputMirrored: boolean;
  /** The hand landmarker's detection, presence and tracking confidence floors; null keeps the library's defaults. */
  minConfidence: number | null;
  /** The module build of the wasm loader is needed inside module workers, which cannot use importScripts. */
  wasmAsModule: boolean;
}

export interface DetectionStep {
  frame: TrackedFrame;
  landmarksMs: number;
  poseMs: number | null;
  /** Time inside the second hand landmarker on frames it read (`detect` with `paired`). */
  pairMs: number | null;
}

export interface Detector {
  /**
   * `paired`: the second hand landmarker (`loadPairModel`) reads the same image too, into `frame.fullModel`. Ignored
   * until that model is loaded.
   */
  detect(image: TexImageSource, t: number, paired?: boolean): DetectionStep;
  /**
   * Loads a second hand landmarker (the full model, `url`) beside the first, for frames read by both models
   * (vision/model-pair.ts). Loading twice is a no-op.
   */
  loadPairModel(url: string): Promise<void>;
  close(): void;
}

// A forearm reading older than this no longer describes the arm in the current frame.
const FOREARM_STALE_AFTER_INTERVALS = 2.5;

/**
 * The wasm fileset, plus a hook to run before creating each task. In a module worker the library would load its
 * loader with `import(url)`: bundlers may rewrite such a call, and a module runs only once, while the library clears
 * the loader's global `ModuleFactory` after each task, so a second task (pose) would find none. So the loader module
 * is imported here once, untouched by bundlers, and its factory put back before each task is created.
 */
async function loadFileset(config: DetectorConfig): Promise<{ fileset: WasmFileset; beforeCreate: () => void }> {
  const fileset = await FilesetResolver.forVisionTasks(config.wasmBaseUrl, config.wasmAsModule);
  if (!config.wasmAsModule) return { fileset, beforeCreate: () => {} };
  const loader = (await import(/* webpackIgnore: true */ /* turbopackIgnore: true */ /* @vite-ignore */ fileset.wasmLoaderPath)) as {
    default?: unknown;
  };
  if (typeof loader.default !== "function") throw new Error(`${fileset.wasmLoaderPath}: expected a module whose default export is the wasm factory`);
  const factory = loader.default;
  return {
    // An empty loader path tells the library the factory is already in place.
    fileset: { ...fileset, wasmLoaderPath: "" },
    beforeCreate: () => {
      (globalThis as { ModuleFactory?: unknown }).ModuleFactory = factory;
    },
  };
}

export async function createDetector(config: DetectorConfig): Promise<Detector> {
  const { fileset, beforeCreate } = await loadFileset(config);
  beforeCreate();
  // CPU: the GPU delegate falls back to software WebGL on many machines and is then 10x slower (hand-models notes).
  // One hand: asking for more than are in view runs the palm detector on every frame.
  const handOptions = (url: string) => ({
    baseOptions: { modelAssetPath: url, delegate: "CPU" as const },
    runningMode: "VIDEO" as const,
    numHands: 1,
    ...(config.minConfidence === null
      ? {}
      : { minHandDetectionConfidence: config.minConfidence, minHandPresenceConfidence: config.minConfidence, minTrackingConfidence: config.minConfidence }),
  });
  const hands = await HandLandmarker.createFromOptions(fileset, handOptions(config.handModelUrl));
  beforeCreate();
  const pose = config.poseModelUrl
    ? await PoseLandmarker.createFromOptions(fileset, {
        baseOptions: { modelAssetPath: config.poseModelUrl, delegate: "CPU" },
        runningMode: "VIDEO",
        numPoses: 1,
      })
    : null;

  // detectForVideo needs strictly increasing timestamps, but frame times restart with each attempt and a clip can
  // loop or seek back. Such a jump moves an offset instead, so later frames keep their true spacing (the graph's
  // smoothing reads speeds from it).
  let lastTimestamp = -Infinity;
  let timestampOffset = 0;
  let lastPoseAt = -Infinity;
  let lastForearm: { t: number; direction: LandmarkXYZ } | null = null;
  let second: HandLandmarker | null = null;
  let secondLoading: Promise<void> | null = null;

  return {
    detect(image, t, paired = false) {
      if (t + timestampOffset <= lastTimestamp) timestampOffset = lastTimestamp + 1 - t;
      const timestamp = t + timestampOffset;
      lastTimestamp = timestamp;
      const started = performance.now();
      const frame = handFrame(t, hands.detectForVideo(image, timestamp), config.inputMirrored);
      const landmarksMs = performance.now() - started;
      let poseMs: number | null = null;
      if (pose && timestamp - lastPoseAt >= config.poseIntervalMs) {
        lastPoseAt = timestamp;
        const poseStarted = performance.now();
        const direction = forearmDirection(pose.detectForVideo(image, timestamp), frame.image?.[0] ?? null);
        poseMs = performance.now() - poseStarted;
        lastForearm = direction ? { t: timestamp, direction } : null;
      }
      if (lastForearm && timestamp - lastForearm.t <= config.poseIntervalMs * FOREARM_STALE_AFTER_INTERVALS) {
        frame.forearm = lastForearm.direction;
      }
      let pairMs: number | null = null;
      if (paired && second) {
        // The same image at the same time; the second landmarker sees only paired frames, their times still growing.
        const pairStarted = performance.now();
        frame.fullModel = handFrame(t, second.detectForVideo(image, timestamp), config.inputMirrored);
        pairMs = performance.now() - pairStarted;
      }
      return { frame, landmarksMs, poseMs, pairMs };
    },
    loadPairModel(url) {
      secondLoading ??= (async () => {
        beforeCreate();
        second = await HandLandmarker.createFromOptions(fileset, handOptions(url));
      })().catch((error: unknown) => {
        secondLoading = null;
        throw error;
      });
      return secondLoading;
    },
    close() {
      hands.close();
      pose?.close();
      second?.close();
    },
  };
}
