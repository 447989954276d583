import { gunzipSync } from "node:zlib";
import ICAL from "ical.js";
import { eq } from "drizzle-orm";
import { TokenVerifier } from "livekit-server-sdk";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import type { Database } from "@/db";
import { attemptCaptures, attempts, visits } from "@/db/schema";
import { oneFingerFigures } from "@/lib/accuracy/spec";
import { parseCapture } from "@/lib/capture/parse";
import { LOCAL_DEFAULTS } from "@/lib/env";
import { toLocalInput } from "@/lib/visits/time";
import { makeHandClip, STANDARD_CLIPS } from "../../scripts/fixtures/hand-photos";
import { signedInContext, startTestApp, withAppDatabase, type TestApp } from "./support/app";
import { launchChromium } from "./support/browser";

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
  // The client's fake camera shows real hand photos (Debian's gcompris-qt-data), open hand then fist, looping.
  const clip = makeHandClip(STANDARD_CLIPS.openFistCamera as Parameters<typeof makeHandClip>[0]);
  app = await startTestApp("visits");
  therapistBrowser = await launchChromium({ extraArgs: ["--use-fake-device-for-media-stream", "--use-fake-ui-for-media-stream"] });
  clientBrowser = await launchChromium({ fakeCameraClip: clip });
  therapist = await signedIn(therapistBrowser, "therapist@kinarc.test");
  client = await signedIn(clientBrowser, "client@kinarc.test");
}, 240_000);

afterAll(async () => {
  await therapistBrowser?.close();
  await clientBrowser?.close();
  await app?.stop();
});

describe("booking", () => {
  it("the therapist books a video visit; the invitation and its calendar file reach the client", async () => {
    const page = therapist.pages()[0];
    await page.goto(`${app.appUrl}/visits`);
    const form = page.getByRole("form", { name: "Book a visit" });
    await form.getByLabel("Client").selectOption({ label: "Vale, Dorian" });
    const startsAt = toLocalInput(new Date(Date.now() + 5 * 60_000), "Europe/London");
    await form.getByLabel(/Starts/).fill(startsAt);
    await form.getByLabel("What it is for").fill("Wrist and finger range after the plate");
    await form.getByRole("button", { name: "Book visit" }).click();
    expect(await form.getByRole("status").textContent()).toMatch(/invitation is on its way/);
    const mail = await app.mail.waitFor("client@kinarc.test", /Your hand therapy visit/);
    const index = mail.attachments.findIndex((a) => a.contentType.startsWith("text/calendar"));
    expect(index).toBeGreaterThanOrEqual(0);
    // Parsed with ical.js, a general-purpose RFC 5545 parser.
    const vevent = new ICAL.Component(ICAL.parse((await app.mail.attachment(mail.id, index)).toString("utf8"))).getFirstSubcomponent("vevent")!;
    const event = new ICAL.Event(vevent);
    visitId = event.uid.replace("@kinarc", "");
    expect(Math.abs(event.startDate.toJSDate().getTime() - (Date.now() + 5 * 60_000))).toBeLessThan(2 * 60_000);
    expect(mail.text).toContain(`/visits/${visitId}`);
  });

  it("the client sees the visit on their home", async () => {
    const page = client.pages()[0];
    await page.goto(`${app.appUrl}/home`);
    expect(await page.getByTestId("next-visit").textContent()).toMatch(/Video visit with Tomasz Reyes/);
  });
});

describe("the token route", () => {
  it("refuses a caller without a session, a visit the caller is not part of, and an ended visit; grants the visit's own room", async () => {
    const anon = await therapistBrowser.newContext();
    expect((await anon.request.post(`${app.appUrl}/api/v1/visits/${visitId}/token`)).status()).toBe(401);
    await anon.close();

    const other = await signedIn(therapistBrowser, "assistant@kinarc.test");
    expect((await other.request.post(`${app.appUrl}/api/v1/visits/${visitId}/token`)).status()).toBe(403);
    await other.close();

    // Before consent the client is refused with a message saying why.
    const early = await client.request.post(`${app.appUrl}/api/v1/visits/${visitId}/token`);
    expect(early.status()).toBe(403);
    expect((await early.json()).error).toMatch(/consent/);

    const granted = await therapist.request.post(`${app.appUrl}/api/v1/visits/${visitId}/token`);
    expect(granted.status()).toBe(200);
    const body = await granted.json();
    const claims = await new TokenVerifier(LOCAL_DEFAULTS.DEV_LIVEKIT_KEY, LOCAL_DEFAULTS.DEV_LIVEKIT_SECRET).verify(body.token);
    expect(claims.video?.room).toBe(`visit-${visitId}`);
    expect(body.room).toBe(`visit-${visitId}`);

    const ended = await db(async (d) => {
      const [v] = await d.select().from(visits).where(eq(visits.id, visitId));
      const [row] = await d
        .insert(visits)
        .values({ ...v, id: crypto.randomUUID(), status: "finished", startsAt: new Date(), createdAt: new Date(), updatedAt: new Date() })
        .returning();
      return row.id;
    });
    const refused = await therapist.request.post(`${app.appUrl}/api/v1/visits/${ended}/token`);
    expect(refused.status()).toBe(403);
    expect((await refused.json()).error).toMatch(/ended/);
  });
});

describe("a video visit through the local media server", () => {
  let therapistPage: Page;
  let clientPage: Page;

  it("the client agrees to the telehealth consent and joins with their camera tracked", async () => {
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
  });

  it("the therapist joins and sees the client's video advancing", async () => {
    therapistPage = therapist.pages()[0];
    await therapistPage.goto(`${app.appUrl}/visits/${visitId}`);
    await therapistPage.getByRole("button", { name: "Join the visit" }).click();
    const video = therapistPage.getByRole("region", { name: "Live reading" });
    await video.waitFor({ timeout: 30_000 });
    const stage = therapistPage.getByTestId("client-stage").locator("video").first();
    await expect.poll(() => stage.evaluate((v: HTMLVideoElement) => v.currentTime), { timeout: 30_000 }).toBeGreaterThan(0.5);
    const t1 = await stage.evaluate((v: HTMLVideoElement) => v.currentTime);
    await therapistPage.waitForTimeout(1000);
    expect(await stage.evaluate((v: HTMLVideoElement) => v.currentTime)).toBeGreaterThan(t1 + 0.5);
  });

  it("a prompt reaches the client and telemetry comes back", async () => {
    const picker = therapistPage.getByRole("form", { name: "Next test" });
    await picker.getByLabel("Motion").selectOption({ label: "PIP flexion" });
    await picker.getByLabel("Side").selectOption("right");
    await picker.getByLabel("Digit").selectOption("middle");
    await picker.getByLabel("Condition").selectOption("gravity_minimized");
    await picker.getByRole("button", { name: "Ask the client to do this" }).click();
    await expect.poll(() => clientPage.getByTestId("client-test").textContent(), { timeout: 15_000 }).toMatch(/PIP flexion, middle finger \(right\)/);
    await expect.poll(() => therapistPage.getByTestId("current-test").textContent(), { timeout: 15_000 }).toMatch(/PIP flexion, middle, right/);
    await expect.poll(() => therapistPage.getByTestId("live-angle").textContent(), { timeout: 30_000 }).toMatch(/^-?\d+°$/);
  });

  it("a kept attempt lands in the database with server-computed values and a grade is proposed from it", async () => {
    // Record a few seconds of the open-fist loop (the frame rate depends on the machine's load).
    await therapistPage.waitForTimeout(5000);
    await therapistPage.getByRole("button", { name: "Keep this attempt" }).click();
    await expect.poll(() => therapistPage.getByRole("status").filter({ hasText: /Attempt saved|offline/ }).count(), { timeout: 30_000 }).toBeGreaterThan(0);
    const stored = await db((d) => d.select().from(attempts).where(eq(attempts.visitId, visitId)));
    expect(stored).toHaveLength(1);
    expect(stored[0]).toMatchObject({ source: "visit", motion: "pip.flexion", side: "right", digit: "middle", condition: "gravity_minimized" });
    // The numbers are the server's own analysis of the raw capture it received and kept.
    expect(stored[0].frames).toBeGreaterThanOrEqual(5);
    expect(stored[0].usableFrames).toBeLessThanOrEqual(stored[0].frames);
    expect(["against_gravity", "gravity_assisted", "gravity_minimized", "unclear"]).toContain(stored[0].planeVerdict);
    const [capture] = await db((d) => d.select().from(attemptCaptures).where(eq(attemptCaptures.attemptId, stored[0].id)));
    expect(capture.bytes).toBeGreaterThan(0);
    expect(stored[0].engineVersion).toMatch(/kinarc-engine/);
    await expect.poll(() => therapistPage.getByTestId("proposals").textContent(), { timeout: 15_000 }).toMatch(/PIP flexion, middle \(right\)/);
    // The kept attempt as the server measured it, beside the live reading.
    const kept = therapistPage.getByTestId("kept-attempts");
    await expect.poll(() => kept.textContent(), { timeout: 15_000 }).toMatch(/PIP flexion, middle \(right\), gravity minimized:/);
    const shown = (await kept.getByTestId("kept-value").first().textContent())!;
    expect(shown).toContain(`${stored[0].reps} repetition`);
    if (stored[0].peakDeg !== null) expect(shown).toContain(`peak ${Math.round(stored[0].peakDeg)}°`);
  });

  it("an attempt kept while the client's uploads fail is held in their browser and saved exactly once when back", async () => {
    await clientPage.route("**/api/v1/captures", (route) => route.abort("internetdisconnected"));
    await therapistPage.waitForTimeout(2000);
    const pairedBefore = await clientPage.getByTestId("client-camera").getAttribute("data-paired");
    await therapistPage.getByRole("button", { name: "Keep this attempt" }).click();
    await expect.poll(() => therapistPage.getByRole("status").filter({ hasText: /offline/ }).count(), { timeout: 30_000 }).toBeGreaterThan(0);
    expect(await clientPage.getByRole("status").filter({ hasText: /saved on this device/ }).count()).toBe(1);
    expect(await db((d) => d.select().from(attempts).where(eq(attempts.visitId, visitId)))).toHaveLength(1);
    await clientPage.unroute("**/api/v1/captures");
    await clientPage.evaluate(() => window.dispatchEvent(new Event("online")));
    await expect.poll(async () => (await db((d) => d.select().from(attempts).where(eq(attempts.visitId, visitId)))).length, { timeout: 30_000 }).toBe(2);
    // A further retry of the same capture (as after a reload) must not store it twice.
    await clientPage.evaluate(() => window.dispatchEvent(new Event("online")));
    await clientPage.waitForTimeout(1500);
    expect(await db((d) => d.select().from(attempts).where(eq(attempts.visitId, visitId)))).toHaveLength(2);
    // Finger flexion is read by both hand models in the client's tracking worker; this attempt was recorded after
    // the first was kept, with the second model already reading, so its capture carries both models' frames.
    // (Where this machine is too slow for both, fewer than 8 frames a second, the client's page stops pairing:
    // lib/tracking/pairing.ts.)
    const camera = clientPage.getByTestId("client-camera");
    const [thread, pairedAfter, stopped] = [await camera.getAttribute("data-thread"), await camera.getAttribute("data-paired"), await camera.getAttribute("data-pairing-stopped")];
    const [, second] = await db((d) => d.select().from(attempts).where(eq(attempts.visitId, visitId)).orderBy(attempts.createdAt));
    const [row] = await db((d) => d.select().from(attemptCaptures).where(eq(attemptCaptures.attemptId, second.id)));
    const capture = parseCapture(JSON.parse(gunzipSync(row.gzip).toString("utf8")), second.id);
    console.log(`visit: tracking in the ${thread} thread, both models ${pairedBefore}/${pairedAfter} (stopped: ${stopped}); kept attempt of ${capture.frames.length} frames, both models' frames ${capture.fullModel ? "kept" : "not kept"}`);
    if (thread === "worker" && pairedBefore === "yes" && pairedAfter === "yes") {
      expect(capture.fullModel?.frames.map((f) => f.t)).toEqual(capture.frames.map((f) => f.t));
      expect(capture.fullModel!.frames.some((f) => f.hand)).toBe(true);
    }
    if (thread !== "worker") expect(capture.fullModel).toBeUndefined();
  });

  it("a straight-wrist reading asked for while the hand keeps changing is refused, and the reason reaches the console", async () => {
    const picker = therapistPage.getByRole("form", { name: "Next test" });
    await picker.getByLabel("Motion").selectOption("wrist.extension");
    await picker.getByLabel("Condition").selectOption("against_gravity");
    await picker.getByRole("button", { name: "Ask the client to do this" }).click();
    await expect.poll(() => clientPage.getByTestId("client-test").textContent(), { timeout: 15_000 }).toMatch(/Wrist extension \(right\)/);
    await therapistPage.getByRole("button", { name: "Ask for the straight-wrist reading" }).click();
    // The camera alternates an open hand and a fist every second: not a still, straight wrist.
    await expect.poll(() => therapistPage.getByTestId("console-neutral").getAttribute("data-status"), { timeout: 30_000 }).toBe("refused");
    const reason = (await clientPage.getByTestId("neutral-status").textContent())!.replace(/^The reading could not be taken: /, "");
    expect(reason.length).toBeGreaterThan(10);
    expect(await therapistPage.getByTestId("console-neutral").textContent()).toContain(reason);
    // Without a reading the wrist is read from how the hand started, and the console says so.
    await expect.poll(() => therapistPage.getByTestId("live-forearm").getAttribute("data-source"), { timeout: 15_000 }).toBe("capture-start");
    expect(await therapistPage.getByRole("button", { name: "Take the straight-wrist reading again" }).isEnabled()).toBe(true);
  });

  it("one finger asked for on its own reaches the client's words, and its kept attempt carries the single-finger error", async () => {
    const picker = therapistPage.getByRole("form", { name: "Next test" });
    await picker.getByLabel("Motion").selectOption({ label: "PIP flexion" });
    await picker.getByLabel("Digit").selectOption("ring");
    await picker.getByLabel("Condition").selectOption("against_gravity");
    await picker.getByLabel("Other fingers held straight").check();
    // The box says what a lone ring finger reads within, as the engine would state it (lib/accuracy/spec.ts).
    const lone = oneFingerFigures("pip.flexion", "against_gravity", "ring")!;
    const hint = await picker.getByTestId("one-finger-hint").textContent();
    expect(hint).toContain(`the ring finger alone reads within ± ${lone.aloneDeg}° (± ${lone.togetherDeg}° bending with the others)`);
    // Hidden behind the little finger, a lone ring finger reads too widely to decide a grade (held-out seed 20261232).
    expect(lone.aloneDeg).toBeGreaterThan(45);
    expect(hint).toContain("too wide to decide a range-based grade");
    await picker.getByRole("button", { name: "Ask the client to do this" }).click();
    await expect.poll(() => clientPage.getByTestId("client-test").textContent(), { timeout: 15_000 }).toMatch(/PIP flexion, ring finger on its own \(right\)/);
    expect(await clientPage.getByText("Bend only your ring finger. Keep the other fingers straight").count()).toBe(1);
    await expect.poll(() => therapistPage.getByTestId("current-test").textContent(), { timeout: 15_000 }).toMatch(/PIP flexion, ring \(on its own\), right/);
    expect(await therapistPage.getByTestId("live-one-finger").count()).toBe(1);
    const before = (await db((d) => d.select().from(attempts).where(eq(attempts.visitId, visitId)))).length;
    await therapistPage.waitForTimeout(3000);
    await therapistPage.getByRole("button", { name: "Keep this attempt" }).click();
    await expect.poll(async () => (await db((d) => d.select().from(attempts).where(eq(attempts.visitId, visitId)))).length, { timeout: 30_000 }).toBe(before + 1);
    const stored = (await db((d) => d.select().from(attempts).where(eq(attempts.visitId, visitId)))).find((a) => a.digit === "ring")!;
    expect(stored.oneFinger).toBe(true);
    expect(stored.warnings.some((w) => w.startsWith("one finger tested on its own"))).toBe(true);
    // The single-finger cells of the table (report.md's single-finger rows) are all wider than 40 degrees.
    expect(stored.uncertaintyDeg).toBeGreaterThan(40);
    // The box is only offered where it applies.
    await picker.getByLabel("Motion").selectOption("wrist.extension");
    expect(await picker.getByLabel("Other fingers held straight").count()).toBe(0);
  });

  it("ending the visit saves its notes and a summary of the kept attempts", async () => {
    const stored = await db((d) => d.select().from(attempts).where(eq(attempts.visitId, visitId)));
    await therapistPage.getByLabel("Visit notes").fill("Good effort; fist closes well.");
    await therapistPage.getByRole("button", { name: "End visit and save summary" }).click();
    await therapistPage.getByRole("button", { name: "Visit ended" }).waitFor({ timeout: 15_000 });
    const [row] = await db((d) => d.select().from(visits).where(eq(visits.id, visitId)));
    expect(row.status).toBe("finished");
    expect(row.notes).toBe("Good effort; fist closes well.");
    const summary = row.summary as { attempts: { id: string }[] };
    expect(summary.attempts.map((a) => a.id).sort()).toEqual(stored.map((a) => a.id).sort());
  });
});
