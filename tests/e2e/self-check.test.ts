/**
 * The client's guided self-check in the built app, on Chromium's fake camera fed with a clip made at test time from
 * real hand photos (Debian's gcompris-qt-data, never committed): a right hand, palm to the camera, open for two
 * seconds and then a fist for two, looping. Checks tracking on the clip, the raw engine's finger flexion on open hand
 * and fist, that the attempt is read by both hand models and reaches the database with values computed on the server,
 * and that an attempt finished while offline is saved exactly once when the connection returns.
 */
import path from "node:path";
import { gunzipSync } from "node:zlib";
import { eq } from "drizzle-orm";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openDatabase, type Database } from "@/db";
import { attemptCaptures, attempts } from "@/db/schema";
import { DEMO_PASSWORD } from "@/db/seed/demo";
import { parseCapture } from "@/lib/capture/parse";
import type { CaptureFile } from "@/lib/capture/schema";
import { FINGERS, type MotionId } from "@/lib/motions/catalog";
import { analyzeCaptureFile } from "@/vision/model-pair";
import { handAxes, readMotion } from "@/vision/angles";
import { createLivePipeline } from "@/vision/pipeline";
import { makeHandClip } from "../../scripts/fixtures/hand-photos";
import { buildModels } from "../../scripts/models/build";
import { signInWithPassword, startTestApp, type TestApp } from "./support/app";
import { launchChromium } from "./support/browser";

const REPO_ROOT = path.resolve(__dirname, "..", "..");
// Issue 4's acceptance figure for the photo clips.
const MIN_DETECTION_RATE = 0.9;

let app: TestApp;
let browser: Browser;
let db: Database;
let closeDb: () => void;

beforeAll(async () => {
  buildModels({ repoRoot: REPO_ROOT });
  // Two seconds open, two seconds fist: each loop of the clip is one repetition with a hold at the end of range.
  const clip = makeHandClip({ photos: ["right-open-palm", "right-fist-palm"], secondsPerPhoto: 2, format: "mjpeg" });
  app = await startTestApp("self-check");
  browser = await launchChromium({ fakeCameraClip: clip });
  const opened = openDatabase(app.databaseUrl);
  db = opened.db;
  closeDb = () => opened.client.close();
});

afterAll(async () => {
  await browser?.close();
  await app?.stop();
  closeDb?.();
});

async function signedInClient(): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext();
  const page = await context.newPage();
  page.on("pageerror", (error) => console.error(`page error: ${error.message}`));
  await signInWithPassword(page, app.appUrl, "client@kinarc.test", DEMO_PASSWORD);
  await page.waitForURL(`${app.appUrl}/home`);
  return { context, page };
}

/** From the client's home to a running camera on the set-up step, PIP flexion of the right middle finger. */
async function openSetup(page: Page): Promise<void> {
  await page.getByRole("link", { name: "Start a self-check" }).click();
  await page.waitForURL(`${app.appUrl}/practice/check`);
  await page.getByRole("button", { name: "I understand, continue" }).click();
  await page.getByLabel("Movement", { exact: true }).selectOption("pip.flexion");
  await page.getByLabel("Finger", { exact: true }).selectOption("middle");
  await page.getByRole("radio", { name: /Lifting up/ }).check();
  await page.getByRole("button", { name: "Next: how to sit" }).click();
  await page.getByRole("button", { name: "Turn on the camera" }).click();
}

/** Waits until every set-up check that blocks has passed, then starts the countdown. */
async function startWhenReady(page: Page): Promise<void> {
  const start = page.getByRole("button", { name: "Start", exact: true });
  await page.waitForFunction(
    () => {
      const button = [...document.querySelectorAll("button")].find((b) => b.textContent?.trim() === "Start");
      return button && !button.disabled;
    },
    null,
    { timeout: 60_000, polling: 100 },
  );
  await start.click();
}

async function waitForStep(page: Page, step: string, timeoutMs: number): Promise<void> {
  await page.waitForFunction((s) => document.querySelector("[data-testid=self-check]")?.getAttribute("data-step") === s, step, { timeout: timeoutMs, polling: 200 });
}

async function storedCapture(attemptId: string): Promise<CaptureFile> {
  const [row] = await db.select().from(attemptCaptures).where(eq(attemptCaptures.attemptId, attemptId));
  return parseCapture(JSON.parse(gunzipSync(row.gzip).toString("utf8")), attemptId);
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted.length ? sorted[Math.floor(sorted.length / 2)] : Number.NaN;
}

/** The engine's raw readings (no accuracy correction) per frame, mean of index to little fingers. */
function fingerFlexion(capture: CaptureFile, motion: MotionId): number[] {
  return rawFlexionByFrame(capture, motion).filter((v): v is number => v !== null);
}

function rawFlexionByFrame(capture: CaptureFile, motion: MotionId): (number | null)[] {
  return capture.frames.map((f) => {
    const axes = f.hand ? handAxes(f.hand, capture.side) : null;
    if (!f.hand || !axes) return null;
    const readings = FINGERS.map((digit) => readMotion(motion, digit, f.hand!, axes, null)).filter((r) => r !== null);
    return readings.length ? readings.reduce((s, r) => s + r.deg, 0) / readings.length : null;
  });
}

/**
 * The app's own reading per frame (mean of index to little fingers), as the engine reads a stored attempt: the live
 * pipeline with the accuracy correction where it clearly helps (vision/uncertainty-table.json), the frame's picture
 * points included. Null where any finger has no reading.
 */
function appFlexionByFrame(capture: CaptureFile, motion: MotionId): (number | null)[] {
  const perFinger = FINGERS.map((digit) => {
    const pipeline = createLivePipeline({ motion, side: capture.side, digit, condition: capture.condition });
    return capture.frames.map((f) => pipeline.push({ t: f.t, score: f.score, hand: f.hand, image: f.image ?? undefined, imageAspect: capture.imageAspect }).angleDeg);
  });
  return capture.frames.map((_, i) => {
    const values = perFinger.map((series) => series[i]);
    return values.every((v) => v !== null) ? values.reduce((a, b) => a! + b!, 0)! / values.length : null;
  });
}

describe("guided self-check on the hand-photo clip", () => {
  it("tracks the hand, reads open hand and fist apart, and saves an attempt the server computed", async () => {
    // The demo seed may hold attempts of its own: only the one this test adds counts.
    const seeded = new Set((await db.select().from(attempts).where(eq(attempts.clientId, app.seed.clientIds!.dorian))).map((a) => a.id));
    const { context, page } = await signedInClient();
    await openSetup(page);
    await startWhenReady(page);
    // Where detection ran in the built app: a worker unless the browser refused one (then the main thread).
    const thread = await page.getByTestId("camera-view").getAttribute("data-thread");
    expect(["worker", "main"]).toContain(thread);
    await waitForStep(page, "recording", 15_000);
    // Where tracking runs in a worker, the second model reads from the countdown on, and the page says so.
    if (thread === "worker") await page.getByTestId("recording-models").waitFor({ timeout: 5_000 });
    // Three repetitions of about four seconds each, plus settling; the flow ends by itself after the third.
    await waitForStep(page, "summary", 80_000);
    await page.waitForSelector("[data-testid=save-status][data-saved=yes]", { timeout: 20_000 });
    const shownPeak = await page.getByTestId("summary-peak").textContent();

    const rows = (await db.select().from(attempts).where(eq(attempts.clientId, app.seed.clientIds!.dorian))).filter((a) => !seeded.has(a.id));
    expect(rows).toHaveLength(1);
    const [row] = rows;
    expect(row).toMatchObject({ motion: "pip.flexion", side: "right", digit: "middle", condition: "against_gravity", source: "self_check" });

    const capture = await storedCapture(row.id);
    const withHand = capture.frames.filter((f) => f.hand).length;
    const detectionRate = withHand / capture.frames.length;

    // Finger flexion is read by both hand models while recording (where tracking runs in a worker): the stored capture
    // carries the full model's frames at the same times, and the page says so.
    const fullFrames = capture.fullModel?.frames ?? [];
    const fullWithHand = fullFrames.filter((f) => f.hand).length;
    if (thread === "worker") {
      expect(fullFrames.map((f) => f.t)).toEqual(capture.frames.map((f) => f.t));
      expect(fullWithHand / fullFrames.length).toBeGreaterThanOrEqual(MIN_DETECTION_RATE);
      expect(await page.getByTestId("summary-models").getAttribute("data-models")).toBe("2");
    } else {
      expect(capture.fullModel).toBeUndefined();
    }

    // The stored numbers are the engine's analysis of the stored capture (the server's own), not the browser's.
    const analysis = analyzeCaptureFile(capture);
    expect(row.frames).toBe(capture.frames.length);
    expect(row.usableFrames).toBe(analysis.usableFrames);
    expect(row.reps).toBe(analysis.reps);
    expect(row.peakDeg).toBe(analysis.peakDeg);
    expect(row.planeVerified).toBe(analysis.planeAgrees);
    expect(row.engineVersion).toMatch(/^kinarc-engine\//);
    if (row.peakDeg !== null) expect(shownPeak).toContain(`${Math.round(row.peakDeg)}°`);

    // Open hand and fist: split the frames at the midpoint between the 10th and 90th percentile of PIP flexion (the
    // clip alternates the two photos; every frame shows one or the other).
    const pip = fingerFlexion(capture, "pip.flexion");
    const mcp = fingerFlexion(capture, "mcp.flexion");
    const sorted = [...pip].sort((a, b) => a - b);
    const cut = (sorted[Math.floor(sorted.length * 0.1)] + sorted[Math.floor(sorted.length * 0.9)]) / 2;
    const open = { pip: median(pip.filter((v) => v < cut)), mcp: median(mcp.filter((_, i) => pip[i] < cut)) };
    const fist = { pip: median(pip.filter((v) => v >= cut)), mcp: median(mcp.filter((_, i) => pip[i] >= cut)) };
    console.log(
      `self-check clip (tracking in the ${thread} thread): ${withHand}/${capture.frames.length} frames with a hand (${(detectionRate * 100).toFixed(1)}%), ` +
        `full model ${fullWithHand}/${fullFrames.length}; ` +
        `stored attempt: ${row.reps} reps, peak ${row.peakDeg?.toFixed(1)}°, plane ${row.planeVerdict} (${row.planeVerified ? "agrees" : "does not agree"}); ` +
        `raw engine, mean of index-little, median: open hand MCP ${open.mcp.toFixed(0)}° PIP ${open.pip.toFixed(0)}°, fist MCP ${fist.mcp.toFixed(0)}° PIP ${fist.pip.toFixed(0)}°`,
    );

    expect(detectionRate).toBeGreaterThanOrEqual(MIN_DETECTION_RATE);
    // The issue's bars: an open hand near zero, a fist large. A straight finger is at 0° [AAOS 1965 zero position,
    // common practice]; a goniometer's own error is about 5° (Macionis 2013, SEM 2.4-4.9°) and camera estimates are
    // worse (clinical notes), so "near zero" is taken as at most 15°. A full fist flexes MCP to about 90° and PIP to
    // about 100° [AAOS 1965 normal values, from memory via the clinical notes]; "large" is at least half of each.
    const bars = [
      { name: "open hand MCP <= 15°", met: open.mcp <= 15 },
      { name: "open hand PIP <= 15°", met: open.pip <= 15 },
      { name: "fist MCP >= 45°", met: fist.mcp >= 45 },
      { name: "fist PIP >= 50°", met: fist.pip >= 50 },
    ];
    console.log(`issue 4 bars on the raw engine (no accuracy correction): ${bars.map((b) => `${b.name}: ${b.met ? "met" : "NOT met"}`).join("; ")}`);
    // Met on this clip with the raw engine, and held here so a regression shows:
    expect(open.mcp).toBeLessThanOrEqual(15);
    expect(fist.pip).toBeGreaterThanOrEqual(50);
    // Not met by raw landmarks on this clip (open PIP reads about 23°, fist MCP about 23°: a fist seen from the palm
    // bends the MCP joints toward the camera, where single-view depth is weakest; shared/notes/hand-models.md). Raw,
    // only the direction and a conservative gap are held; the app's corrected reading is held to the bars below.
    expect(fist.mcp - open.mcp).toBeGreaterThanOrEqual(10);
    expect(fist.pip - open.pip).toBeGreaterThanOrEqual(40);
    expect(open.pip).toBeLessThanOrEqual(35);

    // As the app reads the same frames (accuracy correction on where it clearly helps): the issue's bars in full.
    // Frames are split as above, by the raw PIP reading, so the split does not depend on what is being checked.
    const rawPip = rawFlexionByFrame(capture, "pip.flexion");
    const appMcp = appFlexionByFrame(capture, "mcp.flexion");
    const appPip = appFlexionByFrame(capture, "pip.flexion");
    const pick = (values: (number | null)[], fist: boolean) =>
      median(values.flatMap((v, i) => (v !== null && rawPip[i] !== null && rawPip[i]! >= cut === fist ? [v] : [])));
    const appReading = { open: { mcp: pick(appMcp, false), pip: pick(appPip, false) }, fist: { mcp: pick(appMcp, true), pip: pick(appPip, true) } };
    console.log(`app reading (correction on), median: open hand MCP ${appReading.open.mcp.toFixed(0)}° PIP ${appReading.open.pip.toFixed(0)}°, fist MCP ${appReading.fist.mcp.toFixed(0)}° PIP ${appReading.fist.pip.toFixed(0)}°`);
    expect(appReading.open.mcp).toBeLessThanOrEqual(15);
    expect(appReading.open.pip).toBeLessThanOrEqual(15);
    expect(appReading.fist.mcp).toBeGreaterThanOrEqual(45);
    expect(appReading.fist.pip).toBeGreaterThanOrEqual(50);
    await context.close();
  });

  it("an attempt finished while offline stays on the device and is saved exactly once when the connection returns", async () => {
    const before = await db.select().from(attempts).where(eq(attempts.clientId, app.seed.clientIds!.dorian));
    const { context, page } = await signedInClient();
    await openSetup(page);
    await startWhenReady(page);
    await waitForStep(page, "recording", 15_000);
    await context.setOffline(true);
    await waitForStep(page, "summary", 80_000);

    // Nothing can arrive while offline: the outbox holds it and says so.
    await page.waitForSelector("[data-testid=outbox-status][data-pending='1']", { timeout: 10_000 });
    await page.waitForTimeout(3_000);
    expect(await page.getByTestId("save-status").getAttribute("data-saved")).toBe("no");
    expect(await db.select().from(attempts).where(eq(attempts.clientId, app.seed.clientIds!.dorian))).toHaveLength(before.length);

    await context.setOffline(false);
    await page.waitForSelector("[data-testid=save-status][data-saved=yes]", { timeout: 30_000 });
    await page.waitForSelector("[data-testid=outbox-status]", { state: "detached", timeout: 10_000 });
    // Give any duplicate delivery time to land before counting.
    await page.waitForTimeout(3_000);
    const after = await db.select().from(attempts).where(eq(attempts.clientId, app.seed.clientIds!.dorian));
    expect(after).toHaveLength(before.length + 1);
    const added = after.filter((a) => !before.some((b) => b.id === a.id));
    expect(new Set(after.map((a) => a.captureUid)).size).toBe(after.length);
    expect(added[0]).toMatchObject({ motion: "pip.flexion", source: "self_check" });
    await context.close();
  });

  it("the capture endpoint: 401 without a session, 404 for another client, 413 over the size limit, 201 then 200 for a retry", async () => {
    const capture = { format: "kinarc.capture", version: 1, motion: "pip.flexion", side: "right", digit: "middle", condition: "against_gravity", frames: [{ t: 0, score: 0.9, hand: null }] };
    const body = { captureUid: "e2e-endpoint-check-0001", source: "self_check", clientId: app.seed.clientIds!.dorian, capture };
    const anonymous = await browser.newContext();
    const refused = await anonymous.request.post(`${app.appUrl}/api/v1/captures`, { data: body, maxRedirects: 0 });
    expect(refused.status()).toBe(401);
    await anonymous.close();

    const { context } = await signedInClient();
    const post = (data: unknown, headers: Record<string, string> = {}) => context.request.post(`${app.appUrl}/api/v1/captures`, { data: data as object, headers });
    expect((await post({ ...body, clientId: app.seed.clientIds!.kofi })).status()).toBe(404);
    // 8 MB and a bit, as the endpoint states its limit.
    const huge = await post(JSON.stringify({ ...body, padding: "x".repeat(8 * 1024 * 1024) }), { "content-type": "application/json" });
    expect(huge.status()).toBe(413);
    expect((await huge.json()).error).toMatch(/larger than 8 MB/);
    const bad = await post({ ...body, capture: { ...capture, frames: [{ t: 0, score: 2, hand: null }] } });
    expect(bad.status()).toBe(400);
    expect((await bad.json()).fields).toHaveProperty(["capture.frames[0].score"]);
    const first = await post(body);
    expect(first.status()).toBe(201);
    const again = await post(body);
    expect(again.status()).toBe(200);
    expect((await again.json()).attempt.id).toBe((await first.json()).attempt.id);
    await context.close();
  });
});
