import { chromium, type Browser } from "playwright-core";

export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

// Flags from the stack notes: without the networking flags Chromium floods the closed network with requests.
// playwright-core gives every launch a fresh temporary profile folder.
const BASE_ARGS = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--autoplay-policy=no-user-gesture-required",
];

export interface LaunchOptions {
  /** An MJPEG or y4m clip for Chromium's fake camera (it loops). */
  fakeCameraClip?: string;
  extraArgs?: string[];
}

/** Launches Debian's Chromium headless; never downloads a browser. */
export async function launchChromium(options: LaunchOptions = {}): Promise<Browser> {
  const args = [...BASE_ARGS, ...(options.extraArgs ?? [])];
  if (options.fakeCameraClip) {
    args.push(
      "--use-fake-device-for-media-stream",
      "--use-fake-ui-for-media-stream",
      `--use-file-for-fake-video-capture=${options.fakeCameraClip}`,
    );
  }
  return chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args });
}
