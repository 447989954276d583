import { createHash, randomUUID } from "node:crypto";
import { readdirSync } from "node:fs";
import http from "node:http";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { strFromU8, unzipSync } from "fflate";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext } from "playwright-core";
import { openDatabase } from "@/db";
import { auditEvents, uploads } from "@/db/schema";
import { startLocalStack } from "../../scripts/lib/local-stack";
import { pdfBytes, webmBytes } from "../integration/upload-fixtures";
import { signedInContext, startTestApp, TEST_PORTS, type TestApp } from "./support/app";
import { launchChromium } from "./support/browser";

const AUTH_SECRET = "e2e-test-secret-that-is-long-enough-0123456789";
let app: TestApp;
let stack: { appUrl: string; stop: () => Promise<void> };
let browser: Browser;
let dorian: BrowserContext;

async function signedIn(email: string): Promise<BrowserContext> {
  return (await signedInContext(browser, app.appUrl, email, { acceptDownloads: true })).context;
}

async function uploadRows(uploadUid?: string) {
  const { db, client } = openDatabase(app.databaseUrl);
  try {
    const rows = await db.select().from(uploads);
    return uploadUid ? rows.filter((r) => r.uploadUid === uploadUid) : rows;
  } finally {
    client.close();
  }
}

const uploadsDir = () => app.databaseUrl.slice("file:".length).replace(/\.db$/, "") + "-uploads";

function multipart(fields: Record<string, string>, file: { name: string; type: string; bytes: Uint8Array }) {
  const boundary = `----kinarc${randomUUID()}`;
  const parts: Buffer[] = [];
  for (const [k, v] of Object.entries(fields)) parts.push(Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`));
  parts.push(Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${file.name}"\r\nContent-Type: ${file.type}\r\n\r\n`));
  parts.push(Buffer.from(file.bytes), Buffer.from(`\r\n--${boundary}--\r\n`));
  return { body: Buffer.concat(parts), contentType: `multipart/form-data; boundary=${boundary}` };
}

beforeAll(async () => {
  app = await startTestApp("uploads");
  stack = app;
  // Chromium's built-in fake camera (a moving test pattern) stands in for the client's webcam.
  browser = await launchChromium({ extraArgs: ["--use-fake-device-for-media-stream", "--use-fake-ui-for-media-stream"] });
  dorian = await signedIn("client@kinarc.test");
});

afterAll(async () => {
  await browser?.close();
  await stack?.stop();
});

describe("a client sends a clip and the therapist reviews it", () => {
  const clip = webmBytes(200_000);

  it("refuses a PDF renamed to .webm with a clear message, storing nothing", async () => {
    const page = dorian.pages()[0];
    await page.goto(`${app.appUrl}/uploads`);
    const form = page.getByRole("form", { name: "Send a file" });
    await form.getByLabel("Or choose a clip from this device").setInputFiles({ name: "my-wrist.webm", mimeType: "video/webm", buffer: Buffer.from(await pdfBytes()) });
    await form.getByRole("button", { name: "Send", exact: true }).click();
    await expect(page.getByTestId("upload-error").textContent()).resolves.toBe(
      '"my-wrist.webm" was refused: its content is a PDF document, whatever its name says. Expected a WebM or MP4 video.',
    );
    expect(await uploadRows()).toHaveLength(0);
  });

  it("stores a WebM clip with its SHA-256 and lists it for the client", async () => {
    const page = dorian.pages()[0];
    const form = page.getByRole("form", { name: "Send a file" });
    await form.getByLabel("Movement shown").selectOption("wrist.flexion");
    await form.getByLabel("Side").selectOption("right");
    await form.getByLabel("Or choose a clip from this device").setInputFiles({ name: "flexion.webm", mimeType: "video/webm", buffer: Buffer.from(clip) });
    await form.getByLabel("Note for your therapist (optional)").fill("Morning, a little stiff");
    await form.getByRole("button", { name: "Send", exact: true }).click();
    await form.getByText(/^Sent\./).waitFor();
    await page.getByTestId("upload-row").first().waitFor();
    const [row] = await uploadRows();
    expect(row.mediaType).toBe("video/webm");
    expect(row.sha256).toBe(createHash("sha256").update(clip).digest("hex"));
    expect(row.motion).toBe("wrist.flexion");
  });

  it("records a clip with the camera in the browser, keeps it across a reload and sends it as a real WebM", async () => {
    const page = dorian.pages()[0];
    await page.goto(`${app.appUrl}/uploads`);
    const form = page.getByRole("form", { name: "Send a file" });
    await form.getByLabel("Movement shown").selectOption("wrist.extension");
    await form.getByRole("button", { name: "Open camera" }).click();
    await form.getByRole("button", { name: "Start recording" }).click();
    await page.waitForTimeout(2500);
    await form.getByRole("button", { name: /Stop recording/ }).click();
    await form.getByText("Clip recorded; it is sent when you press Send.").waitFor();
    await page.getByTestId("clip-kept").waitFor();
    const before = (await uploadRows()).length;
    // The tab is reloaded before Send: the clip was kept on the device and is offered again.
    await page.reload();
    const kept = page.getByTestId("pending-clip");
    await expect(kept.textContent()).resolves.toMatch(/has not reached your clinic yet/);
    await kept.getByRole("button", { name: "Send it now" }).click();
    await page.getByText(/^Sent\./).waitFor();
    expect(await page.getByTestId("pending-clip").count()).toBe(0);
    const rows = await uploadRows();
    expect(rows).toHaveLength(before + 1);
    const recorded = rows.find((r) => r.motion === "wrist.extension")!;
    expect(recorded.mediaType).toBe("video/webm");
    expect(recorded.bytes).toBeGreaterThan(5000);
  });

  it("the therapist sees it, downloads the same bytes and marks it reviewed; strangers cannot download it", async () => {
    const therapist = await signedIn("therapist@kinarc.test");
    const page = therapist.pages()[0];
    await page.goto(`${app.appUrl}/uploads`);
    const row = page.getByTestId("upload-row").filter({ hasText: "Morning, a little stiff" });
    await expect(row.textContent()).resolves.toMatch(/Clip: .*right.*Morning, a little stiff/s);
    const stored = (await uploadRows()).find((r) => r.motion === "wrist.flexion")!;
    const download = await therapist.request.get(`${app.appUrl}/api/v1/uploads/${stored.id}/file`);
    expect(download.status()).toBe(200);
    expect(download.headers()["content-type"]).toBe("video/webm");
    expect(createHash("sha256").update(await download.body()).digest("hex")).toBe(stored.sha256);
    await row.getByRole("button", { name: "Mark reviewed" }).click();
    await row.getByText("Reviewed", { exact: true }).waitFor();
    expect(await row.getByRole("button", { name: "Mark reviewed" }).count()).toBe(0);
    const anonymous = await (await browser.newContext()).request.get(`${app.appUrl}/api/v1/uploads/${stored.id}/file`);
    expect(anonymous.status()).toBe(401);
    const admin = await signedIn("admin@kinarc.test");
    expect((await admin.request.get(`${app.appUrl}/api/v1/uploads/${stored.id}/file`)).status()).toBe(403);
    await admin.close();
    await therapist.close();
  });
});

describe("per-client export", () => {
  it("the admin's export of the client holds every uploaded file, byte-identical by SHA-256, and is audited", async () => {
    const admin = await signedIn("admin@kinarc.test");
    const res = await admin.request.get(`${app.appUrl}/api/v1/clients/${app.seed.clientIds!.dorian}/export`);
    expect(res.status()).toBe(200);
    expect(res.headers()["content-type"]).toBe("application/zip");
    const files = unzipSync(new Uint8Array(await res.body()));
    const listed = JSON.parse(strFromU8(files["kinarc-export/data/uploads.json"])) as { id: string; extension: string; sha256: string }[];
    expect(listed.map((u) => u.id).sort()).toEqual((await uploadRows()).map((u) => u.id).sort());
    for (const u of listed) expect(createHash("sha256").update(files[`kinarc-export/files/${u.id}.${u.extension}`]).digest("hex")).toBe(u.sha256);
    const { db, client } = openDatabase(app.databaseUrl);
    const audited = await db.select().from(auditEvents).where(and(eq(auditEvents.action, "client.export"), eq(auditEvents.clientId, app.seed.clientIds!.dorian)));
    client.close();
    expect(audited).toHaveLength(1);
    const clientRes = await dorian.request.get(`${app.appUrl}/api/v1/clients/${app.seed.clientIds!.dorian}/export`);
    expect(clientRes.status()).toBe(403);
    await admin.close();
  });
});

describe("fault: the server stops in the middle of an upload", () => {
  it("loses nothing the client can send again and stores the retried upload once", async () => {
    const cookies = (await dorian.cookies()).map((c) => `${c.name}=${c.value}`).join("; ");
    const uploadUid = randomUUID();
    const bytes = webmBytes(6 * 1024 * 1024);
    const { body, contentType } = multipart({ clientId: app.seed.clientIds!.dorian, uploadUid, kind: "clip", motion: "wrist.extension", side: "right" }, { name: "ext.webm", type: "video/webm", bytes });
    const url = new URL(`${app.appUrl}/api/v1/uploads`);
    // Half the body goes out, then the whole stack stops underneath the request.
    let stopping: Promise<void> = Promise.resolve();
    const cut = new Promise<string>((resolve) => {
      const req = http.request({ hostname: url.hostname, port: url.port, path: url.pathname, method: "POST", headers: { cookie: cookies, "content-type": contentType, "content-length": body.length } });
      req.on("response", (res) => resolve(`answered ${res.statusCode}`));
      req.on("error", (e) => resolve(`dropped: ${e.message}`));
      req.write(body.subarray(0, body.length / 2), () => {
        stopping = stack.stop();
        // If the server waits for open requests before it exits, the client gives up as a dropped phone line would.
        setTimeout(() => req.destroy(new Error("client gave up")), 2000);
      });
    });
    expect(await cut).toMatch(/dropped|answered 400/);
    await stopping;
    expect(await uploadRows(uploadUid)).toHaveLength(0);

    stack = await startLocalStack({ ...TEST_PORTS, databaseUrl: app.databaseUrl, authSecret: AUTH_SECRET });
    const send = () => fetch(`${app.appUrl}/api/v1/uploads`, { method: "POST", headers: { cookie: cookies, "content-type": contentType }, body });
    const first = await send();
    expect(first.status).toBe(201);
    const again = await send();
    expect(again.status).toBe(200);
    expect((await again.json()).id).toBe((await first.json()).id);
    expect(await uploadRows(uploadUid)).toHaveLength(1);
    const files = readdirSync(path.join(uploadsDir(), app.seed.clinicId!, app.seed.clientIds!.dorian)).filter((f) => f.startsWith(uploadUid));
    expect(files).toEqual([`${uploadUid}.webm`]);
  });
});
