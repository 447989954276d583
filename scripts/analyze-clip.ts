// npm run -s analyze-clip -- --motion ID --side left|right [--digit D] [--one-finger] --condition C [--out capture.json] [--fps N]
//                             [--scale S] [--reference DEG] [--table ID] CLIP
// Runs the app's own tracking code in headless Chromium on every frame of a video file (webm, mp4, or MJPEG read at
// --fps, default 30), builds a capture file v1 (written to --out when given) and prints the same JSON as `analyze`
// gives for that capture. A finger's MCP, PIP or DIP flexion clip is tracked by both hand models, as an upload is
// (vision/model-pair.ts). Bad input (flags, missing file, not a video, no hand in view): exit 2, one line on stderr,
// nothing on stdout.
import { writeFileSync } from "node:fs";
import { CaptureFormatError } from "@/lib/capture/parse";
import { UsageError, analyzeFiles } from "./analyze";
import { captureFromFrames, handednessNote } from "./clip/capture";
import { ClipInputError, parseClipArgs } from "./clip/options";
import { prepareClip, remuxClip } from "./clip/prepare";
import { trackClip } from "./clip/track-clip";
import { withFullModelFrames } from "@/vision/live/clip-capture";
import { readsWithBothModels } from "@/vision/model-pair-scope";

/** Lets analyze refuse a bad --scale/--reference/--table before Chromium starts (it reads no file until the flags pass). */
function checkAnalyzeFlags(analyzeArgs: readonly string[]): void {
  try {
    analyzeFiles([...analyzeArgs, "flags-only"], () => {
      throw new Error("flags checked");
    });
  } catch (error) {
    if (!(error instanceof CaptureFormatError)) throw error;
  }
}

export async function analyzeClip(argv: readonly string[]) {
  const options = parseClipArgs(argv);
  checkAnalyzeFlags(options.analyzeArgs);
  let prepared = prepareClip(options.clip, options.mjpegFps);
  try {
    let tracked;
    try {
      tracked = await trackClip(prepared);
    } catch (error) {
      if (!(error instanceof ClipInputError && /duration is unknown/.test(error.message)) || prepared.container === "mjpeg") throw error;
      prepared = remuxClip(prepared);
      tracked = await trackClip(prepared);
    }
    const seen = handednessNote(tracked.frames, options.side);
    if (seen) process.stderr.write(`analyze-clip: note: ${seen}\n`);
    const target = { motion: options.motion, side: options.side, digit: options.digit, condition: options.condition, oneFinger: options.oneFinger };
    const lite = captureFromFrames(target, tracked.frames, options.clip);
    // As the app's upload does: a finger's flexion clip is stepped again with the full hand model and read by both.
    const capture = readsWithBothModels(options.motion, options.digit)
      ? withFullModelFrames(lite, target, (await trackClip(prepared, { model: "full" })).frames, options.clip)
      : lite;
    const text = `${JSON.stringify(capture)}\n`;
    if (options.out) {
      try {
        writeFileSync(options.out, text);
      } catch (error) {
        throw new ClipInputError(`--out: cannot write ${options.out} (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})`);
      }
    }
    // analyze itself reads the capture back, so the report is the one `analyze` prints for the written file.
    const label = options.out ?? options.clip;
    return { capture, report: analyzeFiles([...options.analyzeArgs, label], (file) => (file === label ? text : "")) };
  } finally {
    prepared.dispose();
  }
}

async function main(): Promise<void> {
  try {
    const { report } = await analyzeClip(process.argv.slice(2));
    process.stdout.write(`${JSON.stringify(report, null, 2)}\n`);
  } catch (error) {
    if (error instanceof ClipInputError || error instanceof UsageError || error instanceof CaptureFormatError) {
      process.stderr.write(`analyze-clip: ${error.message.replace(/^analyze: /, "").replace(/\s+/g, " ")}\n`);
      process.exitCode = 2;
      return;
    }
    process.stderr.write(`analyze-clip: ${(error as Error).stack ?? String(error)}\n`);
    process.exitCode = 1;
  }
}

if (!process.env.VITEST) void main();
