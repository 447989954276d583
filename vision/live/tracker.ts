/**
 * The browser tracking loop: camera or clip frames in, a typed stream of hand landmarks out.
 * Detection runs in a Web Worker with transferred frames where the browser allows it, else on the main thread with
 * a frame budget. Browser-only; consumers (the measurement engine's live pipeline, the overlay, the harness)
 * subscribe to `TrackedFrame`s and never touch the landmarkers.
 */
import type { DetectionStep, DetectorConfig } from "./detector";
import { FrameGovernor } from "./frame-governor";
import { modelUrls } from "./model-urls";
import type { FrameTiming, TrackedFrame, TrackerOptions, TrackerStats } from "./types";
import type { TransferableFrame, WorkerRequest, WorkerResponse } from "./worker-protocol";

export interface HandTracker {
  readonly thread: "worker" | "main";
  /**
   * Runs one detection on the video's current frame without reporting it: the first detection carries the graph's
   * start-up cost (hundreds of ms), better paid while the user reads the instructions than on the first real frame.
   * Call before `start()`.
   */
  warmUp(video: HTMLVideoElement): Promise<void>;
  /**
   * Detects on the video's current frame now and reports it like any other frame; for stepping through a clip frame
   * by frame (analysis of a file, where every frame counts and nothing runs in real time). Not while `start()`ed.
   * `t` must grow from call to call.
   */
  processFrame(video: HTMLVideoElement, t: number): Promise<TrackedFrame | null>;
  /**
   * Loads the full hand model beside the tracker's own (lite) one, so frames can be read by both
   * (vision/model-pair.ts). Resolves false where that is not offered: the tracker's own model is not the lite one, or
   * the second model failed to load (the reason goes to the console). Loading twice is a no-op.
   */
  loadPairModel(): Promise<boolean>;
  /**
   * While on, each frame is read by both models: the full model's reading of the same picture comes in
   * `TrackedFrame.fullModel`. Has no effect until `loadPairModel` resolved true. A frame costs both models' time then,
   * and the frame governor lowers the frame rate to match.
   */
  setPaired(on: boolean): void;
  /** Whether frames are being read by both models now. */
  readonly paired: boolean;
  /** Follows the video's frames until `stop()`. The video must be playing (camera stream or clip). */
  start(video: HTMLVideoElement): void;
  stop(): void;
  subscribe(listener: (frame: TrackedFrame) => void): () => void;
  onTiming(listener: (timing: FrameTiming) => void): () => void;
  stats(): TrackerStats;
  /** Stops and frees the landmarkers (and the worker). */
  close(): void;
}

// Detection on the main thread may take at most this share of the time, leaving the rest for drawing and input.
const MAIN_THREAD_BUSY_SHARE = 0.5;
const WORKER_READY_TIMEOUT_MS = 30_000;

interface Backend {
  thread: "worker" | "main";
  /** Resolves with the detection step, or null when the frame could not be processed. */
  process(video: HTMLVideoElement, t: number, paired: boolean): Promise<DetectionStep | null>;
  loadPairModel(url: string): Promise<void>;
  close(): void;
}

export async function createHandTracker(options: TrackerOptions = {}): Promise<HandTracker> {
  const {
    handModel = "lite",
    forearm = false,
    poseModel = "lite",
    poseIntervalMs = 200,
    assetBaseUrl = globalThis.location?.origin ?? "",
    inputMirrored = false,
    maxFps = 30,
    thread = "auto",
    minConfidence,
  } = options;
  if (!(poseIntervalMs > 0)) throw new Error(`poseIntervalMs: expected a positive number, got ${poseIntervalMs}`);
  if (minConfidence !== undefined && !(minConfidence > 0 && minConfidence < 1)) {
    throw new Error(`minConfidence: expected a number between 0 and 1, got ${minConfidence}`);
  }
  const assetBase = new URL(assetBaseUrl || "/", globalThis.location?.href).href;
  const config: Omit<DetectorConfig, "wasmAsModule"> = {
    ...modelUrls(assetBase, handModel, forearm ? poseModel : null),
    poseIntervalMs,
    inputMirrored,
    minConfidence: minConfidence ?? null,
  };

  let backend: Backend;
  if (thread === "main" || typeof Worker === "undefined") {
    backend = await mainThreadBackend(config);
  } else {
    try {
      backend = await workerBackend(config);
    } catch (error) {
      if (thread === "worker") throw error;
      console.warn(`tracking: worker unavailable (${error instanceof Error ? error.message : String(error)}); using the main thread`);
      backend = await mainThreadBackend(config);
    }
  }

  const governor = new FrameGovernor({ maxFps, maxBusyShare: backend.thread === "worker" ? 1 : MAIN_THREAD_BUSY_SHARE });
  const frameListeners = new Set<(frame: TrackedFrame) => void>();
  const timingListeners = new Set<(timing: FrameTiming) => void>();
  let running: { video: HTMLVideoElement; startedAt: number; handle: number | null; generation: number } | null = null;
  let generation = 0;
  let framesWithHand = 0;
  let firstHandAfterMs: number | null = null;
  let pairLoaded = false;
  let pairLoading: Promise<boolean> | null = null;
  let paired = false;

  // Set when a frame arrived while another was in flight: the newest frame is then taken as soon as the slot frees,
  // instead of waiting up to a whole frame period for the next one.
  let missedWhileBusy = false;

  const emit = (step: DetectionStep, t: number, grabbedAt: number, video: HTMLVideoElement) => {
    if (video.videoWidth > 0 && video.videoHeight > 0) step.frame.imageAspect = video.videoWidth / video.videoHeight;
    const timing: FrameTiming = { t, landmarksMs: step.landmarksMs, poseMs: step.poseMs, pairMs: step.pairMs, roundTripMs: performance.now() - grabbedAt };
    // One failing consumer (a pipeline, the overlay) must neither stop the loop nor keep the others from the frame.
    const deliver = <T,>(listeners: Set<(value: T) => void>, value: T) => {
      for (const listener of listeners) {
        try {
          listener(value);
        } catch (error) {
          console.error("tracking: a frame listener failed", error);
        }
      }
    };
    deliver(frameListeners, step.frame);
    deliver(timingListeners, timing);
  };

  const onVideoFrame = (video: HTMLVideoElement, nowMs: number, mediaTimeS: number | null) => {
    if (!running || running.video !== video) return;
    schedule(running);
    process(running, nowMs, mediaTimeS);
  };

  const process = (run: NonNullable<typeof running>, nowMs: number, mediaTimeS: number | null) => {
    const video = run.video;
    if (video.readyState < 2) return;
    if (!governor.tryBegin(nowMs)) {
      if (governor.busy) missedWhileBusy = true;
      return;
    }
    missedWhileBusy = false;
    // A clip's own clock lets results line up with its frames; a camera's frames count from `start()`, so each
    // attempt's times begin near zero as the measurement pipeline expects.
    const t = video.srcObject || mediaTimeS === null ? nowMs - run.startedAt : mediaTimeS * 1000;
    const grabbedAt = performance.now();
    backend
      .process(video, t, paired)
      .then((step) => {
        if (!step || run.generation !== generation) return governor.abandon();
        governor.end(backend.thread === "worker" ? step.landmarksMs + (step.poseMs ?? 0) + (step.pairMs ?? 0) : performance.now() - grabbedAt);
        if (step.frame.hand) {
          framesWithHand++;
          if (firstHandAfterMs === null) firstHandAfterMs = performance.now() - run.startedAt;
        }
        emit(step, t, grabbedAt, video);
      })
      .catch((error: unknown) => {
        governor.abandon();
        console.error("tracking: frame failed", error);
      })
      .finally(() => {
        if (missedWhileBusy && running === run && backend.thread === "worker") {
          missedWhileBusy = false;
          process(run, performance.now(), video.currentTime);
        }
      });
  };

  const schedule = (run: NonNullable<typeof running>) => {
    const video = run.video;
    if ("requestVideoFrameCallback" in video) {
      run.handle = video.requestVideoFrameCallback((now, metadata) => onVideoFrame(video, now, metadata.mediaTime));
    } else {
      run.handle = requestAnimationFrame((now) => onVideoFrame(video, now, null));
    }
  };

  const stop = () => {
    if (!running) return;
    const { video, handle } = running;
    if (handle !== null) {
      if ("cancelVideoFrameCallback" in video) (video as HTMLVideoElement).cancelVideoFrameCallback(handle);
      else cancelAnimationFrame(handle);
    }
    running = null;
    generation++;
  };

  return {
    thread: backend.thread,
    async warmUp(video) {
      if (governor.processed > 0 || running) throw new Error("warmUp: call it before start()");
      if (video.readyState < 2) throw new Error("warmUp: the video has no frame yet (wait for loadeddata)");
      // Time 0 keeps the landmarker's clock below every later frame time, camera or clip.
      await backend.process(video, 0, false);
    },
    async processFrame(video, t) {
      if (running) throw new Error("processFrame: the tracker is following a video; stop() it first");
      if (video.readyState < 2) throw new Error("processFrame: the video has no frame at its current time");
      const grabbedAt = performance.now();
      const step = await backend.process(video, t, paired);
      if (!step) return null;
      governor.end(performance.now() - grabbedAt);
      if (step.frame.hand) framesWithHand++;
      emit(step, t, grabbedAt, video);
      return step.frame;
    },
    loadPairModel() {
      if (handModel !== "lite") return Promise.resolve(false);
      pairLoading ??= backend
        .loadPairModel(modelUrls(assetBase, "full", null).handModelUrl)
        .then(() => (pairLoaded = true))
        .catch((error: unknown) => {
          console.warn(`tracking: the second hand model could not load (${error instanceof Error ? error.message : String(error)}); reading with one model`);
          return false;
        });
      return pairLoading;
    },
    setPaired(on) {
      paired = on && pairLoaded;
    },
    get paired() {
      return paired;
    },
    start(video) {
      stop();
      running = { video, startedAt: performance.now(), handle: null, generation };
      schedule(running);
    },
    stop,
    subscribe(listener) {
      frameListeners.add(listener);
      return () => frameListeners.delete(listener);
    },
    onTiming(listener) {
      timingListeners.add(listener);
      return () => timingListeners.delete(listener);
    },
    stats: () => ({
      thread: backend.thread,
      processedFrames: governor.processed,
      skippedFrames: governor.skipped,
      framesWithHand,
      firstHandAfterMs,
      frameIntervalMs: governor.intervalMs,
    }),
    close() {
      stop();
      backend.close();
    },
  };
}

async function mainThreadBackend(config: Omit<DetectorConfig, "wasmAsModule">): Promise<Backend> {
  // Loaded only here: when the worker runs, the page never downloads the tasks library itself.
  const { createDetector } = await import("./detector");
  const detector = await createDetector({ ...config, wasmAsModule: false });
  return {
    thread: "main",
    process: async (video, t, paired) => detector.detect(video, t, paired),
    loadPairModel: (url) => detector.loadPairModel(url),
    close: () => detector.close(),
  };
}

async function grabFrame(video: HTMLVideoElement, t: number): Promise<TransferableFrame> {
  // A VideoFrame wraps the decoded frame without a copy; ImageBitmap is the older transferable fallback.
  if (typeof VideoFrame !== "undefined") {
    try {
      return new VideoFrame(video, { timestamp: Math.round(t * 1000) });
    } catch {
      // Some browsers refuse a VideoFrame from a video element (e.g. before the first frame); use a bitmap.
    }
  }
  return createImageBitmap(video);
}

async function workerBackend(config: Omit<DetectorConfig, "wasmAsModule">): Promise<Backend> {
  // The literal `new Worker(new URL(..., import.meta.url))` form is what bundlers (Next, Vite) recognise.
  const worker = new Worker(new URL("./tracker.worker.ts", import.meta.url), { type: "module", name: "kinarc-tracking" });
  const pending = new Map<number, (step: DetectionStep | null) => void>();
  let pairWaiter: { resolve: () => void; reject: (error: Error) => void } | null = null;
  let pairRequest: Promise<void> | null = null;
  let nextId = 0;
  let failure: string | null = null;

  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`no answer within ${WORKER_READY_TIMEOUT_MS} ms`)), WORKER_READY_TIMEOUT_MS);
    worker.onerror = (event) => {
      clearTimeout(timer);
      event.preventDefault();
      reject(new Error(event.message || "worker failed to load"));
    };
    worker.onmessage = (event: MessageEvent<WorkerResponse>) => {
      if (event.data.type === "ready") {
        clearTimeout(timer);
        resolve();
      } else if (event.data.type === "error") {
        clearTimeout(timer);
        reject(new Error(event.data.message));
      }
    };
    worker.postMessage({ type: "init", config } satisfies WorkerRequest);
  }).catch((error: unknown) => {
    worker.terminate();
    throw error;
  });

  worker.onmessage = (event: MessageEvent<WorkerResponse>) => {
    const message = event.data;
    if (message.type === "result" || message.type === "frame-error") {
      const resolve = pending.get(message.id);
      pending.delete(message.id);
      if (message.type === "frame-error") console.error(`tracking: ${message.message}`);
      resolve?.(message.type === "result" ? message.step : null);
    } else if (message.type === "pair-ready") {
      pairWaiter?.resolve();
      pairWaiter = null;
    } else if (message.type === "pair-error") {
      pairWaiter?.reject(new Error(message.message));
      pairWaiter = null;
    }
  };
  worker.onerror = (event) => {
    failure = event.message || "worker error";
    for (const resolve of pending.values()) resolve(null);
    pending.clear();
    pairWaiter?.reject(new Error(failure));
    pairWaiter = null;
  };

  return {
    thread: "worker",
    async process(video, t, paired) {
      if (failure) throw new Error(`tracking worker stopped: ${failure}`);
      const image = await grabFrame(video, t);
      const id = nextId++;
      return new Promise<DetectionStep | null>((resolve) => {
        pending.set(id, resolve);
        worker.postMessage({ type: "frame", id, t, image, paired } satisfies WorkerRequest, [image]);
      });
    },
    loadPairModel(url) {
      if (failure) return Promise.reject(new Error(`tracking worker stopped: ${failure}`));
      // One request at a time: the worker answers in order, and a later call shares the first's answer.
      pairRequest ??= new Promise<void>((resolve, reject) => {
        pairWaiter = { resolve, reject };
        worker.postMessage({ type: "pair-model", url } satisfies WorkerRequest);
      }).catch((error: unknown) => {
        pairRequest = null;
        throw error;
      });
      return pairRequest;
    },
    close() {
      worker.postMessage({ type: "close" } satisfies WorkerRequest);
      for (const resolve of pending.values()) resolve(null);
      pending.clear();
      pairWaiter?.reject(new Error("the tracker was closed"));
      pairWaiter = null;
    },
  };
}
