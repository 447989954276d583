/**
 * Home practice in the built app: a therapist assigns PIP flexion of the right middle finger to Dorian; Dorian, on
 * Chromium's fake camera fed with the hand-photo clip (right hand, open for two seconds, fist for two, looping; made
 * at test time from Debian's gcompris-qt-data photos), practises it through the guided self-check; the attempt is
 * stored as practice in one session; the therapist then sees the session in this week's adherence and its reading in
 * the trend. A fault test stops the server in the middle of a practice session and starts it again on the same
 * database: the attempt recorded while it was down reaches the same session, once.
 */
import path from "node:path";
import { eq } from "drizzle-orm";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openDatabase, type Database } from "@/db";
import { attempts, homeProgramItems, practiceSessions } from "@/db/schema";
import { makeHandClip } from "../../scripts/fixtures/hand-photos";
import { buildModels } from "../../scripts/models/build";
import { startLocalStack, type LocalStack } from "../../scripts/lib/local-stack";
import { signedInContext, startTestApp, TEST_PORTS, type TestApp } from "./support/app";
import { launchChromium } from "./support/browser";
import { StepClock } from "./support/steps";

const REPO_ROOT = path.resolve(__dirname, "..", "..");
/** The restart test's limit; its steps' deadlines add up to less. */
const RESTART_TEST_MS = 420_000;

let app: TestApp;
/** The server started again on the same database by the fault test; stopped instead of `app` when set. */
let restarted: LocalStack | null = null;
let appStopped = false;
let browser: Browser;
let db: Database;
let closeDb: () => void;

beforeAll(async () => {
  buildModels({ repoRoot: REPO_ROOT });
  const clip = makeHandClip({ photos: ["right-open-palm", "right-fist-palm"], secondsPerPhoto: 2, format: "mjpeg" });
  app = await startTestApp("practice");
  browser = await launchChromium({ fakeCameraClip: clip });
  const opened = openDatabase(app.databaseUrl);
  db = opened.db;
  closeDb = () => opened.client.close();
});

afterAll(async () => {
  await browser?.close();
  if (restarted) await restarted.stop();
  else if (!appStopped) await app?.stop();
  closeDb?.();
});

async function signedIn(email: string): Promise<Page> {
  return (await signedInContext(browser, app.appUrl, email)).page;
}

describe("home practice", () => {
  it("the therapist assigns a motion, the client practises it with the self-check, the therapist sees it in adherence", async () => {
    const dorianId = app.seed.clientIds!.dorian;
    const before = new Set((await db.select().from(homeProgramItems).where(eq(homeProgramItems.clientId, dorianId))).map((i) => i.id));

    // Therapist: the record's "Home program" page, a field-named error first, then a valid assignment.
    const therapist = await signedIn("therapist@kinarc.test");
    await therapist.goto(`${app.appUrl}/clients/${dorianId}`);
    await therapist.getByRole("link", { name: "Home program" }).click();
    await therapist.waitForURL(`${app.appUrl}/clients/${dorianId}/program`);
    const form = therapist.getByTestId("new-item-form");
    await form.locator("#new-item-motion").selectOption("pip.flexion");
    await form.locator("#new-item-digit").selectOption("middle");
    await form.locator("#new-item-side").selectOption("right");
    await form.locator("#new-item-condition").selectOption("against_gravity");
    await form.locator("#new-item-repetitions").fill("0");
    await form.getByRole("button", { name: "Assign" }).click();
    await expect.poll(() => form.locator("#new-item-repetitions-error").textContent(), { timeout: 15_000 }).toBe("expected at least 1");
    await form.locator("#new-item-repetitions").fill("3");
    await form.locator("#new-item-sessionsPerPeriod").fill("1");
    await form.locator("#new-item-period").selectOption("day");
    await form.getByRole("button", { name: "Assign" }).click();
    await form.getByText("Program item assigned.").waitFor({ timeout: 15_000 }).catch(async () => console.error(`assign form: ${await form.getByRole("alert").allTextContents()}`));
    await expect
      .poll(async () => (await db.select().from(homeProgramItems).where(eq(homeProgramItems.clientId, dorianId))).filter((i) => !before.has(i.id)).length, {
        timeout: 15_000,
      })
      .toBe(1);
    const [item] = (await db.select().from(homeProgramItems).where(eq(homeProgramItems.clientId, dorianId))).filter((i) => !before.has(i.id));
    expect(item).toMatchObject({ motion: "pip.flexion", side: "right", digit: "middle", condition: "against_gravity", repetitions: 3, sessionsPerPeriod: 1, period: "day" });
    const itemView = therapist.locator(`[data-testid=program-item][data-item-id="${item.id}"]`);
    await itemView.waitFor({ timeout: 15_000 });
    const weekRow = itemView.locator("[data-testid=adherence] tbody tr").last();
    expect(await weekRow.getAttribute("data-done")).toBe("0");

    // Client: today's practice on the home page, into the guided self-check for that item.
    const client = await signedIn("client@kinarc.test");
    const entry = client.locator(`[data-testid=practice-today] li[data-item-id="${item.id}"]`);
    expect(await entry.getAttribute("data-due")).toBe("yes");
    await client.getByTestId("practice-calendar").waitFor();
    await entry.getByRole("link", { name: /^Practise / }).click();
    await client.waitForURL(`${app.appUrl}/practice/check?item=${item.id}`);
    expect(await client.getByTestId("practice-item").textContent()).toMatch(/3 times/);
    await client.getByRole("button", { name: "I understand, continue" }).click();
    // The motion is fixed by the program: straight to positioning, no choice of motion.
    expect(await client.getByTestId("self-check").getAttribute("data-step")).toBe("position");
    await client.getByRole("button", { name: "Turn on the camera" }).click();
    await client.waitForFunction(
      () => {
        const button = [...document.querySelectorAll("button")].find((b) => b.textContent?.trim() === "Start");
        return button && !button.disabled;
      },
      null,
      { timeout: 60_000, polling: 100 },
    );
    await client.getByRole("button", { name: "Start", exact: true }).click();
    await client.waitForFunction(() => document.querySelector("[data-testid=self-check]")?.getAttribute("data-step") === "summary", null, { timeout: 95_000, polling: 200 });
    await client.waitForSelector("[data-testid=save-status][data-saved=yes]", { timeout: 20_000 });

    const sessions = await db.select().from(practiceSessions).where(eq(practiceSessions.itemId, item.id));
    expect(sessions).toHaveLength(1);
    const stored = await db.select().from(attempts).where(eq(attempts.practiceSessionId, sessions[0].id));
    expect(stored).toHaveLength(1);
    expect(stored[0]).toMatchObject({ source: "practice", motion: "pip.flexion", side: "right", digit: "middle", clientId: dorianId, keptAt: null });

    // Back home, the item is done for today and the calendar counts the session.
    await client.goto(`${app.appUrl}/home`);
    expect(await entry.getAttribute("data-due")).toBe("no");
    expect(await client.locator(`[data-testid=practice-calendar] li[data-date="${sessions[0].localDate}"]`).getAttribute("data-done")).toBe("1");

    // Therapist: this week's adherence shows the session and the trend lists its reading.
    await therapist.reload();
    expect(await weekRow.getAttribute("data-done")).toBe("1");
    const readings = await itemView.getByTestId("trend-readings").locator("li").allTextContents();
    expect(readings).toEqual([`${Math.round(stored[0].peakDeg!)}°`]);
    console.log(`practice: session ${sessions[0].localDate}, attempt ${stored[0].reps} reps, peak ${stored[0].peakDeg?.toFixed(1)}°; adherence this week ${await weekRow.textContent()}`);
  }, 240_000);

  it("the program API over HTTP: the client's own view, 404 across clients, 403 for admins, 400 naming the field, end keeps the item", async () => {
    const { dorian, wren } = app.seed.clientIds!;
    const url = (clientId: string, rest = "") => `${app.appUrl}/api/v1/clients/${clientId}/program${rest}`;
    const client = await signedIn("client@kinarc.test");
    const own = await client.request.get(url(dorian));
    expect(own.status()).toBe(200);
    const body = await own.json();
    expect(body.view).toBe("client");
    expect(JSON.stringify(body)).not.toContain("trend");
    expect((await client.request.get(url(wren))).status()).toBe(404);
    expect((await client.request.post(url(dorian), { data: {} })).status()).toBe(403);

    const admin = await signedIn("admin@kinarc.test");
    expect((await admin.request.get(url(dorian))).status()).toBe(403);
    expect((await admin.request.post(url(dorian), { data: {} })).status()).toBe(403);

    const assistant = await signedIn("assistant@kinarc.test");
    const item = { motion: "wrist.flexion", side: "right", digit: null, condition: "gravity_minimized", repetitions: 8, sessionsPerPeriod: 2, period: "week", startDate: "2026-12-01", endDate: "2026-12-31" };
    const bad = await assistant.request.post(url(dorian), { data: { ...item, period: "fortnight" } });
    expect(bad.status()).toBe(400);
    expect((await bad.json()).fields).toEqual({ period: "expected day or week" });
    const created = await assistant.request.post(url(dorian), { data: item });
    expect(created.status()).toBe(201);
    const { item: stored } = await created.json();
    const ended = await assistant.request.delete(url(dorian, `/${stored.id}`));
    expect(ended.status()).toBe(200);
    expect((await ended.json()).item.endedAt).not.toBeNull();
    const staff = await (await assistant.request.get(url(dorian))).json();
    expect(staff.items.find((i: { id: string }) => i.id === stored.id)?.status).toBe("ended");
  });

  it("the server stops in the middle of a practice session and restarts: nothing recorded is lost or stored twice", async () => {
    const dorianId = app.seed.clientIds!.dorian;
    const today = new Date().toISOString().slice(0, 10);
    const [item] = await db
      .insert(homeProgramItems)
      .values({ clinicId: app.seed.clinicId!, clientId: dorianId, motion: "pip.flexion", side: "right", digit: "middle", condition: "against_gravity", repetitions: 3, sessionsPerPeriod: 2, period: "day", startDate: today, endDate: today })
      .returning();
    // Each wait runs as a named step with its own deadline, inside the test's limit: a hang names the step it was in.
    const steps = new StepClock(RESTART_TEST_MS - 10_000);
    const client = await steps.run("sign in and open the self-check", 40_000, async () => {
      const page = await signedIn("client@kinarc.test");
      await page.goto(`${app.appUrl}/practice/check?item=${item.id}`);
      await page.getByRole("button", { name: "I understand, continue" }).click();
      await page.getByRole("button", { name: "Turn on the camera" }).click();
      return page;
    });
    const startEnabled = (which: string) =>
      steps.run(`${which}: Start can be pressed`, 45_000, () =>
        client.waitForFunction(
          () => {
            const button = [...document.querySelectorAll("button")].find((b) => b.textContent?.trim() === "Start");
            return button && !button.disabled;
          },
          null,
          { timeout: 50_000, polling: 100 },
        ),
      );
    const record = (which: string, whileRecording?: () => Promise<void>) =>
      steps.run(`${which}: recorded through to its summary`, 70_000, async () => {
        await client.getByRole("button", { name: "Start", exact: true }).click();
        await client.waitForFunction(() => document.querySelector("[data-testid=self-check]")?.getAttribute("data-step") === "recording", null, { timeout: 75_000, polling: 100 });
        await whileRecording?.();
        await client.waitForFunction(() => document.querySelector("[data-testid=self-check]")?.getAttribute("data-step") === "summary", null, { timeout: 75_000, polling: 200 });
      });
    // First attempt of the sitting, saved while the server runs.
    await startEnabled("first attempt");
    await record("first attempt");
    await steps.run("first attempt: saved", 20_000, () => client.waitForSelector("[data-testid=save-status][data-saved=yes]", { timeout: 25_000 }));
    // Second attempt: the server goes down while the client is moving, and comes back on the same database.
    await client.getByRole("button", { name: "Try this one again" }).click();
    await startEnabled("second attempt");
    await record("second attempt, the server stopped while recording", async () => {
      await app.stop();
      appStopped = true;
    });
    expect(await client.getByTestId("save-status").getAttribute("data-saved")).toBe("no");
    await steps.run("the server starts again on the same database", 40_000, async () => {
      restarted = await startLocalStack({ ...TEST_PORTS, databaseUrl: app.databaseUrl, authSecret: app.env.AUTH_SECRET });
    });
    // The page's outbox retries on its own timer (doubling from 2 s), with no help from the test.
    await steps.run("second attempt: resent by the outbox and saved", 60_000, () =>
      client.waitForSelector("[data-testid=save-status][data-saved=yes]", { timeout: 65_000 }),
    );

    const sessions = await db.select().from(practiceSessions).where(eq(practiceSessions.itemId, item.id));
    expect(sessions).toHaveLength(1);
    const stored = await db.select().from(attempts).where(eq(attempts.practiceSessionId, sessions[0].id));
    expect(stored).toHaveLength(2);
    expect(new Set(stored.map((a) => a.captureUid)).size).toBe(2);
    expect(stored.every((a) => a.source === "practice")).toBe(true);
  }, RESTART_TEST_MS);
});
