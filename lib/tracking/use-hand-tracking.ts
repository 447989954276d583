"use client";

/**
 * Camera → live tracker (vision/live) → the measurement engine's live pipeline, as a React hook. Exposes the latest
 * frame, angle, quality, plane verdict, repetition state and frame rate, runs the set-up checks, and records frames
 * into a capture file (format v1) between `startRecording` and `stopRecording`. Everything is released on unmount.
 * Finger flexion can be read by both hand models while recording (`bothModels`), as an uploaded clip is.
 */
import { useCallback, useEffect, useLayoutEffect, useRef, useState, type RefObject } from "react";
import type { CaptureFile } from "@/lib/capture/schema";
import { MOTIONS, type Condition, type Digit, type MotionId, type Side } from "@/lib/motions/catalog";
import { createLivePipeline, type LivePipeline, type LiveUpdate } from "@/vision/pipeline";
import type { HandTracker } from "@/vision/live/tracker";
import type { ModelVariant, TrackedFrame } from "@/vision/live/types";
import { readsWithBothModels } from "@/vision/model-pair-scope";
import type { Vec3 } from "@/vision/vec";
import { neutralReading, type NeutralFrame, type NeutralReading } from "@/vision/wrist-axis";
import { CaptureRecorder } from "./capture-recorder";
import { PAIRED_WINDOW_MS, pairingTooSlow } from "./pairing";
import { withNeutralFrames } from "./neutral-frames";
import { gravityInCamera, type CameraFacing } from "./gravity";
import { meanLuma, runSetupChecks, type SetupCheck } from "./setup-checks";

export interface HandTrackingOptions {
  motion: MotionId;
  side: Side;
  digit: Digit | null;
  condition: Condition;
  /** The tested finger bends on its own, the others held straight (the therapist's choice in a visit). */
  oneFinger?: boolean;
  videoRef: RefObject<HTMLVideoElement | null>;
  /** Camera and tracker run only while true. */
  enabled: boolean;
  facing?: CameraFacing;
  handModel?: ModelVariant;
  /** The preview is shown mirrored (the usual selfie view); only affects the wording of the set-up checks. */
  displayMirrored?: boolean;
  /**
   * Reading with both hand models (vision/model-pair.ts), only where tracking runs in a worker, so the page stays
   * responsive: "ready" loads the full model beside the lite one now; "on" also reads every frame with it while the
   * motion is one both models were measured on together (four fingers' flexion; not a finger on its own), and an
   * attempt recorded then keeps both models' frames. Each such frame costs both models' time, so the frame rate drops
   * (by about a third on a laptop). Default "off".
   */
  bothModels?: "off" | "ready" | "on";
  /** A recording keeps only its last this-many milliseconds (lib/tracking/capture-recorder.ts `keepLastMs`). */
  keepLastMs?: number;
}

export interface HandTrackingState {
  status: "idle" | "starting" | "running" | "failed";
  error: string | null;
  thread: "worker" | "main" | null;
  frame: TrackedFrame | null;
  update: LiveUpdate | null;
  /** Processed frames per second over the last second. */
  fps: number;
  videoWidth: number;
  videoHeight: number;
  lumaMean: number | null;
  gravity: Vec3 | null;
  checks: SetupCheck[];
  recording: boolean;
  recordedFrames: number;
  /** The straight-wrist reading for wrist motions: idle until asked for, then holding (0-1 done), then taken or refused. */
  neutral: NeutralState;
  /** The motion, side, digit and test position the neutral state belongs to; it is shown only for that target. */
  neutralFor: string | null;
  /** Frames are being read by both hand models now (see `bothModels`). */
  paired: boolean;
  /** Reading with both models was stopped for this camera session: this device kept too few frames a second (lib/tracking/pairing.ts). */
  pairingStopped: boolean;
}

export type NeutralState =
  | { status: "none" }
  | { status: "holding"; progress: number }
  | { status: "taken"; reading: NeutralReading }
  | { status: "refused"; problem: string };

/** How long the wrist is held straight for the neutral reading: long enough to average jitter, short enough to hold still. */
export const NEUTRAL_HOLD_MS = 3000;

const CHECK_WINDOW_MS = 1500;
const LUMA_EVERY_MS = 500;
// A sensor reading older than this no longer describes how the device is held.
const GRAVITY_FRESH_MS = 2000;

const INITIAL: HandTrackingState = {
  status: "idle",
  error: null,
  thread: null,
  frame: null,
  update: null,
  fps: 0,
  videoWidth: 0,
  videoHeight: 0,
  lumaMean: null,
  gravity: null,
  checks: [],
  recording: false,
  recordedFrames: 0,
  neutral: { status: "none" },
  neutralFor: null,
  paired: false,
  pairingStopped: false,
};

function targetKey(t: { motion: MotionId; side: Side; digit: Digit | null; condition: Condition }): string {
  return `${t.motion}|${t.side}|${t.digit ?? ""}|${t.condition}`;
}

function cameraError(error: unknown): string {
  const name = error instanceof DOMException ? error.name : "";
  if (name === "NotAllowedError" || name === "SecurityError") return "The camera was not allowed. Allow camera access for this site in your browser's settings, then try again.";
  if (name === "NotFoundError" || name === "OverconstrainedError") return "No camera was found. Connect a camera, or use a phone or laptop that has one.";
  if (name === "NotReadableError") return "The camera is in use by another app. Close the other app, then try again.";
  return `Hand tracking could not start: ${error instanceof Error ? error.message : String(error)}`;
}

export function useHandTracking(options: HandTrackingOptions) {
  const { motion, side, digit, condition, oneFinger = false, videoRef, enabled, facing = "user", handModel = "lite", displayMirrored = true, bothModels = "off", keepLastMs } = options;
  const [state, setState] = useState<HandTrackingState>(INITIAL);

  const pipelineRef = useRef<LivePipeline | null>(null);
  const recorderRef = useRef<CaptureRecorder | null>(null);
  const trackerRef = useRef<HandTracker | null>(null);
  // Since when frames have been read by both models, and whether that was stopped for being too slow here.
  const pairedSinceRef = useRef<number | null>(null);
  const pairingStoppedRef = useRef(false);
  const pairedTimesRef = useRef<number[]>([]);
  const recentRef = useRef<TrackedFrame[]>([]);
  const frameTimesRef = useRef<number[]>([]);
  const lumaRef = useRef<number | null>(null);
  const gravityRef = useRef<{ at: number; value: Vec3 } | null>(null);
  const targetRef = useRef({ motion, side, digit, condition, oneFinger });
  // Frames of the neutral reading while it is held, and the frames and reading kept once it is taken.
  const neutralHoldRef = useRef<{ startT: number | null; frames: NeutralFrame[] } | null>(null);
  const neutralRef = useRef<{ frames: NeutralFrame[]; reading: NeutralReading } | null>(null);
  useLayoutEffect(() => {
    targetRef.current = { motion, side, digit, condition, oneFinger };
  }, [motion, side, digit, condition, oneFinger]);

  // The correction and the stated uncertainty differ by landmark model (vision/correction.ts).
  const handModelRef = useRef(handModel);
  useLayoutEffect(() => {
    handModelRef.current = handModel;
  }, [handModel]);

  const freshGravity = () => {
    const g = gravityRef.current;
    return g && performance.now() - g.at <= GRAVITY_FRESH_MS ? g.value : null;
  };

  const newPipeline = useCallback(() => {
    const t = targetRef.current;
    pipelineRef.current = createLivePipeline({ ...t, gravity: freshGravity(), handModel: handModelRef.current, neutral: neutralRef.current?.reading ?? null });
  }, []);

  // A new motion or side starts a fresh reading, and a neutral reading taken for another one no longer holds.
  useEffect(() => {
    neutralRef.current = null;
    neutralHoldRef.current = null;
    newPipeline();
  }, [motion, side, digit, condition, oneFinger, handModel, newPipeline]);

  useEffect(() => {
    if (!enabled) return;
    const video = videoRef.current;
    if (!video) return;
    let cancelled = false;
    let stream: MediaStream | null = null;
    let tracker: HandTracker | null = null;
    let lumaTimer: ReturnType<typeof setInterval> | null = null;
    const sampler = document.createElement("canvas");
    sampler.width = 32;
    sampler.height = 24;
    const samplerCtx = sampler.getContext("2d", { willReadFrequently: true });

    const onMotion = (event: DeviceMotionEvent) => {
      const screenAngle = typeof screen !== "undefined" && screen.orientation ? screen.orientation.angle : 0;
      const g = gravityInCamera(event.accelerationIncludingGravity, facing, screenAngle);
      if (g) gravityRef.current = { at: performance.now(), value: g };
    };
    window.addEventListener("devicemotion", onMotion);

    const onFrame = (frame: TrackedFrame) => {
      if (cancelled) return;
      const now = performance.now();
      const times = frameTimesRef.current;
      times.push(now);
      while (times.length && now - times[0] > 1000) times.shift();
      let pairingStopped = false;
      if (tracker?.paired) {
        pairedSinceRef.current ??= now;
        const paired = pairedTimesRef.current;
        paired.push(now);
        while (paired.length && now - paired[0] > PAIRED_WINDOW_MS) paired.shift();
        if (pairingTooSlow(paired, now, pairedSinceRef.current)) {
          tracker.setPaired(false);
          pairingStoppedRef.current = true;
          pairingStopped = true;
        }
      } else {
        pairedSinceRef.current = null;
        pairedTimesRef.current = [];
      }
      const recent = recentRef.current;
      recent.push(frame);
      while (recent.length && frame.t - recent[0].t > CHECK_WINDOW_MS) recent.shift();

      const update = pipelineRef.current?.push({ t: frame.t, score: frame.score, hand: frame.hand, forearm: frame.forearm ?? null, image: frame.image, imageAspect: frame.imageAspect }) ?? null;
      recorderRef.current?.push(frame);
      const neutral = holdNeutral(frame);
      const gravity = freshGravity();
      const t = targetRef.current;
      const checks = runSetupChecks({
        frames: recent,
        side: t.side,
        motion: t.motion,
        lumaMean: lumaRef.current,
        videoWidth: video.videoWidth,
        videoHeight: video.videoHeight,
        displayMirrored,
        gravitySource: gravity ? "sensor" : "none",
        condition: t.condition,
        digit: t.digit,
      });
      setState((s) => ({
        ...s,
        frame,
        update,
        fps: times.length,
        videoWidth: video.videoWidth,
        videoHeight: video.videoHeight,
        lumaMean: lumaRef.current,
        gravity,
        checks,
        recordedFrames: recorderRef.current?.frameCount ?? 0,
        ...(neutral ? { neutral, neutralFor: targetKey(t) } : {}),
        ...(pairingStopped ? { paired: false, pairingStopped: true } : {}),
      }));
    };

    /** Collects a frame into the neutral hold; when the hold is over, takes the reading (or says why not). */
    const holdNeutral = (frame: TrackedFrame): NeutralState | null => {
      const hold = neutralHoldRef.current;
      if (!hold) return null;
      hold.startT ??= frame.t;
      const t = frame.t - hold.startT;
      hold.frames.push({ t, score: frame.score, hand: frame.hand });
      if (t < NEUTRAL_HOLD_MS) return { status: "holding", progress: t / NEUTRAL_HOLD_MS };
      neutralHoldRef.current = null;
      const outcome = neutralReading(hold.frames, targetRef.current.side);
      if (!outcome.ok) return { status: "refused", problem: outcome.problem };
      neutralRef.current = { frames: hold.frames, reading: outcome.reading };
      newPipeline();
      return { status: "taken", reading: outcome.reading };
    };

    (async () => {
      setState((s) => ({ ...s, status: "starting", error: null }));
      const { createHandTracker } = await import("@/vision/live/tracker");
      const trackerReady = createHandTracker({ handModel, forearm: MOTIONS[targetRef.current.motion].joint === "wrist" });
      stream = await navigator.mediaDevices.getUserMedia({ video: { facingMode: facing, width: { ideal: 640 }, height: { ideal: 480 } }, audio: false });
      if (cancelled) return;
      video.srcObject = stream;
      video.muted = true;
      video.playsInline = true;
      await video.play();
      if (video.readyState < 2) await new Promise((resolve) => video.addEventListener("loadeddata", resolve, { once: true }));
      tracker = await trackerReady;
      trackerRef.current = tracker;
      if (cancelled) return;
      await tracker.warmUp(video);
      if (cancelled) return;
      tracker.subscribe(onFrame);
      tracker.start(video);
      lumaTimer = setInterval(() => {
        if (!samplerCtx || video.readyState < 2) return;
        samplerCtx.drawImage(video, 0, 0, sampler.width, sampler.height);
        lumaRef.current = meanLuma(samplerCtx.getImageData(0, 0, sampler.width, sampler.height).data);
      }, LUMA_EVERY_MS);
      setState((s) => ({ ...s, status: "running", thread: tracker!.thread }));
    })().catch((error: unknown) => {
      if (!cancelled) setState((s) => ({ ...s, status: "failed", error: cameraError(error) }));
    });

    return () => {
      cancelled = true;
      window.removeEventListener("devicemotion", onMotion);
      if (lumaTimer) clearInterval(lumaTimer);
      tracker?.close();
      trackerRef.current = null;
      pairedSinceRef.current = null;
      pairedTimesRef.current = [];
      pairingStoppedRef.current = false;
      for (const track of stream?.getTracks() ?? []) track.stop();
      if (video.srcObject === stream) video.srcObject = null;
      recentRef.current = [];
      frameTimesRef.current = [];
      recorderRef.current = null;
      setState(INITIAL);
    };
  }, [enabled, facing, handModel, displayMirrored, videoRef, newPipeline]);

  // The second model: loaded when asked for; frames read by both only while "on" and the motion is one both models
  // were measured on. Where tracking runs on the page's own thread it stays off: two models would halve the page's time.
  const loadsPair = bothModels !== "off" && handModel === "lite";
  const wantsPair = loadsPair && bothModels === "on" && !oneFinger && readsWithBothModels(motion, digit);
  const running = state.status === "running" && state.thread === "worker";
  // Read when recording starts (a visit starts it from a message handler, right after choosing the test).
  const recordPairRef = useRef(false);
  const keepLastMsRef = useRef(keepLastMs);
  useLayoutEffect(() => {
    keepLastMsRef.current = keepLastMs;
  }, [keepLastMs]);
  useLayoutEffect(() => {
    recordPairRef.current = running && wantsPair;
  }, [running, wantsPair]);
  useEffect(() => {
    const tracker = trackerRef.current;
    if (!running || !tracker) return;
    if (!wantsPair || pairingStoppedRef.current) tracker.setPaired(false);
    if (!loadsPair || pairingStoppedRef.current) return;
    let current = true;
    void tracker.loadPairModel().then((loaded) => {
      if (!current) return;
      tracker.setPaired(loaded && wantsPair && !pairingStoppedRef.current);
      setState((s) => (s.paired === tracker.paired ? s : { ...s, paired: tracker.paired }));
    });
    return () => {
      current = false;
    };
  }, [running, loadsPair, wantsPair]);

  /**
   * Starts a neutral reading: the next NEUTRAL_HOLD_MS of frames, wrist straight and forearm still on the table. The
   * attempts that follow read the wrist against it, and their capture files carry its frames for the server.
   */
  const takeNeutral = useCallback(() => {
    neutralRef.current = null;
    neutralHoldRef.current = { startT: null, frames: [] };
    setState((s) => ({ ...s, neutral: { status: "holding", progress: 0 }, neutralFor: targetKey(targetRef.current) }));
  }, []);

  /** Starts a fresh reading (repetitions counted from here) and records every frame until `stopRecording`. */
  const startRecording = useCallback(() => {
    newPipeline();
    const t = targetRef.current;
    // With both models wanted, the recorder keeps the second model's frames where it read enough of them: pairing may
    // begin a moment after recording does, while the second model loads (MIN_PAIRED_SHARE).
    recorderRef.current = new CaptureRecorder(t, { gravity: freshGravity(), pairModel: recordPairRef.current, keepLastMs: keepLastMsRef.current });
    // The preview's last reading (and its repetition count) must not leak into the attempt's first render.
    setState((s) => ({ ...s, recording: true, recordedFrames: 0, update: null }));
  }, [newPipeline]);

  /** Stops recording; returns the capture file and the engine's summary of the live reading, or null if nothing was recorded. */
  const stopRecording = useCallback((): { capture: CaptureFile; summary: ReturnType<LivePipeline["summary"]> } | null => {
    const recorder = recorderRef.current;
    recorderRef.current = null;
    setState((s) => ({ ...s, recording: false }));
    const capture = recorder?.finish() ?? null;
    // The neutral frames travel with the attempt, so the server takes the same reading the browser did.
    const withNeutral = capture && neutralRef.current ? withNeutralFrames(capture, neutralRef.current.frames) : capture;
    const summary = pipelineRef.current?.summary() ?? null;
    return withNeutral && summary ? { capture: withNeutral, summary } : null;
  }, []);

  /** iOS asks for permission to read motion sensors, and only from a tap: call this from a button's handler. */
  const requestMotionSensors = useCallback(async () => {
    const request = (globalThis.DeviceMotionEvent as unknown as { requestPermission?: () => Promise<string> } | undefined)?.requestPermission;
    if (typeof request === "function") await request().catch(() => "denied");
  }, []);

  // A neutral reading taken for another motion, side or position does not hold for this one (the refs were cleared).
  const neutral: NeutralState = state.neutralFor === targetKey({ motion, side, digit, condition }) ? state.neutral : { status: "none" };
  // Stale once the pairing is no longer wanted: the tracker has already stopped it then.
  const paired = state.paired && wantsPair;
  return { ...state, neutral, paired, startRecording, stopRecording, requestMotionSensors, takeNeutral };
}
