import { createHmac } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext } from "playwright-core";
import { openDatabase } from "@/db";
import { payments, users, visits } from "@/db/schema";
import { LOCAL_DEFAULTS } from "@/lib/env";
import { signedInContext, startTestApp, type TestApp } from "./support/app";
import { launchChromium } from "./support/browser";

let app: TestApp;
let browser: Browser;
let visitId: string;

async function signedIn(email: string): Promise<BrowserContext> {
  return (await signedInContext(browser, app.appUrl, email)).context;
}

async function paymentRows() {
  const { db, client } = openDatabase(app.databaseUrl);
  try {
    return await db.select().from(payments).where(eq(payments.visitId, visitId));
  } finally {
    client.close();
  }
}

/** The documented signing scheme ("t=…,v1=" HMAC-SHA256 of "t.body"), made here without the SDK. */
function sign(payload: string, secret: string): string {
  const t = Math.floor(Date.now() / 1000);
  return `t=${t},v1=${createHmac("sha256", secret).update(`${t}.${payload}`).digest("hex")}`;
}

beforeAll(async () => {
  app = await startTestApp("payments");
  browser = await launchChromium();
  const { db, client } = openDatabase(app.databaseUrl);
  const [therapist] = await db.select().from(users).where(eq(users.email, "therapist@kinarc.test"));
  const [v] = await db
    .insert(visits)
    .values({ clinicId: app.seed.clinicId!, clientId: app.seed.clientIds!.dorian, therapistId: therapist.id, kind: "video", startsAt: new Date(Date.now() + 3 * 86_400_000), reason: "Wrist range review" })
    .returning();
  visitId = v.id;
  client.close();
});

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

describe("self-pay visit, paid through the local stand-in", () => {
  it("the admin sets the price of a video visit", async () => {
    const admin = await signedIn("admin@kinarc.test");
    const page = admin.pages()[0];
    await page.goto(`${app.appUrl}/admin-billing`);
    const form = page.getByRole("form", { name: "Price of Video visit" });
    await form.getByLabel("Amount").fill("sixty");
    await form.getByRole("button", { name: "Save" }).click();
    await expect(form.getByRole("alert").first().textContent()).resolves.toMatch(/expected an amount such as 65 or 65.50/);
    await form.getByLabel("Amount").fill("65.50");
    await form.getByLabel("Currency").selectOption("gbp");
    await form.getByRole("button", { name: "Save" }).click();
    await form.getByRole("status").waitFor();
    await admin.close();
  });

  it("the client pays on the stand-in's page and the visit shows paid after the signed webhook; a receipt is e-mailed", async () => {
    const dorian = await signedIn("client@kinarc.test");
    const page = dorian.pages()[0];
    await page.goto(`${app.appUrl}/pay`);
    const row = page.locator(`[data-testid=pay-row][data-visit-id="${visitId}"]`);
    await expect(row.getByTestId("payment-state").getAttribute("data-state")).resolves.toBe("unpaid");
    await expect(row.textContent()).resolves.toContain("£65.50");
    await row.getByRole("button", { name: "Pay now" }).click();
    await page.waitForURL(`${app.paymentUrl}/c/pay/**`);
    await expect(page.getByRole("note").textContent()).resolves.toMatch(/Development stand-in/);
    await expect(page.getByTestId("amount").textContent()).resolves.toBe("£65.50");
    expect((await paymentRows())[0].status).toBe("pending");
    await page.getByRole("button", { name: "Confirm test payment" }).click();
    await page.waitForURL(`${app.appUrl}/pay?visit=${visitId}&returned=1`);
    await page.locator(`[data-testid=pay-row][data-visit-id="${visitId}"] [data-testid=payment-state][data-state=paid]`).waitFor({ timeout: 20_000 });
    const [paid] = await paymentRows();
    expect(paid.status).toBe("paid");
    expect(paid.amountMinor).toBe(6550);
    const receipt = await app.mail.waitFor("client@kinarc.test", /receipt/i);
    expect(receipt.text).toContain("Amount: £65.50.");
    expect(receipt.text).toContain(`Reference: ${paid.paymentIntentId}`);
    await dorian.close();
  });

  it("refuses forged webhooks with 400 and changes nothing", async () => {
    const [before] = await paymentRows();
    const forged = JSON.stringify({
      id: "evt_forged_e2e",
      object: "event",
      type: "charge.refunded",
      data: { object: { id: "ch_x", object: "charge", payment_intent: before.paymentIntentId, refunded: true } },
    });
    const url = `${app.appUrl}/api/v1/webhooks/payments`;
    const attempts: Record<string, string>[] = [
      { "stripe-signature": sign(forged, "whsec_someone_else") },
      { "stripe-signature": sign(forged.replace("charge.refunded", "charge.captured"), LOCAL_DEFAULTS.DEV_STRIPE_WEBHOOK_SECRET) },
      {},
    ];
    for (const headers of attempts) {
      const res = await fetch(url, { method: "POST", headers: { "content-type": "application/json", ...headers }, body: forged });
      expect(res.status).toBe(400);
    }
    expect((await paymentRows())[0].status).toBe("paid");
  });

  it("the admin refunds the paid visit and it shows refunded", async () => {
    const admin = await signedIn("admin@kinarc.test");
    const page = admin.pages()[0];
    await page.goto(`${app.appUrl}/admin-billing`);
    const row = page.locator(`tr[data-visit-id="${visitId}"]`);
    await expect(row.getByTestId("payment-state").getAttribute("data-state")).resolves.toBe("paid");
    await row.getByRole("button", { name: "Refund" }).click();
    await page.locator(`tr[data-visit-id="${visitId}"] [data-testid=payment-state][data-state=refunded]`).waitFor();
    const [refunded] = await paymentRows();
    expect(refunded.status).toBe("refunded");
    expect(refunded.refundId).toMatch(/^re_/);
    await admin.close();
  });
});
