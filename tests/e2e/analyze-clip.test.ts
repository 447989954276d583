/**
 * analyze-clip end to end: the app's tracking code in headless Chromium on a rendered clip with known truth (the PIP of
 * all four fingers 0 -> 80 -> 0 degrees, three cycles, little-finger side view: the view vision/view-policy.ts names
 * for finger flexion against gravity, and the four-finger motion the self-check asks for), and the refusals for bad
 * input. Truth is the renderer's commanded angle (scripts/accuracy, MIT-licensed rigged hand of
 * @webxr-input-profiles/assets); frame counts are checked against Debian's ffprobe.
 */
import { execFileSync, spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchChromium } from "./support/browser";
import { parseCaptureText } from "@/lib/capture/parse";
import { correctionGroupFor } from "@/vision/correction";
import { UNCERTAINTY_TABLE, validationCell } from "@/vision/uncertainty";
import { analyzeCaptureFile } from "@/vision/model-pair";
import { analyzeCapture } from "@/vision/analyze-capture";

const REPO_ROOT = path.resolve(__dirname, "..", "..");
const DIGITS = ["index", "middle", "ring", "little"] as const;
const SWEEP = { joints: DIGITS.map((digit) => `${digit}.pipFlexionDeg`).join(","), fromDeg: 0, toDeg: 80, cycles: 3, view: "ulnar", side: "right" } as const;
const TARGET = ["--motion", "pip.flexion", "--side", SWEEP.side, "--digit", "index", "--condition", "against_gravity"];

let folder: string;
let webmClip: string;
let mjpegClip: string;
let truthFile: string;

interface Run {
  status: number | null;
  stdout: string;
  stderr: string;
}

function run(script: string, args: readonly string[]): Run {
  const result = spawnSync(process.execPath, [path.join(REPO_ROOT, "node_modules/tsx/dist/cli.mjs"), path.join(REPO_ROOT, "scripts", script), ...args], {
    cwd: REPO_ROOT,
    encoding: "utf8",
    maxBuffer: 64 * 1024 * 1024,
    env: { ...process.env, VITEST: "" },
  });
  return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}

function countFrames(file: string): number {
  const output = execFileSync("ffprobe", ["-v", "error", "-count_frames", "-select_streams", "v:0", "-show_entries", "stream=nb_read_frames", "-of", "csv=p=0", file]);
  return Number(output.toString().trim());
}

/** A refusal: exit status 2, nothing on stdout, one line on stderr that names the problem. */
function expectRefusal(result: Run, pattern: RegExp): void {
  expect(result.stdout).toBe("");
  expect(result.stderr.trim().split("\n")).toHaveLength(1);
  expect(result.stderr).toMatch(pattern);
  expect(result.status).toBe(2);
}

beforeAll(() => {
  folder = mkdtempSync(path.join(os.tmpdir(), "kinarc-analyze-clip-"));
  // Rendered fresh from the default seed, so the clip always matches the current renderer (about 15 s).
  const render = run("accuracy/render-hands.ts", [
    "sweep", "--joint", SWEEP.joints, "--from", String(SWEEP.fromDeg), "--to", String(SWEEP.toDeg), "--cycles", String(SWEEP.cycles),
    "--view", SWEEP.view, "--side", SWEEP.side, "--name", "sweep", "--out", folder,
  ]);
  if (render.status !== 0) throw new Error(`render-hands failed: ${render.stderr}`);
  webmClip = path.join(folder, "sweep.webm");
  mjpegClip = path.join(folder, "sweep.mjpeg");
  truthFile = path.join(folder, "sweep.json");
}, 180_000);

afterAll(() => {
  if (folder) rmSync(folder, { recursive: true, force: true });
});

describe("analyze-clip on a rendered four-finger PIP sweep, 0-80-0 degrees x3, ulnar view", () => {
  let result: Run;
  let capturePath: string;

  beforeAll(() => {
    capturePath = path.join(folder, "capture.json");
    result = run("analyze-clip.ts", [...TARGET, "--out", capturePath, webmClip]);
  }, 600_000);

  it("tracks every frame of the clip into a valid capture file and prints exactly what analyze prints for it", () => {
    expect(result.stderr).toBe("");
    expect(result.status).toBe(0);
    const truth = JSON.parse(readFileSync(truthFile, "utf8")) as { frameCount: number };
    const capture = parseCaptureText(readFileSync(capturePath, "utf8"), capturePath);
    // One capture frame per video frame: ffprobe's count of the clip's decoded frames and the renderer's own count.
    expect(capture.frames).toHaveLength(countFrames(webmClip));
    expect(capture.frames).toHaveLength(truth.frameCount);
    expect(capture).toMatchObject({ motion: "pip.flexion", side: "right", digit: "index", condition: "against_gravity" });
    const analyze = run("analyze.ts", [capturePath]);
    expect(analyze.status).toBe(0);
    expect(result.stdout).toBe(analyze.stdout);
  });

  it("sees the hand, counts the three flexion cycles and reads each finger's peak within the stated uncertainty (figures printed)", () => {
    const report = JSON.parse(result.stdout) as { captures: Array<{ reps: number; peakDeg: number | null; usableFrames: number; frames: number; method: string }> };
    const [clip] = report.captures;
    const capture = parseCaptureText(readFileSync(capturePath, "utf8"), capturePath);
    // The validation error for this joint, view and the app's (lite) model, as the accuracy report
    // (scripts/accuracy/report.md) states it, read through the engine's table rather than typed here.
    const group = correctionGroupFor("pip.flexion", "index")!.group;
    const cell = validationCell(UNCERTAINTY_TABLE, group, "lite", "ulnar")!;
    const validationMaeDeg = cell.correctionHelps ? cell.correctedMaeDeg! : cell.rawMaeDeg;
    const cycleMs = capture.frames[capture.frames.length - 1].t / SWEEP.cycles;
    // Detection: issue 8 asks for at least 95% on held-out renders.
    expect(clip.usableFrames / clip.frames).toBeGreaterThanOrEqual(0.95);
    // The capture holds every finger's landmarks: the same frames analyzed for each digit the therapist could pick.
    for (const digit of DIGITS) {
      const analysis = analyzeCapture({ ...capture, digit });
      const errorDeg = analysis.peakDeg === null ? null : analysis.peakDeg - SWEEP.toDeg;
      console.log(
        `analyze-clip figures (${digit}): truth peak ${SWEEP.toDeg} deg, reported ${analysis.peakDeg} ± ${analysis.uncertaintyDeg} deg (${analysis.method}), ` +
          `error ${errorDeg === null ? "n/a" : errorDeg.toFixed(1)} deg, validation MAE ${validationMaeDeg} deg; repetitions ${analysis.reps} (truth ${SWEEP.cycles}), ` +
          `peaks ${analysis.repetitions.map((r) => r.peakDeg.toFixed(0)).join(", ")}`,
      );
      expect(analysis.reps, digit).toBe(SWEEP.cycles);
      // Each true cycle (a third of the clip) holds exactly one reported repetition's peak.
      for (let cycle = 0; cycle < SWEEP.cycles; cycle++) {
        const inCycle = analysis.repetitions.filter((r) => r.startMs + r.timeToPeakMs >= cycle * cycleMs && r.startMs + r.timeToPeakMs < (cycle + 1) * cycleMs);
        expect(inCycle.length, `${digit}, cycle ${cycle + 1}`).toBe(1);
      }
      // "Within the validation error": inside the 90% interval the engine derives from it and shows the therapist,
      // the finger's own where the held-out clips were split by finger (the cell's byDigit), else the cell's, never
      // narrower for a peak than the width that held 90% of held-out peaks (the cell's clipPeakP90Deg).
      const frameDeg = cell.byDigit?.find((f) => f.digit === digit)?.uncertaintyDeg ?? cell.uncertaintyDeg;
      const statedDeg = Math.max(frameDeg, cell.clipPeakP90Deg ?? 0);
      expect(analysis.uncertaintyDeg, digit).toBe(statedDeg);
      expect(Math.abs(errorDeg!), digit).toBeLessThanOrEqual(statedDeg);
      // Read as the app reads an uploaded finger clip: both hand models together (vision/model-pair.ts), the peak
      // within the interval it states.
      const both = analyzeCaptureFile({ ...capture, digit });
      console.log(`analyze-clip figures (${digit}, both models): reported ${both.peakDeg?.toFixed(1)} ± ${both.uncertaintyDeg?.toFixed(1)} deg, repetitions ${both.reps}`);
      expect(both.reps, digit).toBe(SWEEP.cycles);
      expect(Math.abs(both.peakDeg! - SWEEP.toDeg), digit).toBeLessThanOrEqual(both.uncertaintyDeg!);
    }
    expect(clip.reps).toBe(SWEEP.cycles);
    // The clip was tracked by both hand models, as an upload is.
    expect(capture.fullModel?.frames.map((f) => f.t)).toEqual(capture.frames.map((f) => f.t));
    expect((report.captures[0] as unknown as { handModels: string[] }).handModels).toEqual(["lite", "full"]);
  });

  it("reads the same clip as MJPEG (converted with ffmpeg first) frame for frame", () => {
    const mjpeg = run("analyze-clip.ts", [...TARGET, "--fps", "30", mjpegClip]);
    expect(mjpeg.stderr).toBe("");
    expect(mjpeg.status).toBe(0);
    const [clip] = (JSON.parse(mjpeg.stdout) as { captures: Array<{ file: string; frames: number }> }).captures;
    expect(clip.file).toBe(mjpegClip);
    expect(clip.frames).toBe(countFrames(webmClip));
  }, 600_000);
});

describe("analyze-clip refuses bad input with exit status 2 and one stderr line", () => {
  it("a missing file", () => {
    expectRefusal(run("analyze-clip.ts", [...TARGET, path.join(folder, "nowhere.webm")]), /CLIP: cannot read .*nowhere\.webm \(ENOENT\)/);
  });

  it("a file that is not a video", () => {
    const text = path.join(folder, "notes.webm");
    writeFileSync(text, "these are notes, not frames\n");
    expectRefusal(run("analyze-clip.ts", [...TARGET, text]), /CLIP: .*notes\.webm is not a video/);
  });

  it("a video with no hand in view", () => {
    // Two seconds of a plain sand-coloured frame, encoded by ffmpeg's own colour source.
    const blank = path.join(folder, "blank.webm");
    execFileSync("ffmpeg", ["-v", "error", "-y", "-f", "lavfi", "-i", "color=c=0xd8c8a8:s=640x480:r=30:d=2", "-c:v", "libvpx", "-b:v", "1M", blank]);
    expectRefusal(run("analyze-clip.ts", [...TARGET, blank]), /CLIP: no hand in view in any of the 60 frames/);
  }, 300_000);

  it("a browser-recorded WebM without a duration is re-indexed and stepped through (here: no hand in it)", async () => {
    // MediaRecorder in Chromium writes WebM without a duration, as the in-app clip recorder does.
    const browser = await launchChromium();
    let bytes: number[];
    try {
      const page = await browser.newPage();
      bytes = await page.evaluate(async () => {
        const canvas = document.createElement("canvas");
        canvas.width = 320;
        canvas.height = 240;
        const context = canvas.getContext("2d")!;
        const recorder = new MediaRecorder(canvas.captureStream(20), { mimeType: "video/webm" });
        const chunks: Blob[] = [];
        recorder.ondataavailable = (event) => chunks.push(event.data);
        const stopped = new Promise((resolve) => (recorder.onstop = resolve));
        recorder.start(250);
        const startedAt = performance.now();
        while (performance.now() - startedAt < 1500) {
          context.fillStyle = "#e8e0d0";
          context.fillRect(0, 0, 320, 240);
          context.fillStyle = "#304050";
          context.fillRect(((performance.now() - startedAt) / 10) % 300, 100, 20, 20);
          await new Promise((resolve) => setTimeout(resolve, 40));
        }
        recorder.stop();
        await stopped;
        return Array.from(new Uint8Array(await new Blob(chunks).arrayBuffer()));
      });
    } finally {
      await browser.close();
    }
    const recorded = path.join(folder, "recorded.webm");
    writeFileSync(recorded, Buffer.from(bytes));
    const format = execFileSync("ffprobe", ["-v", "error", "-show_entries", "format=duration", "-of", "csv=p=0", recorded]).toString().trim();
    expect(format === "" || format === "N/A").toBe(true);
    expectRefusal(run("analyze-clip.ts", [...TARGET, recorded]), /CLIP: no hand in view in any of the [1-9]\d* frames of .*recorded\.webm/);
  }, 300_000);

  it("bad flags, each named", () => {
    expectRefusal(run("analyze-clip.ts", ["--motion", "pip.flexion", "--side", "middle", "--digit", "index", "--condition", "gravity_minimized", webmClip]), /--side: expected one of left, right, got "middle"/);
    expectRefusal(run("analyze-clip.ts", ["--motion", "wrist.flexion", "--side", "left", "--digit", "index", "--condition", "against_gravity", webmClip]), /--digit: expected none for wrist\.flexion/);
    expectRefusal(run("analyze-clip.ts", ["--motion", "pip.flexion", "--side", "left", "--digit", "index", webmClip]), /--condition: expected against_gravity or gravity_minimized/);
    expectRefusal(run("analyze-clip.ts", [...TARGET, "--speed", "2", webmClip]), /--speed: unknown option/);
    expectRefusal(run("analyze-clip.ts", [...TARGET, "--scale", "roman", webmClip]), /--scale: expected one of/);
    expectRefusal(run("analyze-clip.ts", [...TARGET]), /CLIP: expected a video file/);
  });
});
