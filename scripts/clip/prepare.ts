/**
 * Turns the CLIP argument into something Chromium's video element can seek through: webm and mp4 as they are, an
 * MJPEG stream (no container, no duration, no frame rate) re-encoded to webm in a temp folder. ffprobe/ffmpeg come
 * from Debian (apt-get install ffmpeg).
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { ClipInputError } from "./options";

export interface PreparedClip {
  /** The file the browser plays. */
  file: string;
  fps: number;
  container: "webm" | "mp4" | "mjpeg";
  /** Removes the temp folder of a converted clip. */
  dispose(): void;
}

interface ProbeResult {
  streams?: Array<{ codec_type?: string; codec_name?: string; r_frame_rate?: string; avg_frame_rate?: string }>;
  format?: { format_name?: string };
}

function run(command: string, args: string[]): { status: number | null; stdout: string; stderr: string } {
  const result = spawnSync(command, args, { encoding: "utf8", maxBuffer: 16 * 1024 * 1024 });
  if (result.error) throw new ClipInputError(`${command}: cannot run (${(result.error as NodeJS.ErrnoException).code ?? result.error.message}); install it with apt-get install ffmpeg`);
  return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}

function rate(text: string | undefined): number | null {
  if (!text) return null;
  const [num, den] = text.split("/").map(Number);
  const fps = den ? num / den : num;
  // MediaRecorder files state 1000 (the timebase) when the rate varies; anything outside a camera's range is not a rate.
  return Number.isFinite(fps) && fps >= 1 && fps <= 240 ? fps : null;
}

// Chromium plays these codecs in these containers (VP8/VP9/AV1 in WebM; H.264/VP9/AV1 in MP4).
const PLAYABLE: Record<"webm" | "mp4", readonly string[]> = { webm: ["vp8", "vp9", "av1"], mp4: ["h264", "vp9", "av1"] };
// A clip without a stated rate is stepped at the usual camera rate.
const FALLBACK_FPS = 30;

/**
 * A copy of a webm or mp4 with its index rewritten (no re-encoding): browser recorders (MediaRecorder) write WebM
 * without a duration or cues, and Chromium cannot seek through such a file frame by frame.
 */
export function remuxClip(clip: PreparedClip): PreparedClip {
  const dir = mkdtempSync(path.join(tmpdir(), "kinarc-clip-"));
  const file = path.join(dir, `clip.${clip.container === "mp4" ? "mp4" : "webm"}`);
  const remux = run("ffmpeg", ["-v", "error", "-y", "-i", clip.file, "-map", "0:v:0", "-c", "copy", file]);
  if (remux.status !== 0) {
    rmSync(dir, { recursive: true, force: true });
    throw new ClipInputError(`CLIP: ${clip.file} has no duration and could not be re-indexed (${remux.stderr.trim().split("\n")[0] ?? "ffmpeg failed"})`);
  }
  return {
    file,
    fps: clip.fps,
    container: clip.container,
    dispose: () => {
      rmSync(dir, { recursive: true, force: true });
      clip.dispose();
    },
  };
}

export function prepareClip(clip: string, mjpegFps: number): PreparedClip {
  let size: number;
  try {
    const stat = statSync(clip);
    if (!stat.isFile()) throw new ClipInputError(`CLIP: ${clip} is not a file`);
    size = stat.size;
  } catch (error) {
    if (error instanceof ClipInputError) throw error;
    throw new ClipInputError(`CLIP: cannot read ${clip} (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})`);
  }
  if (size === 0) throw new ClipInputError(`CLIP: ${clip} is empty; expected a video file (webm, mp4 or mjpeg)`);

  const probe = run("ffprobe", ["-v", "error", "-show_entries", "stream=codec_type,codec_name,r_frame_rate,avg_frame_rate:format=format_name", "-of", "json", clip]);
  let parsed: ProbeResult = {};
  try {
    parsed = JSON.parse(probe.stdout || "{}") as ProbeResult;
  } catch {
    parsed = {};
  }
  const video = parsed.streams?.find((s) => s.codec_type === "video");
  const format = parsed.format?.format_name ?? "";
  if (probe.status !== 0 || !video) throw new ClipInputError(`CLIP: ${clip} is not a video (expected webm, mp4 or mjpeg)`);
  const codec = video.codec_name ?? "";

  if (codec === "mjpeg" && (format === "jpeg_pipe" || format === "mjpeg")) {
    const dir = mkdtempSync(path.join(tmpdir(), "kinarc-clip-"));
    const file = path.join(dir, "clip.webm");
    // Near-lossless VP8 so the conversion does not blur the landmarks; every frame kept, none duplicated.
    const convert = run("ffmpeg", ["-v", "error", "-y", "-f", "mjpeg", "-framerate", String(mjpegFps), "-i", clip, "-an", "-c:v", "libvpx", "-crf", "4", "-b:v", "20M", "-qmin", "0", "-qmax", "10", "-pix_fmt", "yuv420p", "-r", String(mjpegFps), file]);
    if (convert.status !== 0) {
      rmSync(dir, { recursive: true, force: true });
      throw new ClipInputError(`CLIP: ${clip} could not be converted from MJPEG (${convert.stderr.trim().split("\n")[0] ?? "ffmpeg failed"})`);
    }
    return { file, fps: mjpegFps, container: "mjpeg", dispose: () => rmSync(dir, { recursive: true, force: true }) };
  }

  const container = format.includes("webm") || format.includes("matroska") ? "webm" : format.includes("mp4") ? "mp4" : null;
  if (!container) throw new ClipInputError(`CLIP: ${clip} is a ${format} video; expected webm, mp4 or mjpeg`);
  if (!PLAYABLE[container].includes(codec)) throw new ClipInputError(`CLIP: ${clip} holds ${codec} video, which Chromium cannot play in ${container}; expected ${PLAYABLE[container].join(", ")}`);
  const fps = rate(video.avg_frame_rate) ?? rate(video.r_frame_rate) ?? FALLBACK_FPS;
  return { file: path.resolve(clip), fps, container, dispose: () => {} };
}
