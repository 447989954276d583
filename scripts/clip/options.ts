/**
 * Command-line options of analyze-clip. Pure, so the unit test can check every refusal without a browser.
 */
import { CONDITIONS, DIGITS, MOTIONS, MOTION_IDS, SIDES, digitAllowed, isOneFingerMotion, type Condition, type Digit, type MotionId, type Side } from "@/lib/motions/catalog";

/** Bad flags, a missing file, a file that is not a video, a clip without a hand: exit status 2. */
export class ClipInputError extends Error {}

export interface ClipOptions {
  motion: MotionId;
  side: Side;
  digit: Digit | null;
  condition: Condition;
  /** `--one-finger`: the finger bent on its own, the others held straight (read with the single-finger error). */
  oneFinger: boolean;
  out: string | null;
  /** Frame rate to read an MJPEG stream at (it carries none); other containers state their own. */
  mjpegFps: number;
  /** Passed on to analyze unchanged (--scale, --reference, --table), which checks them. */
  analyzeArgs: string[];
  clip: string;
}

// Chromium's fake camera and the render harness both write MJPEG at 30 frames a second.
export const DEFAULT_MJPEG_FPS = 30;

function oneOf<T extends string>(flag: string, value: string, allowed: readonly T[]): T {
  if (!(allowed as readonly string[]).includes(value)) throw new ClipInputError(`${flag}: expected one of ${allowed.join(", ")}, got ${JSON.stringify(value)}`);
  return value as T;
}

export function parseClipArgs(argv: readonly string[]): ClipOptions {
  const given: Partial<Record<"motion" | "side" | "digit" | "condition" | "out" | "fps", string>> = {};
  const analyzeArgs: string[] = [];
  const clips: string[] = [];
  let oneFinger = false;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    const value = () => {
      const v = argv[++i];
      if (v === undefined || v.startsWith("--")) throw new ClipInputError(`${arg}: expected a value`);
      return v;
    };
    if (arg === "--motion" || arg === "--side" || arg === "--digit" || arg === "--condition" || arg === "--out" || arg === "--fps") {
      given[arg.slice(2) as keyof typeof given] = value();
    } else if (arg === "--one-finger") {
      oneFinger = true;
    } else if (arg === "--scale" || arg === "--reference" || arg === "--table") {
      analyzeArgs.push(arg, value());
    } else if (arg.startsWith("--")) {
      throw new ClipInputError(`${arg}: unknown option (expected --motion, --side, --digit, --condition, --one-finger, --out, --fps, --scale, --reference, --table)`);
    } else {
      clips.push(arg);
    }
  }
  if (given.motion === undefined) throw new ClipInputError(`--motion: expected one of ${MOTION_IDS.join(", ")}`);
  const motion = oneOf("--motion", given.motion, MOTION_IDS);
  if (given.side === undefined) throw new ClipInputError(`--side: expected ${SIDES.join(" or ")}`);
  const side = oneOf("--side", given.side, SIDES);
  const digit = given.digit === undefined ? null : oneOf("--digit", given.digit, DIGITS);
  if (!digitAllowed(motion, digit)) {
    const def = MOTIONS[motion];
    throw new ClipInputError(def.joint === "wrist" ? `--digit: expected none for ${motion}` : `--digit: expected one of ${def.digits.join(", ")} for ${motion}`);
  }
  if (given.condition === undefined) throw new ClipInputError(`--condition: expected ${CONDITIONS.join(" or ")}`);
  const condition = oneOf("--condition", given.condition, CONDITIONS);
  if (oneFinger && !isOneFingerMotion(motion, digit)) throw new ClipInputError(`--one-finger: expected a finger's MCP, PIP or DIP motion with --digit index, middle, ring or little, got ${motion}${digit ? ` --digit ${digit}` : ""}`);
  let mjpegFps = DEFAULT_MJPEG_FPS;
  if (given.fps !== undefined) {
    mjpegFps = Number(given.fps);
    if (!Number.isFinite(mjpegFps) || mjpegFps < 1 || mjpegFps > 240) throw new ClipInputError(`--fps: expected frames a second from 1 to 240, got ${JSON.stringify(given.fps)}`);
  }
  if (clips.length !== 1) throw new ClipInputError(clips.length === 0 ? "CLIP: expected a video file (webm, mp4 or mjpeg)" : `CLIP: expected one video file, got ${clips.length}`);
  return { motion, side, digit, condition, oneFinger, out: given.out ?? null, mjpegFps, analyzeArgs, clip: clips[0] };
}
