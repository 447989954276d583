/**
 * Steps a video file through the live tracker frame by frame: the one clip path shared by the app (a client's uploaded
 * clip, analyzed in their browser or the therapist's) and `npm run -s analyze-clip` (through the tracking harness page).
 * Every frame is sought, waited for until the browser has actually presented it, and only then detected, so the
 * landmarker sees the same frames in the same order on every run. Browser-only.
 */
import type { HandTracker } from "./tracker";
import type { TrackedFrame } from "./types";

/** A clip the browser cannot load, whose length cannot be found, or which was stopped. Message starts with "clip: ". */
export class ClipStepError extends Error {
  override name = "ClipStepError";
}

// A camera clip with no stated rate is stepped at the usual camera rate.
export const FALLBACK_CLIP_FPS = 30;
// Longer than a clip may be (lib/uploads limits clips to about a minute); a guard against a clip that never ends.
const MAX_CLIP_SECONDS = 10 * 60;
// A presented frame normally follows a seek within a few ms; past this the frame already shown is taken as current
// (some browsers skip the callback when a seek lands on the frame already on screen).
const PRESENT_TIMEOUT_MS = 400;

function once(target: EventTarget, event: string, timeoutMs: number | null = null): Promise<boolean> {
  return new Promise((resolve) => {
    let timer: ReturnType<typeof setTimeout> | null = null;
    const done = (fired: boolean) => {
      target.removeEventListener(event, onEvent);
      if (timer !== null) clearTimeout(timer);
      resolve(fired);
    };
    const onEvent = () => done(true);
    target.addEventListener(event, onEvent, { once: true });
    if (timeoutMs !== null) timer = setTimeout(() => done(false), timeoutMs);
  });
}

/** Points the video at a clip and waits for its first frame (paused: nothing plays before the tracker is ready). */
export async function loadClip(video: HTMLVideoElement, src: string): Promise<void> {
  video.muted = true;
  video.playsInline = true;
  video.preload = "auto";
  await new Promise<void>((resolve, reject) => {
    const onLoaded = () => {
      video.removeEventListener("error", onError);
      resolve();
    };
    const onError = () => {
      video.removeEventListener("loadeddata", onLoaded);
      reject(new ClipStepError(`clip: could not load ${src.startsWith("blob:") ? "the file" : src} (${video.error?.message || "not a video this browser can play"})`));
    };
    video.addEventListener("loadeddata", onLoaded, { once: true });
    video.addEventListener("error", onError, { once: true });
    video.src = src;
    video.load();
  });
}

/**
 * The clip's length in seconds. A browser recorder (MediaRecorder) writes WebM without a duration; seeking far past
 * the end makes Chromium read to the end and state one, after which the clip seeks like any other.
 */
export async function clipDurationS(video: HTMLVideoElement): Promise<number> {
  if (Number.isFinite(video.duration) && video.duration > 0) return video.duration;
  const known = once(video, "durationchange", 30_000);
  const sought = once(video, "seeked", 30_000);
  video.currentTime = 1e101;
  await Promise.race([known, sought]);
  await sought;
  if (!(Number.isFinite(video.duration) && video.duration > 0)) throw new ClipStepError("clip: its duration is unknown, so its frames cannot be stepped through");
  if (video.duration > MAX_CLIP_SECONDS) throw new ClipStepError(`clip: ${Math.round(video.duration)} s is longer than ${MAX_CLIP_SECONDS} s`);
  return video.duration;
}

/**
 * Seeks to `timeS` and resolves once that frame is on screen, with its media time when the browser says it
 * (requestVideoFrameCallback). `seeked` alone can fire before the decoder has handed over the new frame, and a grab
 * then reads the previous one: runs differed after a few dozen frames that way.
 */
export async function seekAndPresent(video: HTMLVideoElement, timeS: number): Promise<number | null> {
  let presented: Promise<number | null> = Promise.resolve(null);
  let cancel = () => {};
  if ("requestVideoFrameCallback" in video) {
    presented = new Promise((resolve) => {
      const handle = video.requestVideoFrameCallback((_now, metadata) => resolve(metadata.mediaTime));
      cancel = () => {
        video.cancelVideoFrameCallback(handle);
        resolve(null);
      };
    });
  }
  const sought = once(video, "seeked");
  video.currentTime = timeS;
  await sought;
  const timer = setTimeout(cancel, PRESENT_TIMEOUT_MS);
  const mediaTime = await presented;
  clearTimeout(timer);
  return mediaTime;
}

/**
 * Frames a second of the clip, from the media times of frames the browser presents while it plays a moment (muted).
 * Browsers expose no frame rate for a file; the spacing of presented frames is it.
 */
export async function measureClipFps(video: HTMLVideoElement): Promise<number> {
  if (!("requestVideoFrameCallback" in video)) return FALLBACK_CLIP_FPS;
  const times: number[] = [];
  await seekAndPresent(video, 0);
  await new Promise<void>((resolve) => {
    const timer = setTimeout(() => resolve(), 3000);
    const onFrame = (_now: number, metadata: VideoFrameCallbackMetadata) => {
      times.push(metadata.mediaTime);
      if (times.length >= 12 || video.ended) {
        clearTimeout(timer);
        resolve();
      } else video.requestVideoFrameCallback(onFrame);
    };
    video.requestVideoFrameCallback(onFrame);
    // A slow rate presents every frame even on a busy machine, so the spacing is one frame, not several.
    video.playbackRate = 0.25;
    void video.play().catch(() => resolve());
  });
  video.pause();
  video.playbackRate = 1;
  return frameRateFromMediaTimes(times) ?? FALLBACK_CLIP_FPS;
}

// Rates cameras and encoders use; a measured rate within 1% of one is that rate. A few frames on a millisecond clock
// cannot tell 29.97 from 30 (0.1% apart); stepping an NTSC clip at 30 misplaces one frame in about 33 s.
const COMMON_FPS = [12, 15, 24, 25, 30, 48, 50, 60, 90, 120];

/**
 * Frames a second from the media times of consecutive presented frames, or null when there are too few. Media times
 * are rounded to the container's clock (whole ms in WebM), so single gaps read 33 or 34 ms at 30 fps: the rate is
 * frames counted over time spanned, each gap counted as the whole number of frames it holds (a dropped frame makes
 * a double gap).
 */
export function frameRateFromMediaTimes(times: readonly number[]): number | null {
  const gaps = times
    .slice(1)
    .map((t, i) => t - times[i])
    .filter((g) => g > 1e-4);
  if (gaps.length < 3) return null;
  const sorted = [...gaps].sort((a, b) => a - b);
  // The smaller gaps are single frames; dropped frames only make larger ones.
  const oneFrameS = sorted[Math.floor(sorted.length / 4)];
  const frames = gaps.reduce((sum, g) => sum + Math.max(1, Math.round(g / oneFrameS)), 0);
  const fps = frames / gaps.reduce((sum, g) => sum + g, 0);
  if (!(fps >= 1 && fps <= 240)) return null;
  const common = COMMON_FPS.find((c) => Math.abs(fps - c) / c <= 0.01);
  return common ?? Math.round(fps * 100) / 100;
}

export interface StepOptions {
  /** The clip's frame rate; measured from the clip when not given (the CLI gives ffprobe's). */
  fps?: number;
  /** Called after each frame with how far the stepping is. */
  onProgress?: (done: number, total: number) => void;
  signal?: AbortSignal;
}

export interface SteppedClip {
  frames: TrackedFrame[];
  fps: number;
  durationS: number;
  videoWidth: number;
  videoHeight: number;
  /** Frames whose presented media time fell outside their own interval (should be 0; reported, not hidden). */
  offFrames: number;
}

/**
 * Every frame of the loaded clip, in order, each at its own time: frame i is shown from i/fps to (i+1)/fps and is
 * reported at t = i/fps. The tracker must be warmed up and not following a video (`start()`).
 */
export async function stepThroughClip(video: HTMLVideoElement, tracker: HandTracker, options: StepOptions = {}): Promise<SteppedClip> {
  const durationS = await clipDurationS(video);
  const fps = options.fps ?? (await measureClipFps(video));
  if (!(fps > 0)) throw new ClipStepError(`clip: expected a positive frame rate, got ${fps}`);
  video.pause();
  const frameCount = Math.round(durationS * fps);
  const frames: TrackedFrame[] = [];
  let offFrames = 0;
  for (let i = 0; i < frameCount; i++) {
    if (options.signal?.aborted) throw new ClipStepError("clip: stopped before the last frame");
    // The middle of the frame's interval, so rounding never lands on a neighbour.
    const mediaTime = await seekAndPresent(video, (i + 0.5) / fps);
    if (mediaTime !== null && (mediaTime < i / fps - 0.002 || mediaTime >= (i + 1) / fps + 0.002)) offFrames++;
    const frame = await tracker.processFrame(video, (i * 1000) / fps);
    // A frame the tracker could not read still counts, as "no hand", so the frame count stays honest.
    frames.push(frame ?? { t: (i * 1000) / fps, score: 0, handedness: null, hand: null, image: null });
    options.onProgress?.(i + 1, frameCount);
  }
  return { frames, fps, durationS, videoWidth: video.videoWidth, videoHeight: video.videoHeight, offFrames };
}
