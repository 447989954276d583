/**
 * Node side of the tracking harness: serves tests/harness/tracking with Vite (the page imports vision/live as is;
 * /models and /mediapipe/wasm come from public/, built by `npm run models`), opens it in Debian's Chromium and reads
 * the frame stream back. Used by the browser tests, the benchmark and, later, clip analysis.
 */
import fs from "node:fs";
import path from "node:path";
import type { Browser, Page } from "playwright-core";
import { createLogger, createServer, type ViteDevServer } from "vite";
import { launchChromium } from "../e2e/support/browser";
import type { HarnessState } from "./tracking/main";

export type { HarnessState };

const REPO_ROOT = path.resolve(__dirname, "..", "..");
const PAGE_ROOT = path.join(REPO_ROOT, "tests", "harness", "tracking");
/** Ports 4310-4319 are reserved for the tracking harness. */
export const HARNESS_PORT = Number(process.env.KINARC_HARNESS_PORT ?? 4310);

export interface HarnessServer {
  origin: string;
  /** URL under which the page can fetch a local file (e.g. a clip in tests/.cache). */
  fileUrl(absolutePath: string): string;
  close(): Promise<void>;
}

export interface HarnessServerOptions {
  port?: number;
  /** Folders outside the repository the page may read clips from (e.g. the folder of a clip given on a command line). */
  allowDirs?: string[];
}

/** `startHarnessServer(port)` is the older form, kept for callers that only choose the port. */
export async function startHarnessServer(options: HarnessServerOptions | number = {}): Promise<HarnessServer> {
  const { port = HARNESS_PORT, allowDirs = [] } = typeof options === "number" ? { port: options } : options;
  for (const required of ["public/models/hand_landmarker_lite.task", "public/mediapipe/wasm/vision_wasm_internal.wasm"]) {
    if (!fs.existsSync(path.join(REPO_ROOT, required))) throw new Error(`${required}: missing; run npm run models`);
  }
  // The tasks library names a source map it does not ship; Vite's warning about it is noise here.
  const logger = createLogger("warn");
  const warn = logger.warn.bind(logger);
  logger.warn = (message, options) => {
    if (!message.includes("Failed to load source map")) warn(message, options);
  };
  const server: ViteDevServer = await createServer({
    customLogger: logger,
    configFile: false,
    root: PAGE_ROOT,
    publicDir: path.join(REPO_ROOT, "public"),
    cacheDir: path.join(REPO_ROOT, "tests", ".cache", "vite-tracking-harness"),
    logLevel: "warn",
    clearScreen: false,
    resolve: { alias: { "@": REPO_ROOT } },
    // The tasks library is one ES module already; skipping the optimiser avoids a reload when the worker first asks for it.
    optimizeDeps: { noDiscovery: true, include: [] },
    server: { host: "127.0.0.1", port, strictPort: true, hmr: false, fs: { allow: [REPO_ROOT, ...allowDirs.map((d) => path.resolve(d))] } },
  });
  await server.listen();
  const origin = `http://127.0.0.1:${port}`;
  return {
    origin,
    fileUrl: (absolutePath) => `${origin}/@fs${path.resolve(absolutePath)}`,
    close: () => server.close(),
  };
}

export interface HarnessQuery {
  clip?: string;
  rate?: number;
  /** Seek through the clip frame by frame instead of playing it: every frame is processed. */
  step?: boolean;
  fps?: number;
  model?: "lite" | "full";
  forearm?: boolean;
  thread?: "auto" | "worker" | "main";
  maxFps?: number;
  minConfidence?: number;
  /** Read every frame with the full hand model too. */
  paired?: boolean;
}

export async function openHarnessPage(browser: Browser, server: HarnessServer, query: HarnessQuery = {}): Promise<Page> {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined) continue;
    params.set(key, typeof value === "boolean" ? (value ? "1" : "0") : String(value));
  }
  const page = await browser.newPage();
  page.on("pageerror", (error) => console.error(`harness page: ${error.message}`));
  await page.goto(`${server.origin}/index.html?${params}`);
  return page;
}

export function readHarness(page: Page): Promise<HarnessState> {
  return page.evaluate(() => window.kinarcHarness);
}

/** Waits until the page has `frames` processed frames (or the clip ended); throws with the page's error if it failed. */
export async function waitForFrames(page: Page, frames: number, timeoutMs = 60_000): Promise<HarnessState> {
  await page.waitForFunction(
    (n) => {
      const s = window.kinarcHarness;
      return s && (s.status === "failed" || s.status === "ended" || s.frames.length >= n);
    },
    frames,
    { timeout: timeoutMs, polling: 100 },
  );
  const state = await readHarness(page);
  if (state.status === "failed") throw new Error(`harness: ${state.error}`);
  return state;
}

/** Launches Chromium with the fake camera playing `clip` (MJPEG, looped). */
export function launchWithFakeCamera(clip: string): Promise<Browser> {
  return launchChromium({ fakeCameraClip: clip });
}

export { launchChromium };
