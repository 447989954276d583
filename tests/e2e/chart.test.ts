import { readFileSync } from "node:fs";
import ICAL from "ical.js";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { zonedToUtc } from "@/lib/visits/time";
import { pdfText } from "../integration/pdf-text";
import { signedInContext, startTestApp, type TestApp } from "./support/app";
import { launchChromium } from "./support/browser";

// The chart, the follow-up queue, the invitation with its calendar file, the in-person result and the PDF summary,
// end to end against the built app. The seeded attempts come from the measurement engine run on synthetic captures.
let app: TestApp;
let browser: Browser;
let therapist: BrowserContext;

async function signedIn(email: string): Promise<BrowserContext> {
  return (await signedInContext(browser, app.appUrl, email, { acceptDownloads: true })).context;
}

const LEFT_EXT = "wrist.extension|left|-";
const cell = (page: Page, key: string) => page.getByTestId(`cell-${key}`);

beforeAll(async () => {
  app = await startTestApp("chart");
  browser = await launchChromium();
  therapist = await signedIn("therapist@kinarc.test");
});

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

describe("strength and range chart to in-person follow-up", () => {
  const dorian = () => app.seed.clientIds!.dorian;
  const isoDay = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);
  // The demo's precaution: no resisted testing for 21 days (db/seed/demo.ts).
  const earliest = isoDay(21);

  it("the therapist sees the flagged motions with why and the precaution's date", async () => {
    const page = therapist.pages()[0];
    await page.goto(`${app.appUrl}/clients/${dorian()}`);
    await page.getByRole("link", { name: "Strength and range chart" }).click();
    await page.waitForURL(`${app.appUrl}/clients/${dorian()}/chart`);
    const needs = page.getByTestId(`needs-${LEFT_EXT}`);
    await needs.waitFor();
    expect(await needs.textContent()).toMatch(/Resisted test/);
    expect(await needs.textContent()).toContain(`Precaution from ${earliest}`);
    expect(await page.getByTestId("needs-wrist.flexion|right|-").textContent()).toMatch(/Position not verified/);
    expect(await page.getByTestId(`grade-${LEFT_EXT}`).textContent()).toBe("3");
    expect(await page.getByTestId("chart-precaution").textContent()).toMatch(/surgeon/);
    // The history chart (recharts draws an SVG) and the attempts table of the selected motion.
    await cell(page, LEFT_EXT).getByRole("button").click();
    await page.getByRole("figure").locator("svg.recharts-surface").first().waitFor();
    await page.getByRole("table", { name: "Attempts" }).getByText("verified").first().waitFor();
    // While the precaution applies, no resisted grade is offered: the caution is shown instead.
    expect(await page.getByTestId("resisted-blocked").textContent()).toMatch(new RegExp(`No resisted testing before ${earliest}`));
  });

  it("schedules an in-person test from the queue; the invitation with its .ics arrives and the client sees it", async () => {
    const page = therapist.pages()[0];
    await page.getByRole("link", { name: "Follow-ups" }).click();
    await page.waitForURL(`${app.appUrl}/follow-ups`);
    const group = page.getByTestId(`queue-${dorian()}`);
    expect(await group.textContent()).toContain(`earliest resisted test ${earliest}`);
    await group.getByRole("button", { name: "Schedule in-person test" }).click();
    const form = page.getByRole("form", { name: "Schedule an in-person test for Dorian Vale" });
    // The form starts at the first date the precaution allows.
    expect(await form.getByLabel(/Date and time/).inputValue()).toBe(`${earliest}T10:00`);
    await form.getByLabel("Place").fill("Saltmarsh clinic, room 3");
    await form.getByRole("button", { name: "Schedule and send the invitation" }).click();
    expect(await form.getByRole("status").textContent()).toMatch(/invitation with a calendar file was e-mailed/);

    const mail = await app.mail.waitFor("client@kinarc.test", /visit/i);
    expect(mail.text).toMatch(/Wrist extension \(left\)/);
    const index = mail.attachments.findIndex((a) => /calendar/.test(a.contentType) || a.filename.endsWith(".ics"));
    expect(index).toBeGreaterThanOrEqual(0);
    // ical.js, a general-purpose RFC 5545 parser from the registry, reads the attachment.
    const ics = (await app.mail.attachment(mail.id, index)).toString("utf8");
    const event = new ICAL.Event(new ICAL.Component(ICAL.parse(ics)).getFirstSubcomponent("vevent")!);
    expect(event.startDate.toJSDate().toISOString()).toBe(zonedToUtc(`${earliest}T10:00`, "Europe/London").toISOString());
    expect(event.location).toBe("Saltmarsh clinic, room 3");

    const client = await signedIn("client@kinarc.test");
    const home = client.pages()[0];
    expect(await home.getByTestId("next-visit").textContent()).toMatch(/Saltmarsh clinic, room 3/);
    // Their own progress in plain words: the signed grade, no staff names.
    const progress = await home.getByTestId("client-progress").textContent();
    expect(progress).toMatch(/Wrist extension, left: best \d+° .*strength grade 3/);
    expect(progress).not.toMatch(/Tomasz|Juniper|awaiting/);
    await client.close();
  });

  it("records a resisted grade of 4 once the surgeon clears it; the flag closes and the PDF carries the grade", async () => {
    const page = therapist.pages()[0];
    // The X-ray review cleared resisted testing: the therapist updates the record's precautions.
    const patch = await therapist.request.patch(`${app.appUrl}/api/v1/clients/${dorian()}`, {
      data: { precautionFlags: [], noResistedUntil: null, precautionNote: "Cleared for resisted testing at the X-ray review." },
    });
    expect(patch.status()).toBe(200);
    await page.goto(`${app.appUrl}/clients/${dorian()}/chart`);
    await cell(page, LEFT_EXT).getByRole("button").click();
    const form = page.getByRole("form", { name: "Record an in-person grade" });
    await form.getByLabel("Test").selectOption("in_person_resisted");
    await form.getByLabel("Grade").selectOption("4");
    await form.getByRole("button", { name: "Record the in-person grade" }).click();
    await page.waitForFunction((key) => document.querySelector(`[data-testid="grade-${key}"]`)?.textContent === "4", LEFT_EXT);
    expect(await page.getByTestId(`needs-${LEFT_EXT}`).count()).toBe(0);
    expect(await cell(page, LEFT_EXT).textContent()).toMatch(/In person, resisted/);

    await page.goto(`${app.appUrl}/clients/${dorian()}/report`);
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Download PDF" }).click()]);
    const bytes = readFileSync((await download.path())!);
    const text = await pdfText(bytes);
    expect(text).toMatch(/Wrist extension\nleft\n[^]*?\n4\nIn person,\nresisted/);
  });
});

describe("chart API access", () => {
  it("a client reads only a simplified view of their own progress; other records 404; the admin reads nothing clinical", async () => {
    const client = await signedIn("client@kinarc.test");
    const own = await client.request.get(`${app.appUrl}/api/v1/clients/${app.seed.clientIds!.dorian}/chart`);
    expect(own.status()).toBe(200);
    const text = await own.text();
    expect(JSON.parse(text).rows.some((r: { key: string }) => r.key === "wrist.extension|left|-")).toBe(true);
    // No staff names, notes, bases or in-person needs in the client's view.
    expect(text).not.toMatch(/Tomasz|Juniper|"note"|"basis"|"needs"/);
    expect((await client.request.get(`${app.appUrl}/api/v1/clients/${app.seed.clientIds!.wren}/chart`)).status()).toBe(404);
    expect((await client.request.get(`${app.appUrl}/api/v1/follow-ups`)).status()).toBe(403);
    expect((await client.request.get(`${app.appUrl}/api/v1/clients/${app.seed.clientIds!.dorian}/report`)).status()).toBe(403);
    await client.close();

    const admin = await signedIn("admin@kinarc.test");
    expect((await admin.request.get(`${app.appUrl}/api/v1/clients/${app.seed.clientIds!.bram}/chart`)).status()).toBe(403);
    expect((await admin.request.post(`${app.appUrl}/api/v1/clients/${app.seed.clientIds!.bram}/in-person`, { data: {} })).status()).toBe(403);
    await admin.close();
  });

  it("bad input gets a 400 naming the field and what was expected, and nothing is written", async () => {
    const bram = app.seed.clientIds!.bram;
    const res = await therapist.request.post(`${app.appUrl}/api/v1/clients/${bram}/passive-ranges`, {
      data: { motion: "wrist.extension", side: "right", digit: "index", valueDeg: 400 },
    });
    expect(res.status()).toBe(400);
    const body = await res.json();
    expect(body.fields.valueDeg).toMatch(/at most 180/);
    const list = await (await therapist.request.get(`${app.appUrl}/api/v1/clients/${bram}/passive-ranges`)).json();
    expect(list.passiveRanges).toEqual([]);
    // An assistant cannot co-sign.
    const assistant = await signedIn("assistant@kinarc.test");
    const anyId = "00000000-0000-4000-8000-000000000000";
    expect((await assistant.request.post(`${app.appUrl}/api/v1/clients/${bram}/grades/${anyId}/cosign`)).status()).toBe(403);
    await assistant.close();
  });
});
