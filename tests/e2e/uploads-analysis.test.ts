/**
 * A client uploads a clip and the therapist reviews its analysis. The clip is a rendered hand with known joint angles
 * (scripts/accuracy render-hands, the MIT-licensed rigged hand of @webxr-input-profiles/assets): index PIP 0 -> 80 -> 0
 * degrees, three cycles, little-finger side view, 30 frames a second. Truth is the renderer's commanded angle and its
 * projection of every joint into the picture; frame counts are checked against Debian's ffprobe.
 *
 * The client's browser measures the clip right after sending it (the app's tracking, frame by frame) and hands the
 * capture to the attempt outbox; the connection drops meanwhile and nothing is lost. The therapist then sees the
 * server's measurement, the per-frame trace and the clip with the measured hand drawn over it, and keeps the attempt.
 * A second clip whose client-side measurement never arrived is measured in the therapist's browser instead.
 */
import { execFileSync, spawnSync } from "node:child_process";
import { randomUUID } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { gunzipSync } from "node:zlib";
import { eq } from "drizzle-orm";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Database } from "@/db";
import { attemptCaptures, attempts, uploads } from "@/db/schema";
import { parseCaptureText } from "@/lib/capture/parse";
import { clipReviewTrace } from "@/lib/uploads/clip-review";
import { correctionGroupFor } from "@/vision/correction";
import { UNCERTAINTY_TABLE, validationCell } from "@/vision/uncertainty";
import { signedInContext, startTestApp, withAppDatabase, type TestApp } from "./support/app";
import { launchChromium } from "./support/browser";

const REPO_ROOT = path.resolve(__dirname, "..", "..");
const SWEEP = { joint: "index.pipFlexionDeg", fromDeg: 0, toDeg: 80, cycles: 3, view: "ulnar", side: "right" } as const;
// Measuring 181 frames one by one takes tens of seconds on two shared cores.
const MEASURE_TIMEOUT_MS = 240_000;

interface TruthFrame {
  index: number;
  timeMs: number;
  truth: { commandedDeg: { index: { pipFlexionDeg: number } }; landmarksImagePx: [number, number][] };
}

let app: TestApp;
let browser: Browser;
let folder: string;
let clip: string;
let truth: { fps: number; frameCount: number; frames: TruthFrame[] };

async function signedIn(email: string): Promise<BrowserContext> {
  return (await signedInContext(browser, app.appUrl, email)).context;
}

const withDb = <T>(fn: (d: Database) => Promise<T>) => withAppDatabase(app, fn);

async function clipRecord(uploadUid: string) {
  return withDb(async (db) => {
    const [upload] = await db.select().from(uploads).where(eq(uploads.uploadUid, uploadUid));
    if (!upload?.attemptId) return { upload, attempt: null, capture: null, captureSha256: null };
    const [attempt] = await db.select().from(attempts).where(eq(attempts.id, upload.attemptId));
    const [stored] = await db.select().from(attemptCaptures).where(eq(attemptCaptures.attemptId, upload.attemptId));
    return { upload, attempt, capture: parseCaptureText(gunzipSync(stored.gzip).toString("utf8"), "stored"), captureSha256: stored.sha256 };
  });
}

function countFrames(file: string): number {
  const output = execFileSync("ffprobe", ["-v", "error", "-count_frames", "-select_streams", "v:0", "-show_entries", "stream=nb_read_frames", "-of", "csv=p=0", file]);
  return Number(output.toString().trim());
}

/** The validation error of the lite model for index PIP in this view, as the accuracy report states it (scripts/accuracy/report.md). */
function validationMaeDeg(): number {
  const cell = validationCell(UNCERTAINTY_TABLE, correctionGroupFor("pip.flexion", "index")!.group, "lite", "ulnar")!;
  return cell.correctionHelps ? cell.correctedMaeDeg! : cell.rawMaeDeg;
}

beforeAll(async () => {
  folder = mkdtempSync(path.join(os.tmpdir(), "kinarc-uploads-analysis-"));
  const render = spawnSync(
    process.execPath,
    [
      path.join(REPO_ROOT, "node_modules/tsx/dist/cli.mjs"), path.join(REPO_ROOT, "scripts/accuracy/render-hands.ts"), "sweep",
      "--joint", SWEEP.joint, "--from", String(SWEEP.fromDeg), "--to", String(SWEEP.toDeg), "--cycles", String(SWEEP.cycles),
      "--view", SWEEP.view, "--side", SWEEP.side, "--name", "sweep", "--out", folder,
    ],
    { cwd: REPO_ROOT, encoding: "utf8", env: { ...process.env, VITEST: "" } },
  );
  if (render.status !== 0) throw new Error(`render-hands failed: ${render.stderr}`);
  clip = path.join(folder, "sweep.webm");
  truth = JSON.parse(readFileSync(path.join(folder, "sweep.json"), "utf8")) as typeof truth;
  app = await startTestApp("uploads-analysis");
  // The fake camera (a moving test pattern, no hand) stands in for the client's webcam in the recorder check.
  browser = await launchChromium({ extraArgs: ["--use-fake-device-for-media-stream", "--use-fake-ui-for-media-stream"] });
}, 240_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
  if (folder) rmSync(folder, { recursive: true, force: true });
});

async function sendClipAsClient(page: Page, file: string): Promise<string> {
  await page.goto(`${app.appUrl}/uploads`);
  const form = page.getByRole("form", { name: "Send a file" });
  await form.getByLabel("Movement shown").selectOption("pip.flexion");
  await form.getByLabel("Finger").selectOption("index");
  await form.getByLabel("Side").selectOption("right");
  // Forearm on its little-finger edge: the catalogue's gravity-minimized position for PIP flexion, as rendered.
  await form.getByLabel("How your arm rested").selectOption("gravity_minimized");
  await form.getByLabel("Or choose a clip from this device").setInputFiles(file);
  const sent = page.waitForResponse((r) => r.url().endsWith("/api/v1/uploads") && r.request().method() === "POST");
  await form.getByRole("button", { name: "Send", exact: true }).click();
  const body = (await (await sent).json()) as { uploadUid: string };
  await form.getByText(/^Sent\./).waitFor();
  return body.uploadUid;
}

describe("a client uploads a clip and the therapist reviews its analysis", () => {
  let client: BrowserContext;
  let uploadUid: string;
  let stored: Awaited<ReturnType<typeof clipRecord>>;

  beforeAll(async () => {
    client = await signedIn("client@kinarc.test");
  });
  afterAll(async () => {
    await client?.close();
  });

  it("the client's browser measures the clip after sending it, keeps the result through a dropped connection, and the server stores it once, linked to the clip", async () => {
    const page = client.pages()[0];
    uploadUid = await sendClipAsClient(page, clip);
    const analyzer = page.getByTestId("clip-analyzer");
    await analyzer.and(page.locator('[data-phase="measuring"]')).waitFor({ timeout: 60_000 });
    // The connection drops while the clip is being measured: the result must wait on the device, not be lost.
    await client.setOffline(true);
    await analyzer.and(page.locator('[data-phase="queued"]')).waitFor({ timeout: MEASURE_TIMEOUT_MS });
    const waiting = await page.evaluate(
      () =>
        new Promise<string[]>((resolve, reject) => {
          const req = indexedDB.open("kinarc");
          req.onsuccess = () => {
            const all = req.result.transaction("capture-outbox").objectStore("capture-outbox").getAll();
            all.onsuccess = () => resolve((all.result as { captureUid: string }[]).map((e) => e.captureUid));
            all.onerror = () => reject(all.error);
          };
          req.onerror = () => reject(req.error);
        }),
    );
    expect(waiting).toContain(`clip-${uploadUid}`);
    expect((await clipRecord(uploadUid)).attempt).toBeNull();
    await client.setOffline(false);
    await analyzer.and(page.locator('[data-phase="saved"]')).waitFor({ timeout: 60_000 });
    await expect(page.getByTestId("clip-analyzer-status").textContent()).resolves.toBe("Measured and sent. Your therapist will review it.");

    stored = await clipRecord(uploadUid);
    expect(stored.attempt).toMatchObject({ source: "upload", captureUid: `clip-${uploadUid}`, motion: "pip.flexion", side: "right", digit: "index", condition: "gravity_minimized", keptAt: null });
    // Every frame of the clip, once: Debian's ffprobe's count of decoded frames and the renderer's own count.
    expect(stored.attempt!.frames).toBe(countFrames(clip));
    expect(stored.attempt!.frames).toBe(truth.frameCount);
    // Frame i at i/fps, the clip's own clock.
    expect(stored.capture!.frames.map((f) => Math.round((f.t * truth.fps) / 1000))).toEqual(truth.frames.map((f) => f.index));
    // A finger's flexion clip is stepped a second time by the full hand model: the same frames at the same times.
    expect(stored.capture!.fullModel?.frames.map((f) => f.t)).toEqual(stored.capture!.frames.map((f) => f.t));
    expect(stored.capture!.fullModel!.frames.filter((f) => f.hand).length).toBeGreaterThan(0.9 * truth.frameCount);
  }, MEASURE_TIMEOUT_MS + 120_000);

  it("measures what the renderer commanded: every cycle found, the peak not over-read beyond the validation error", () => {
    const attempt = stored.attempt!;
    const trace = clipReviewTrace(stored.capture!);
    const cycleMs = (truth.frames[truth.frames.length - 1].timeMs + 1000 / truth.fps) / SWEEP.cycles;
    const maeDeg = validationMaeDeg();
    console.log(
      `uploaded clip figures: truth peak ${SWEEP.toDeg} deg, stored peak ${attempt.peakDeg?.toFixed(1)} ± ${attempt.uncertaintyDeg} deg (${attempt.method}), ` +
        `repetitions ${attempt.reps} (truth ${SWEEP.cycles}), usable ${attempt.usableFrames}/${attempt.frames}, validation MAE ${maeDeg} deg`,
    );
    // Detection: issue 8 asks for at least 95% on held-out renders.
    expect(attempt.usableFrames / attempt.frames).toBeGreaterThanOrEqual(0.95);
    expect(attempt.reps).toBeGreaterThanOrEqual(SWEEP.cycles);
    for (let cycle = 0; cycle < SWEEP.cycles; cycle++) {
      // Each true cycle holds the middle of at least one reported repetition.
      const middles = trace.repetitions.map((r) => (r.startMs + r.endMs) / 2);
      expect(middles.filter((t) => t >= cycle * cycleMs && t < (cycle + 1) * cycleMs).length, `cycle ${cycle + 1}`).toBeGreaterThanOrEqual(1);
    }
    // A peak above the truth by more than the validation error would inflate a range-based grade.
    expect(attempt.peakDeg).not.toBeNull();
    expect(attempt.peakDeg!).toBeLessThanOrEqual(SWEEP.toDeg + maeDeg);
    expect(attempt.peakDeg!).toBeGreaterThan(SWEEP.fromDeg);
    expect(attempt.uncertaintyDeg).toBeGreaterThan(0);
  });

  it("the hand drawn for each frame is the hand in that frame: the drawn fingertip follows the renderer's projection, best matched at no frame shift", () => {
    const frames = stored.capture!.frames;
    // Index fingertip (landmark 8): the part that moves most in this sweep. Median distance in pixels of the 640x480
    // picture between the drawn tip of frame i and the renderer's projected tip of frame i + shift.
    const medianErrorPx = (shift: number) => {
      const errors: number[] = [];
      frames.forEach((f, i) => {
        const projected = truth.frames[i + shift]?.truth.landmarksImagePx[8];
        if (!f.image || !projected) return;
        errors.push(Math.hypot(f.image[8][0] * 640 - projected[0], f.image[8][1] * 480 - projected[1]));
      });
      // The median: a few frames where the tracker slips would otherwise blur the shift that fits best.
      return errors.sort((a, b) => a - b)[Math.floor(errors.length / 2)];
    };
    const shifts = [-6, -4, -2, -1, 0, 1, 2, 4, 6];
    const errors = shifts.map(medianErrorPx);
    console.log(`drawn fingertip vs projected truth, median px by frame shift: ${shifts.map((k, i) => `${k}: ${errors[i].toFixed(1)}`).join(", ")}`);
    expect(shifts[errors.indexOf(Math.min(...errors))]).toBe(0);
    // The rig's joints sit 10-20 px from the landmark model's at a 260 px hand (shared notes, rendered-hands.md).
    expect(errors[shifts.indexOf(0)]).toBeLessThanOrEqual(20);
  });

  it("the therapist sees the measurement, the per-frame trace and the clip with the hand drawn over it, and keeps the attempt as counting", async () => {
    const therapist = await signedIn("therapist@kinarc.test");
    try {
      const page = therapist.pages()[0];
      await page.goto(`${app.appUrl}/uploads`);
      const attempt = stored.attempt!;
      const row = page.getByTestId("upload-row").filter({ hasText: "PIP" });
      await expect(row.getByTestId("clip-status").textContent()).resolves.toBe(`Measured: peak ${attempt.peakDeg!.toFixed(0)}° ± ${attempt.uncertaintyDeg!.toFixed(0)}°, ${attempt.reps} repetitions.`);
      await row.getByTestId("review-clip").click();
      await page.waitForURL(`${app.appUrl}/uploads/${stored.upload.id}`);
      const peak = page.getByTestId("clip-peak");
      await expect(peak.getAttribute("data-peak-deg")).resolves.toBe(String(attempt.peakDeg));
      await expect(peak.textContent()).resolves.toBe(`${attempt.peakDeg!.toFixed(0)}° ± ${attempt.uncertaintyDeg!.toFixed(0)}°`);
      await expect(page.getByTestId("clip-reps").textContent()).resolves.toBe(String(attempt.reps));
      await expect(page.getByTestId("clip-hand-models").textContent()).resolves.toMatch(/read by both hand models/);
      await expect(page.getByTestId("clip-quality").textContent()).resolves.toMatch(new RegExp(`hand usable in ${attempt.usableFrames} of ${attempt.frames} frames`));
      await expect(page.getByTestId("clip-plane").textContent()).resolves.toMatch(attempt.planeVerified ? /as declared/ : /not as declared/);
      const trace = page.getByTestId("angle-trace");
      await expect(trace.getAttribute("data-points")).resolves.toBe(String(truth.frameCount));
      await expect(trace.locator("path.recharts-curve").count()).resolves.toBeGreaterThanOrEqual(2);

      // Scrub to the middle of frame 45 (a peak of the first cycle): the drawing and reading follow that frame.
      const video = page.getByTestId("review-video");
      await video.evaluate((v: HTMLVideoElement) => v.readyState >= 2 || new Promise((r) => v.addEventListener("loadeddata", r, { once: true })));
      await video.evaluate((v: HTMLVideoElement) => (v.currentTime = 45.5 / 30));
      await page.getByTestId("overlay-reading").and(page.locator('[data-frame="45"]')).waitFor({ timeout: 15_000 });
      const expected = clipReviewTrace(stored.capture!).points[45];
      const shown = expected.smoothedDeg ?? expected.angleDeg;
      await expect(page.getByTestId("overlay-reading").textContent()).resolves.toBe(`Frame 46 of ${truth.frameCount}: ${shown === null ? "no usable hand" : `${shown.toFixed(1)}°`}`);
      // The overlay canvas holds a drawing near where the renderer put the index PIP joint (landmark 6) in that frame.
      const drawnNearJoint = await page.getByTestId("hand-overlay").evaluate((canvas: HTMLCanvasElement, jointPx: [number, number]) => {
        const ctx = canvas.getContext("2d")!;
        const box = canvas.getBoundingClientRect();
        // The clip is 640x480 drawn with object-fit: contain inside the box.
        const scale = Math.min(box.width / 640, box.height / 480);
        const x = ((box.width - 640 * scale) / 2 + jointPx[0] * scale) * (canvas.width / box.width);
        const y = ((box.height - 480 * scale) / 2 + jointPx[1] * scale) * (canvas.height / box.height);
        const r = Math.round(12 * (canvas.width / box.width));
        const pixels = ctx.getImageData(Math.round(x - r), Math.round(y - r), 2 * r, 2 * r).data;
        let painted = 0;
        for (let i = 3; i < pixels.length; i += 4) if (pixels[i] > 0) painted++;
        return painted;
      }, truth.frames[45].truth.landmarksImagePx[6]);
      expect(drawnNearJoint).toBeGreaterThan(10);

      await page.getByRole("button", { name: "Reviewed: counts towards the grade" }).click();
      await page.getByText("Counts towards the grade", { exact: true }).waitFor();
      const kept = await clipRecord(uploadUid);
      expect(kept.upload.reviewedAt).not.toBeNull();
      expect(kept.attempt!.keptAt).not.toBeNull();
      await page.getByRole("button", { name: "Reviewed: does not count" }).click();
      await page.getByText("Does not count", { exact: true }).waitFor();
      expect((await clipRecord(uploadUid)).attempt!.keptAt).toBeNull();
    } finally {
      await therapist.close();
    }
  }, 120_000);

  it("a clip whose measurement never arrived is measured in the therapist's browser into the same capture, stored once", async () => {
    // Sent over the API, so no browser measures it afterwards (as when the client closed the tab at once).
    const second = randomUUID();
    const sent = await client.request.post(`${app.appUrl}/api/v1/uploads`, {
      multipart: {
        clientId: app.seed.clientIds!.dorian,
        uploadUid: second,
        kind: "clip",
        motion: "pip.flexion",
        side: "right",
        digit: "index",
        file: { name: "sweep-again.webm", mimeType: "video/webm", buffer: readFileSync(clip) },
      },
    });
    expect(sent.status()).toBe(201);
    const { id } = (await sent.json()) as { id: string };
    const therapist = await signedIn("therapist@kinarc.test");
    try {
      const page = therapist.pages()[0];
      await page.goto(`${app.appUrl}/uploads/${id}`);
      const form = page.getByRole("form", { name: "Measure this clip" });
      await form.getByLabel("Test position seen in the clip").selectOption("gravity_minimized");
      await form.getByRole("button", { name: "Measure this clip here" }).click();
      await page.getByTestId("clip-peak").waitFor({ timeout: MEASURE_TIMEOUT_MS });
      const again = await clipRecord(second);
      expect(again.attempt).toMatchObject({ source: "upload", captureUid: `clip-${second}`, frames: truth.frameCount });
      // The same file through the same stepping path gives the same frames, landmark for landmark.
      expect(again.captureSha256).toBe(stored.captureSha256);
      expect(again.attempt!.peakDeg).toBe(stored.attempt!.peakDeg);
      const count = await withDb(async (db) => (await db.select().from(attempts).where(eq(attempts.captureUid, `clip-${second}`))).length);
      expect(count).toBe(1);
    } finally {
      await therapist.close();
    }
  }, MEASURE_TIMEOUT_MS + 60_000);
});

describe("a clip recorded in the browser (WebM without a duration) is stepped through in the browser", () => {
  it("finds the length, steps every frame and says plainly that no hand was in view", async () => {
    const client = await signedIn("client@kinarc.test");
    try {
      const page = client.pages()[0];
      await page.goto(`${app.appUrl}/uploads`);
      const form = page.getByRole("form", { name: "Send a file" });
      await form.getByLabel("Movement shown").selectOption("pip.flexion");
      await form.getByRole("button", { name: "Open camera" }).click();
      await form.getByRole("button", { name: "Start recording" }).click();
      await page.waitForTimeout(2000);
      await form.getByRole("button", { name: /Stop recording/ }).click();
      await form.getByText("Clip recorded; it is sent when you press Send.").waitFor();
      await form.getByRole("button", { name: "Send", exact: true }).click();
      await form.getByText(/^Sent\./).waitFor();
      const analyzer = page.getByTestId("clip-analyzer");
      await analyzer.and(page.locator('[data-phase="failed"]')).waitFor({ timeout: 120_000 });
      // Chromium's fake camera shows a test pattern, no hand: every frame was read and none held one.
      const status = (await page.getByTestId("clip-analyzer-status").textContent()) ?? "";
      expect(status).toMatch(/^The clip could not be measured here: no hand in view in any of the [1-9]\d* frames of the clip\./);
      // As many frames as the stored file holds by Debian's ffprobe (which reads to the end itself); a recorder's
      // frame times wander, so within a quarter.
      const stored = await withDb(async (db) => (await db.select().from(uploads)).filter((u) => u.originalName.startsWith("clip-")));
      expect(stored).toHaveLength(1);
      const file = path.join(app.databaseUrl.slice("file:".length).replace(/\.db$/, "") + "-uploads", stored[0].storageKey);
      const stepped = Number(/any of the (\d+) frames/.exec(status)![1]);
      const decoded = countFrames(file);
      console.log(`recorded WebM: ${stepped} frames stepped in the browser, ${decoded} decoded by ffprobe`);
      expect(Math.abs(stepped - decoded) / decoded).toBeLessThanOrEqual(0.25);
    } finally {
      await client.close();
    }
  }, 180_000);
});
