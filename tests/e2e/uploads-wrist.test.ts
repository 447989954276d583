/**
 * An uploaded wrist clip that starts with a still, straight wrist: the client's browser takes the straight-wrist
 * reading from the clip's first still stretch, puts those frames in the capture, and the server reads the wrist
 * against the same forearm line (issue 8 item 6). The clip is one real photo of a right hand (Debian's
 * gcompris-qt-data, made into a WebM at test time, never committed) held for 4 seconds: all of it is still, so the
 * reading starts at the first frame and spans the 3 seconds the upload form asks for.
 */
import path from "node:path";
import { gunzipSync } from "node:zlib";
import { eq } from "drizzle-orm";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openDatabase } from "@/db";
import { attemptCaptures, attempts, uploads } from "@/db/schema";
import { DEMO_PASSWORD } from "@/db/seed/demo";
import { parseCaptureText } from "@/lib/capture/parse";
import { analyzeCapture } from "@/vision/analyze-capture";
import { CLIP_NEUTRAL } from "@/vision/live/clip-capture";
import { CANVAS_HEIGHT, CANVAS_WIDTH, makeHandClip } from "../../scripts/fixtures/hand-photos";
import { buildModels } from "../../scripts/models/build";
import { signInWithPassword, startTestApp, type TestApp } from "./support/app";
import { launchChromium } from "./support/browser";

const REPO_ROOT = path.resolve(__dirname, "..", "..");
const CLIP_FPS = 30;

let app: TestApp;
let browser: Browser;
let clip: string;

beforeAll(async () => {
  buildModels({ repoRoot: REPO_ROOT });
  clip = makeHandClip({ photos: ["right-open-palm"], secondsPerPhoto: 4, format: "webm", fps: CLIP_FPS });
  app = await startTestApp("uploads-wrist");
  browser = await launchChromium();
}, 240_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

describe("an uploaded wrist clip with a still start", () => {
  it("the form asks for a still start; the clip's measurement takes the reading from it and the server reads the wrist against it", async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    page.on("pageerror", (error) => console.error(`page error: ${error.message}`));
    await signInWithPassword(page, app.appUrl, "client@kinarc.test", DEMO_PASSWORD);
    await page.waitForURL(`${app.appUrl}/home`);
    await page.goto(`${app.appUrl}/uploads`);
    const form = page.getByRole("form", { name: "Send a file" });
    await form.getByLabel("Movement shown").selectOption("pip.flexion");
    expect(await form.getByTestId("clip-neutral-instruction").count()).toBe(0);
    await form.getByLabel("Movement shown").selectOption("wrist.extension");
    expect(await form.getByTestId("clip-neutral-instruction").textContent()).toMatch(/Start the clip with 3 seconds of a straight, still wrist/);
    await form.getByLabel("Side").selectOption("right");
    await form.getByLabel("How your arm rested").selectOption("gravity_minimized");
    await form.getByLabel("Or choose a clip from this device").setInputFiles(clip);
    const sent = page.waitForResponse((r) => r.url().endsWith("/api/v1/uploads") && r.request().method() === "POST");
    await form.getByRole("button", { name: "Send", exact: true }).click();
    const { uploadUid } = (await (await sent).json()) as { uploadUid: string };

    const analyzer = page.getByTestId("clip-analyzer");
    await analyzer.and(page.locator('[data-phase="saved"]')).waitFor({ timeout: 240_000 });
    expect(await page.getByTestId("clip-neutral").getAttribute("data-status")).toBe("taken");
    expect(await page.getByTestId("clip-neutral").textContent()).toMatch(/Straight-wrist reading taken from 0\.0 s into the clip/);

    const { db, client } = openDatabase(app.databaseUrl);
    try {
      const [upload] = await db.select().from(uploads).where(eq(uploads.uploadUid, uploadUid));
      expect(upload.attemptId).toBeTruthy();
      const [attempt] = await db.select().from(attempts).where(eq(attempts.id, upload.attemptId!));
      expect(attempt).toMatchObject({ source: "upload", motion: "wrist.extension", side: "right", forearmSource: "neutral-reading" });
      const [stored] = await db.select().from(attemptCaptures).where(eq(attemptCaptures.attemptId, attempt.id));
      const capture = parseCaptureText(gunzipSync(stored.gzip).toString("utf8"), "stored");
      // The clip's picture points travel with the picture's aspect (the tracker reads it from the video's size).
      expect(capture.imageAspect).toBeCloseTo(CANVAS_WIDTH / CANVAS_HEIGHT, 6);
      const neutral = capture.neutral?.frames ?? [];
      // The first 3 s of a 30 fps clip, both ends included: frames 0-90 when every frame is tracked, and at least the
      // 1.5 s a reading needs.
      expect(neutral.length).toBeLessThanOrEqual((CLIP_NEUTRAL.holdMs / 1000) * CLIP_FPS + 1);
      expect(neutral.length).toBeGreaterThanOrEqual(1.5 * CLIP_FPS);
      // They are the clip's own first frames (times from 0), not another hold.
      neutral.forEach((f, i) => {
        expect(f.t).toBeCloseTo(capture.frames[i].t, 3);
        expect(f.hand).toEqual(capture.frames[i].hand);
      });
      const analysis = analyzeCapture(capture);
      expect(analysis.forearmSource).toBe("neutral-reading");
      expect(analysis.neutral?.usableFrames ?? 0).toBeGreaterThanOrEqual(1.5 * CLIP_FPS);
      console.log(`uploaded wrist clip: ${neutral.length} neutral frames, spread ${analysis.neutral?.spreadDeg.toFixed(1)} deg, view ${analysis.neutral?.view}, usable ${attempt.usableFrames}/${attempt.frames}`);
      // The therapist's review of the clip says which forearm line the stored wrist angles use.
      const staff = await browser.newContext();
      const review = await staff.newPage();
      await signInWithPassword(review, app.appUrl, "therapist@kinarc.test", DEMO_PASSWORD);
      await review.waitForURL(`${app.appUrl}/home`);
      await review.goto(`${app.appUrl}/uploads/${upload.id}`);
      const forearm = review.getByTestId("clip-forearm");
      await forearm.waitFor({ timeout: 30_000 });
      expect(await forearm.getAttribute("data-source")).toBe("neutral-reading");
      expect(await forearm.textContent()).toMatch(/straight-wrist reading/);
      await staff.close();
    } finally {
      client.close();
    }
    await context.close();
  }, 300_000);
});
