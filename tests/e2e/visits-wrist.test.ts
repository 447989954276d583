/**
 * A wrist test in a video visit with no forearm in view: the therapist asks for the straight-wrist reading over the
 * visit's reliable data channel, the client's screen walks them through it, the outcome reaches the therapist's
 * console, the live angle is read against it, and the kept attempt's capture carries the reading's frames so the
 * server measures against the same forearm line (issue 8 item 6). The client's fake camera shows one real photo of a
 * right hand (Debian's gcompris-qt-data, made into a clip at test time, never committed) that does not move: a
 * still photo is a valid reading, and the hand is exactly as it was during the reading, so the true wrist angle
 * throughout is 0 degrees (geometry: a hand compared with itself).
 */
import path from "node:path";
import { gunzipSync } from "node:zlib";
import { eq } from "drizzle-orm";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Database } from "@/db";
import { attemptCaptures, attempts, clients, users, visits } from "@/db/schema";
import { parseCapture } from "@/lib/capture/parse";
import { analyzeCapture } from "@/vision/analyze-capture";
import { makeHandClip, STANDARD_CLIPS } from "../../scripts/fixtures/hand-photos";
import { buildModels } from "../../scripts/models/build";
import { signedInContext, startTestApp, withAppDatabase, type TestApp } from "./support/app";
import { launchChromium } from "./support/browser";

const REPO_ROOT = path.resolve(__dirname, "..", "..");

let app: TestApp;
let therapistBrowser: Browser;
let clientBrowser: Browser;
let therapist: BrowserContext;
let client: BrowserContext;
let visitId: string;

async function signedIn(browser: Browser, email: string): Promise<BrowserContext> {
  return (await signedInContext(browser, app.appUrl, email, { permissions: ["camera", "microphone"] })).context;
}

const db = <T>(fn: (d: Database) => Promise<T>) => withAppDatabase(app, fn);

beforeAll(async () => {
  buildModels({ repoRoot: REPO_ROOT });
  app = await startTestApp("visits-wrist");
  therapistBrowser = await launchChromium({ extraArgs: ["--use-fake-device-for-media-stream", "--use-fake-ui-for-media-stream"] });
  clientBrowser = await launchChromium({ fakeCameraClip: makeHandClip(STANDARD_CLIPS.openHandCamera) });
  therapist = await signedIn(therapistBrowser, "therapist@kinarc.test");
  client = await signedIn(clientBrowser, "client@kinarc.test");
  // Booking is covered by visits.test.ts; here the visit is written straight in, starting now.
  visitId = await db(async (d) => {
    const [dorian] = await d.select().from(clients).where(eq(clients.id, app.seed.clientIds!.dorian));
    const [tomasz] = await d.select().from(users).where(eq(users.email, "therapist@kinarc.test"));
    const [row] = await d
      .insert(visits)
      .values({ clinicId: dorian.clinicId, clientId: dorian.id, therapistId: tomasz.id, kind: "video", startsAt: new Date(), reason: "Wrist range after the plate" })
      .returning();
    return row.id;
  });
}, 240_000);

afterAll(async () => {
  await therapistBrowser?.close();
  await clientBrowser?.close();
  await app?.stop();
});

describe("straight-wrist reading in a video visit", () => {
  let therapistPage: Page;
  let clientPage: Page;

  it("both join and the therapist asks for a wrist test", async () => {
    clientPage = client.pages()[0];
    await clientPage.goto(`${app.appUrl}/visits/${visitId}`);
    await clientPage.waitForURL(/\/consent\?next=/);
    await clientPage.getByLabel(/I agree to video visits/).check();
    await clientPage.getByRole("button", { name: "Agree and continue" }).click();
    await clientPage.waitForURL(`${app.appUrl}/visits/${visitId}`);
    const join = clientPage.getByRole("button", { name: "Join the visit" });
    await expect.poll(() => join.isEnabled(), { timeout: 60_000 }).toBe(true);
    await join.click();
    await expect.poll(() => clientPage.getByTestId("client-test").textContent(), { timeout: 30_000 }).toMatch(/You are connected/);

    therapistPage = therapist.pages()[0];
    await therapistPage.goto(`${app.appUrl}/visits/${visitId}`);
    await therapistPage.getByRole("button", { name: "Join the visit" }).click();
    await therapistPage.getByRole("region", { name: "Live reading" }).waitFor({ timeout: 30_000 });
    const picker = therapistPage.getByRole("form", { name: "Next test" });
    await picker.getByLabel("Motion").selectOption("wrist.extension");
    await picker.getByLabel("Side").selectOption("right");
    await picker.getByLabel("Condition").selectOption("gravity_minimized");
    const ask = picker.getByRole("button", { name: "Ask the client to do this" });
    await expect.poll(() => ask.isEnabled(), { timeout: 30_000 }).toBe(true);
    await ask.click();
    await expect.poll(() => clientPage.getByTestId("client-test").textContent(), { timeout: 15_000 }).toMatch(/Wrist extension \(right\)/);
    // Before any reading the angle is read from how the hand started, and the console says so.
    await expect.poll(() => therapistPage.getByTestId("live-forearm").getAttribute("data-source"), { timeout: 30_000 }).toBe("capture-start");
    expect(await therapistPage.getByTestId("console-neutral").getAttribute("data-status")).toBe("none");
    // With the held-out figure for wrists read that way (vision/uncertainty-table.json withoutStraightWristReading).
    expect(await therapistPage.getByTestId("console-neutral").textContent()).toMatch(/to within about ± \d+° only\. Ask for the reading before the attempt\./);
  });

  it("the reading is asked for, the client is walked through it, and the console learns it was taken", async () => {
    await therapistPage.getByRole("button", { name: "Ask for the straight-wrist reading" }).click();
    // The client sees the self-check's words and the hold-still count.
    const status = clientPage.getByTestId("neutral-status");
    await expect.poll(() => status.getAttribute("data-status"), { timeout: 15_000 }).toMatch(/holding|taken/);
    expect(await clientPage.getByRole("group", { name: "Straight-wrist reading" }).textContent()).toMatch(/Rest your forearm on the table with your wrist straight/);
    await expect.poll(() => status.getAttribute("data-status"), { timeout: 30_000 }).toBe("taken");
    await expect.poll(() => therapistPage.getByTestId("console-neutral").getAttribute("data-status"), { timeout: 15_000 }).toBe("taken");
    expect(await therapistPage.getByTestId("console-neutral").textContent()).toMatch(/Straight-wrist reading taken .*held within \d+\.\d°/);
    // Telemetry after the reading is read against it.
    await expect.poll(() => therapistPage.getByTestId("live-forearm").getAttribute("data-source"), { timeout: 15_000 }).toBe("neutral-reading");
    await expect.poll(() => therapistPage.getByTestId("live-angle").textContent(), { timeout: 15_000 }).toMatch(/^-?\d+°$/);
    // A still hand compared with its own straight-wrist reading: 0 degrees, within the method's few degrees of error.
    const liveDeg = Number((await therapistPage.getByTestId("live-angle").textContent())!.replace("°", ""));
    expect(Math.abs(liveDeg)).toBeLessThan(5);
  });

  it("the kept attempt carries the reading's frames and the server reads the wrist against it", async () => {
    await therapistPage.waitForTimeout(3000);
    await therapistPage.getByRole("button", { name: "Keep this attempt" }).click();
    await expect.poll(() => therapistPage.getByRole("status").filter({ hasText: /Attempt saved/ }).count(), { timeout: 30_000 }).toBeGreaterThan(0);
    const stored = await db((d) => d.select().from(attempts).where(eq(attempts.visitId, visitId)));
    expect(stored).toHaveLength(1);
    expect(stored[0]).toMatchObject({ source: "visit", motion: "wrist.extension", side: "right", forearmSource: "neutral-reading" });
    const [row] = await db((d) => d.select().from(attemptCaptures).where(eq(attemptCaptures.attemptId, stored[0].id)));
    const capture = parseCapture(JSON.parse(gunzipSync(row.gzip).toString("utf8")), stored[0].id);
    // The reading's 3 s hold at the tracker's rate (several frames a second even on a loaded machine).
    expect(capture.neutral?.frames.length ?? 0).toBeGreaterThan(10);
    const analysis = analyzeCapture(capture);
    expect(analysis.forearmSource).toBe("neutral-reading");
    expect(analysis.neutral?.usableFrames ?? 0).toBeGreaterThan(10);
    // The attempt started over when the reading was taken, so it holds only frames after it.
    expect(capture.frames.length).toBeGreaterThan(5);
  });
});
