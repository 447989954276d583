/**
 * A wrist self-check in the built app with no forearm in view: the client takes the straight-wrist reading (the
 * forearm line then comes from it, issue 8 item 6), records, and the attempt reaches the database with the reading's
 * frames in its capture file, so the server measures against the same line. The fake camera shows one real photo of
 * a right hand (Debian's gcompris-qt-data, made into a clip at test time, never committed) that does not move: the
 * wrist is exactly as it was during the reading, so the true wrist angle throughout is 0 degrees (geometry: a hand
 * compared with itself).
 */
import path from "node:path";
import { gunzipSync } from "node:zlib";
import { eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openDatabase, type Database } from "@/db";
import { attemptCaptures, attempts } from "@/db/schema";
import { DEMO_PASSWORD } from "@/db/seed/demo";
import { parseCapture } from "@/lib/capture/parse";
import { analyzeCapture } from "@/vision/analyze-capture";
import { createLivePipeline } from "@/vision/pipeline";
import { neutralReading } from "@/vision/wrist-axis";
import { makeHandClip, STANDARD_CLIPS } from "../../scripts/fixtures/hand-photos";
import { buildModels } from "../../scripts/models/build";
import { signInWithPassword, startTestApp, type TestApp } from "./support/app";
import { launchChromium } from "./support/browser";

const REPO_ROOT = path.resolve(__dirname, "..", "..");

let app: TestApp;
let browser: Browser;
let db: Database;
let closeDb: () => void;

beforeAll(async () => {
  buildModels({ repoRoot: REPO_ROOT });
  app = await startTestApp("self-check-wrist");
  browser = await launchChromium({ fakeCameraClip: makeHandClip(STANDARD_CLIPS.openHandCamera) });
  const opened = openDatabase(app.databaseUrl);
  db = opened.db;
  closeDb = () => opened.client.close();
});

afterAll(async () => {
  await browser?.close();
  await app?.stop();
  closeDb?.();
});

async function waitForStep(page: Page, step: string, timeoutMs: number): Promise<void> {
  await page.waitForFunction((s) => document.querySelector("[data-testid=self-check]")?.getAttribute("data-step") === s, step, { timeout: timeoutMs, polling: 200 });
}

async function enabledButton(page: Page, name: string, timeoutMs: number) {
  await page.waitForFunction(
    (label) => [...document.querySelectorAll("button")].some((b) => b.textContent?.trim() === label && !b.disabled),
    name,
    { timeout: timeoutMs, polling: 100 },
  );
  return page.getByRole("button", { name, exact: true });
}

describe("wrist self-check with a straight-wrist reading", () => {
  it("takes the reading, records, and the server measures the wrist against it", async () => {
    const seeded = new Set((await db.select().from(attempts).where(eq(attempts.clientId, app.seed.clientIds!.dorian))).map((a) => a.id));
    const context = await browser.newContext();
    const page = await context.newPage();
    page.on("pageerror", (error) => console.error(`page error: ${error.message}`));
    await signInWithPassword(page, app.appUrl, "client@kinarc.test", DEMO_PASSWORD);
    await page.waitForURL(`${app.appUrl}/home`);

    await page.getByRole("link", { name: "Start a self-check" }).click();
    await page.waitForURL(`${app.appUrl}/practice/check`);
    await page.getByRole("button", { name: "I understand, continue" }).click();
    const movement = page.getByLabel("Movement", { exact: true });
    const offered = await movement.locator("option").evaluateAll((options) => options.map((o) => (o as HTMLOptionElement).value));
    const motion = ["wrist.extension", "wrist.flexion"].find((m) => offered.includes(m));
    expect(motion, `a wrist motion offered to the demo client (offered: ${offered.join(", ")})`).toBeDefined();
    await movement.selectOption(motion!);
    await page.getByRole("radio", { name: /Lifting up/ }).check();
    await page.getByRole("button", { name: "Next: how to sit" }).click();
    await page.getByRole("button", { name: "Turn on the camera" }).click();

    // Wrist motions go through the straight-wrist reading before the countdown.
    await (await enabledButton(page, "Next: straight-wrist reading", 60_000)).click();
    await waitForStep(page, "neutral", 5_000);
    await (await enabledButton(page, "Take the reading", 30_000)).click();
    await page.waitForSelector("[data-testid=neutral-status][data-status=taken]", { timeout: 30_000 });
    await (await enabledButton(page, "Start", 5_000)).click();
    await waitForStep(page, "recording", 15_000);
    // A still hand makes no repetitions: record a few seconds and finish by hand.
    await page.waitForTimeout(4_000);
    await page.getByRole("button", { name: "Finish now" }).click();
    await waitForStep(page, "summary", 20_000);
    await page.waitForSelector("[data-testid=save-status][data-saved=yes]", { timeout: 20_000 });
    expect(await page.getByTestId("summary-forearm").getAttribute("data-source")).toBe("neutral-reading");

    const rows = (await db.select().from(attempts).where(eq(attempts.clientId, app.seed.clientIds!.dorian))).filter((a) => !seeded.has(a.id));
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ motion, side: "right", source: "self_check" });
    const [stored] = await db.select().from(attemptCaptures).where(eq(attemptCaptures.attemptId, rows[0].id));
    const capture = parseCapture(JSON.parse(gunzipSync(stored.gzip).toString("utf8")), rows[0].id);
    // The reading travels with the capture, so the server takes the same forearm line again.
    expect(capture.neutral?.frames.length ?? 0).toBeGreaterThan(10);
    const analysis = analyzeCapture(capture);
    expect(analysis.forearmSource).toBe("neutral-reading");
    expect(analysis.neutral?.usableFrames ?? 0).toBeGreaterThan(10);
    // A still hand makes no repetition, and the server says so rather than inventing a peak.
    expect(rows[0].reps).toBe(0);
    expect(analysis.reps).toBe(0);
    // Frame by frame against the reading: the hand never moved from it, so the true wrist angle is 0.
    const neutral = neutralReading(capture.neutral!.frames, capture.side);
    expect(neutral.ok).toBe(true);
    const pipeline = createLivePipeline({ motion: capture.motion, side: capture.side, digit: capture.digit, condition: capture.condition, neutral: neutral.ok ? neutral.reading : null });
    const angles = capture.frames.flatMap((f) => {
      const u = pipeline.push(f);
      return u.angleDeg === null ? [] : [u.angleDeg];
    });
    expect(angles.length).toBeGreaterThan(capture.frames.length * 0.9);
    const sorted = [...angles].sort((a, b) => a - b);
    const median = sorted[Math.floor(sorted.length / 2)];
    // Within the wrist-axis method's measured error on renders (vision/wrist-axis-validation.json, a few degrees).
    expect(Math.abs(median)).toBeLessThan(5);
    await context.close();
  });
});
