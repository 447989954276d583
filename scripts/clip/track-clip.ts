/**
 * Runs the app's own tracking code (vision/live, through the tracking harness page in step mode) on every frame of a
 * clip in headless Debian Chromium and returns the tracked frames.
 */
import path from "node:path";
import type { Browser } from "playwright-core";
import { launchChromium, openHarnessPage, startHarnessServer, waitForFrames, type HarnessServer } from "@/tests/harness/tracking-harness";
import type { TrackedFrame } from "@/vision/live/types";
import { ClipInputError } from "./options";
import type { PreparedClip } from "./prepare";

export interface TrackedClip {
  frames: TrackedFrame[];
  videoWidth: number;
  videoHeight: number;
  thread: "worker" | "main" | null;
}

// 4310-4319 are the tracking harness's ports; the default one is often held by a test suite, so try the others too.
const HARNESS_PORTS = [4317, 4318, 4319, 4316, 4315, 4314, 4313, 4312, 4311, 4310];

async function startOnFreePort(allowDirs: string[]): Promise<HarnessServer> {
  let lastError: unknown = null;
  for (const port of HARNESS_PORTS) {
    try {
      return await startHarnessServer({ port, allowDirs });
    } catch (error) {
      lastError = error;
      if (!/in use|EADDRINUSE/i.test((error as Error).message)) throw error;
    }
  }
  throw new Error(`tracking harness: no free port in 4310-4319 (${(lastError as Error).message})`);
}

export interface TrackClipOptions {
  model?: "lite" | "full";
}

export async function trackClip(clip: PreparedClip, options: TrackClipOptions = {}): Promise<TrackedClip> {
  const server = await startOnFreePort([path.dirname(clip.file)]);
  let browser: Browser | null = null;
  try {
    browser = await launchChromium();
    const page = await openHarnessPage(browser, server, { clip: server.fileUrl(clip.file), step: true, fps: clip.fps, model: options.model ?? "lite" });
    let state;
    try {
      // Stepping costs a seek plus one detection a frame (tens of ms on shared cores); a 60 s clip at 30 fps fits well.
      state = await waitForFrames(page, Number.MAX_SAFE_INTEGER, 15 * 60_000);
    } catch (error) {
      const message = (error as Error).message;
      // The page's own words for a file the video element cannot load or step through.
      if (/harness: .*clip:/.test(message)) throw new ClipInputError(`CLIP: ${message.replace(/^harness: (Error: )?clip: /, "")}`);
      throw error;
    }
    return { frames: state.frames, videoWidth: state.videoWidth, videoHeight: state.videoHeight, thread: state.thread };
  } finally {
    await browser?.close();
    await server.close();
  }
}
