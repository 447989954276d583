import { count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { APIRequestContext, Browser, BrowserContext } from "playwright-core";
import { openDatabase } from "@/db";
import { clients, clinics } from "@/db/schema";
import { DEMO_PASSWORD } from "@/db/seed/demo";
import { signInWithPassword, startTestApp, type TestApp } from "./support/app";
import { launchChromium } from "./support/browser";

let app: TestApp;
let browser: Browser;
let therapist: BrowserContext;
let strangerClientId: string;

async function clientCount(): Promise<number> {
  const { db, client } = openDatabase(app.databaseUrl);
  try {
    return (await db.select({ n: count() }).from(clients))[0].n;
  } finally {
    client.close();
  }
}

beforeAll(async () => {
  app = await startTestApp("clients-api");
  browser = await launchChromium();
  // A second clinic with one client: nobody at the demo clinic may see it.
  const { db, client } = openDatabase(app.databaseUrl);
  const [other] = await db.insert(clinics).values({ name: "Northgate Hand Clinic" }).returning();
  const [row] = await db
    .insert(clients)
    .values({ clinicId: other.id, givenName: "Sable", familyName: "Okonjo", dateOfBirth: "1990-01-01", dominantHand: "right", affectedSide: "right" })
    .returning();
  strangerClientId = row.id;
  client.close();
  therapist = await browser.newContext();
  const page = await therapist.newPage();
  await signInWithPassword(page, app.appUrl, "therapist@kinarc.test", DEMO_PASSWORD);
  await page.waitForURL(`${app.appUrl}/home`);
});

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

const valid = { givenName: "Marit", familyName: "Holloway", dateOfBirth: "1971-08-20", dominantHand: "right", affectedSide: "left" };

describe("/api/v1/clients without a session", () => {
  it("refuses every method with 401", async () => {
    const anon: APIRequestContext = (await browser.newContext()).request;
    const id = app.seed.clientIds!.dorian;
    const answers = await Promise.all([
      anon.get(`${app.appUrl}/api/v1/clients`),
      anon.post(`${app.appUrl}/api/v1/clients`, { data: valid }),
      anon.get(`${app.appUrl}/api/v1/clients/${id}`),
      anon.patch(`${app.appUrl}/api/v1/clients/${id}`, { data: { diagnosisNote: "x" } }),
    ]);
    for (const res of answers) {
      expect(res.status()).toBe(401);
      expect((await res.json()).error).toMatch(/Sign in/);
    }
  });
});

describe("/api/v1/clients as a therapist", () => {
  it("lists the clinic's clients with paging, and rejects bad query parameters by name", async () => {
    const res = await therapist.request.get(`${app.appUrl}/api/v1/clients?pageSize=3&sort=name&dir=desc`);
    expect(res.status()).toBe(200);
    const body = await res.json();
    expect(body.total).toBe(10);
    expect(body.rows).toHaveLength(3);
    expect(body.rows[0].familyName).toBe("Vale");
    expect(body.rows.map((r: { id: string }) => r.id)).not.toContain(strangerClientId);
    const bad = await therapist.request.get(`${app.appUrl}/api/v1/clients?pageSize=500&sort=shoe`);
    expect(bad.status()).toBe(400);
    const fields = (await bad.json()).fields;
    expect(fields.pageSize).toMatch(/at most 100/);
    expect(fields.sort).toMatch(/expected name/);
  });

  it("creates a client (201) and reads it back", async () => {
    const res = await therapist.request.post(`${app.appUrl}/api/v1/clients`, { data: valid });
    expect(res.status()).toBe(201);
    const created = await res.json();
    const read = await therapist.request.get(`${app.appUrl}/api/v1/clients/${created.id}`);
    expect(await read.json()).toMatchObject({ ...valid, precautionFlags: [], id: created.id });
  });

  it("answers 400 naming every bad field, and writes nothing", async () => {
    const before = await clientCount();
    const res = await therapist.request.post(`${app.appUrl}/api/v1/clients`, {
      data: { ...valid, givenName: "", dateOfBirth: "20/08/1971", affectedSide: "middle", precautionFlags: ["tired"] },
    });
    expect(res.status()).toBe(400);
    const { fields, error } = await res.json();
    expect(Object.keys(fields).sort()).toEqual(["affectedSide", "dateOfBirth", "givenName", "precautionFlags.0"]);
    expect(error).toMatch(/dateOfBirth: expected a date as YYYY-MM-DD/);
    const notJson = await therapist.request.post(`${app.appUrl}/api/v1/clients`, { data: Buffer.from("{not json"), headers: { "content-type": "application/json" } });
    expect(notJson.status()).toBe(400);
    expect((await notJson.json()).error).toMatch(/must be JSON/);
    const badTherapist = await therapist.request.post(`${app.appUrl}/api/v1/clients`, { data: { ...valid, primaryTherapistId: crypto.randomUUID() } });
    expect(badTherapist.status()).toBe(400);
    expect((await badTherapist.json()).fields.primaryTherapistId).toMatch(/active therapist/);
    expect(await clientCount()).toBe(before);
  });

  it("patches only the named fields and rejects unknown ones", async () => {
    const id = app.seed.clientIds!.kofi;
    const res = await therapist.request.patch(`${app.appUrl}/api/v1/clients/${id}`, { data: { diagnosisNote: "Nerve conduction study booked." } });
    expect(res.status()).toBe(200);
    const body = await res.json();
    expect(body.diagnosisNote).toBe("Nerve conduction study booked.");
    expect(body.familyName).toBe("Lindqvist");
    const unknown = await therapist.request.patch(`${app.appUrl}/api/v1/clients/${id}`, { data: { clinicId: "elsewhere" } });
    expect(unknown.status()).toBe(400);
  });

  it("treats another clinic's client as not there (404) for read and write", async () => {
    expect((await therapist.request.get(`${app.appUrl}/api/v1/clients/${strangerClientId}`)).status()).toBe(404);
    const patch = await therapist.request.patch(`${app.appUrl}/api/v1/clients/${strangerClientId}`, { data: { diagnosisNote: "x" } });
    expect(patch.status()).toBe(404);
    expect((await therapist.request.get(`${app.appUrl}/api/v1/clients/not-an-id`)).status()).toBe(404);
    const { db, client } = openDatabase(app.databaseUrl);
    const [row] = await db.select().from(clients).where(eq(clients.id, strangerClientId));
    client.close();
    expect(row.diagnosisNote).toBe("");
  });
});

describe("/api/v1/clients as other roles", () => {
  it("an admin may list and read but not create or change", async () => {
    const admin = await browser.newContext();
    const page = await admin.newPage();
    await signInWithPassword(page, app.appUrl, "admin@kinarc.test", DEMO_PASSWORD);
    await page.waitForURL(`${app.appUrl}/home`);
    expect((await admin.request.get(`${app.appUrl}/api/v1/clients`)).status()).toBe(200);
    expect((await admin.request.post(`${app.appUrl}/api/v1/clients`, { data: valid })).status()).toBe(403);
    await admin.close();
  });

  it("an assistant may create a client", async () => {
    const assistant = await browser.newContext();
    const page = await assistant.newPage();
    await signInWithPassword(page, app.appUrl, "assistant@kinarc.test", DEMO_PASSWORD);
    await page.waitForURL(`${app.appUrl}/home`);
    const res = await assistant.request.post(`${app.appUrl}/api/v1/clients`, { data: { ...valid, givenName: "Pell" } });
    expect(res.status()).toBe(201);
    await assistant.close();
  });
});
