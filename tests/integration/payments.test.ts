import { createHmac } from "node:crypto";
import http from "node:http";
import type { AddressInfo } from "node:net";
import { and, eq } from "drizzle-orm";
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { listVisitPayments, upsertVisitPrice } from "@/db/queries/payments";
import { auditEvents, clients, payments, users, visitPrices, visits } from "@/db/schema";
import { seedDemo, type SeedResult } from "@/db/seed/demo";
import { actorForUser, type Actor } from "@/lib/auth/guard";
import { PaymentRefused, refundPayment, startCheckout } from "@/lib/payments/checkout";
import { receiptMessage } from "@/lib/payments/receipt";
import { paymentServiceFor } from "@/lib/payments/service";
import { visitPaymentState } from "@/lib/payments/status";
import { handlePaymentWebhook } from "@/lib/payments/webhook";
import { startPaymentFake, type PaymentFake } from "../../scripts/payment-fake/server";
import { actorByEmail as actorByEmailIn, tempDatabase, type TempDb } from "./support";

const SECRET_KEY = "sk_test_integration_only";
const WEBHOOK_SECRET = "whsec_integration_only_0001";

let t: TempDb;
let seed: SeedResult;
let fake: PaymentFake;
let receiver: http.Server;
let stripe: Stripe;
let dorian: Actor;
let admin: Actor;
let visitId: string;
const received: { status: number; body: Record<string, unknown> }[] = [];

const actorByEmail = (email: string) => actorByEmailIn(t.db, email);

async function newVisit(clientKey: string, kind: "video" | "in_person" = "video"): Promise<string> {
  const [therapist] = await t.db.select().from(users).where(eq(users.email, "therapist@kinarc.test"));
  const [v] = await t.db
    .insert(visits)
    .values({ clinicId: seed.clinicId!, clientId: seed.clientIds![clientKey], therapistId: therapist.id, kind, startsAt: new Date("2026-12-03T10:00:00Z"), status: "finished" })
    .returning();
  return v.id;
}

/** What the customer does on the hosted page: press the pay button (a form POST), as a browser would. */
async function payOnHostedPage(url: string): Promise<string> {
  const res = await fetch(`${url}/complete`, { method: "POST", redirect: "manual" });
  expect(res.status).toBe(303);
  return res.headers.get("location")!;
}

async function waitFor<T>(probe: () => Promise<T | undefined | null | false>, timeoutMs = 10_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const v = await probe();
    if (v) return v;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error("timed out");
}

/** Signs a body as the payment service documents it ("Verify signatures manually": v1 = HMAC-SHA256 of "t.body"). */
function documentedSignature(payload: string, secret: string, timestamp = Math.floor(Date.now() / 1000)): string {
  return `t=${timestamp},v1=${createHmac("sha256", secret).update(`${timestamp}.${payload}`).digest("hex")}`;
}

beforeAll(async () => {
  t = await tempDatabase();
  seed = await seedDemo(t.db, new Date("2026-12-01T09:00:00Z"));
  stripe = paymentServiceFor({ secretKey: SECRET_KEY });
  // Kinarc's webhook endpoint, minus Next: the same handler function the route uses, over a real HTTP hop.
  receiver = http.createServer((req, res) => {
    let raw = "";
    req.on("data", (c) => (raw += c));
    req.on("end", async () => {
      const outcome = await handlePaymentWebhook(t.db, stripe, WEBHOOK_SECRET, raw, (req.headers["stripe-signature"] as string) ?? null);
      received.push({ status: outcome.status, body: outcome.body });
      res.writeHead(outcome.status, { "content-type": "application/json" });
      res.end(JSON.stringify(outcome.body));
    });
  });
  await new Promise<void>((r) => receiver.listen(0, "127.0.0.1", r));
  const hookPort = (receiver.address() as AddressInfo).port;
  fake = await startPaymentFake({ port: 0, secretKey: SECRET_KEY, webhookSecret: WEBHOOK_SECRET, webhookUrl: `http://127.0.0.1:${hookPort}/`, quiet: true });
  stripe = paymentServiceFor({ secretKey: SECRET_KEY, apiUrl: fake.url });
  dorian = await actorByEmail("client@kinarc.test");
  admin = await actorByEmail("admin@kinarc.test");
  await upsertVisitPrice(t.db, { clinicId: seed.clinicId!, visitKind: "video", amountMinor: 6500, currency: "gbp", label: "Video hand therapy visit", updatedByUserId: admin.userId });
  visitId = await newVisit("dorian");
});
afterAll(async () => {
  await fake?.close();
  await new Promise((r) => receiver?.close(r));
  t?.close();
});

describe("paying for a self-pay visit through the stand-in, with the official SDK", () => {
  it("opens one checkout at the clinic's price and reuses it while it is open", async () => {
    const first = await startCheckout(t.db, stripe, dorian, visitId, { appUrl: "http://localhost:3000" });
    expect(first.reused).toBe(false);
    expect(first.url).toMatch(new RegExp(`^${fake.url}/c/pay/cs_test_`));
    const session = await stripe.checkout.sessions.retrieve((await listVisitPayments(t.db, visitId))[0].checkoutSessionId);
    expect(session.amount_total).toBe(6500);
    expect(session.currency).toBe("gbp");
    expect(session.client_reference_id).toBe(visitId);
    const again = await startCheckout(t.db, stripe, dorian, visitId, { appUrl: "http://localhost:3000" });
    expect(again).toEqual({ ...first, reused: true });
    expect(visitPaymentState(await listVisitPayments(t.db, visitId))).toBe("pending");
  });

  it("is paid only after the signed event, which is applied once even when delivered twice", async () => {
    const [payment] = await listVisitPayments(t.db, visitId);
    const back = await payOnHostedPage(payment.checkoutUrl!);
    expect(back).toBe(`http://localhost:3000/pay?visit=${visitId}&returned=1`);
    const paid = await waitFor(async () => (await listVisitPayments(t.db, visitId)).find((p) => p.status === "paid"));
    expect(paid.paymentIntentId).toMatch(/^pi_/);
    expect(visitPaymentState(await listVisitPayments(t.db, visitId))).toBe("paid");
    // Redeliver the same event, signed the documented way: accepted, recognised as a duplicate, nothing changes.
    const delivered = fake.deliveries().find((d) => d.type === "checkout.session.completed")!;
    const session = await stripe.checkout.sessions.retrieve(payment.checkoutSessionId);
    const payload = JSON.stringify({ id: delivered.eventId, object: "event", type: "checkout.session.completed", data: { object: session } });
    const again = await handlePaymentWebhook(t.db, stripe, WEBHOOK_SECRET, payload, documentedSignature(payload, WEBHOOK_SECRET));
    expect(again.status).toBe(200);
    expect(again.body.duplicate).toBe(true);
    const audits = await t.db.select().from(auditEvents).where(and(eq(auditEvents.action, "payment.paid"), eq(auditEvents.subjectId, payment.id)));
    expect(audits).toHaveLength(1);
    await expect(startCheckout(t.db, stripe, dorian, visitId, { appUrl: "http://x" })).rejects.toThrow(/already paid/);
  });

  it("refunds through the service and the visit shows refunded", async () => {
    const [payment] = await listVisitPayments(t.db, visitId);
    const after = await refundPayment(t.db, stripe, admin, payment);
    expect(after.status).toBe("refunded");
    expect(after.refundId).toMatch(/^re_/);
    await waitFor(async () => fake.deliveries().find((d) => d.type === "charge.refunded" && d.status === 200));
    expect(visitPaymentState(await listVisitPayments(t.db, visitId))).toBe("refunded");
  });
});

describe("forged and mismatched events", () => {
  it("refuses a wrong secret, an altered body, a stale timestamp and a missing header with 400, changing nothing", async () => {
    const otherVisit = await newVisit("dorian");
    const started = await startCheckout(t.db, stripe, dorian, otherVisit, { appUrl: "http://x" });
    const [pending] = await listVisitPayments(t.db, otherVisit);
    const forgedSession = { id: pending.checkoutSessionId, object: "checkout.session", payment_status: "paid", status: "complete", amount_total: 6500, currency: "gbp", payment_intent: "pi_forged" };
    const payload = JSON.stringify({ id: "evt_forged_1", object: "event", type: "checkout.session.completed", data: { object: forgedSession } });
    const cases = [
      documentedSignature(payload, "whsec_not_the_clinics"),
      documentedSignature(payload.replace("6500", "6501"), WEBHOOK_SECRET),
      documentedSignature(payload, WEBHOOK_SECRET, Math.floor(Date.now() / 1000) - 3600),
      null,
    ];
    for (const signature of cases) {
      const outcome = await handlePaymentWebhook(t.db, stripe, WEBHOOK_SECRET, payload, signature);
      expect(outcome.status).toBe(400);
    }
    expect((await listVisitPayments(t.db, otherVisit))[0].status).toBe("pending");
    expect(started.url).toContain(pending.checkoutSessionId);
  });

  it("does not mark paid when a correctly signed event carries another amount", async () => {
    const v = await newVisit("dorian");
    await startCheckout(t.db, stripe, dorian, v, { appUrl: "http://x" });
    const [pending] = await listVisitPayments(t.db, v);
    const payload = JSON.stringify({
      id: "evt_mismatch_1",
      object: "event",
      type: "checkout.session.completed",
      data: { object: { id: pending.checkoutSessionId, object: "checkout.session", payment_status: "paid", amount_total: 100, currency: "gbp", payment_intent: "pi_x" } },
    });
    expect((await handlePaymentWebhook(t.db, stripe, WEBHOOK_SECRET, payload, documentedSignature(payload, WEBHOOK_SECRET))).status).toBe(200);
    expect((await listVisitPayments(t.db, v))[0].status).toBe("pending");
    const [flag] = await t.db.select().from(auditEvents).where(and(eq(auditEvents.action, "payment.mismatch"), eq(auditEvents.subjectId, pending.id)));
    expect(flag.detail).toEqual({ expected: [6500, "gbp"], got: [100, "gbp"] });
  });
});

describe("what cannot be paid", () => {
  it("refuses a visit of a client who is not self-pay, a kind without a price, another client's visit, and a wrong key", async () => {
    const wrenVisit = await newVisit("wren");
    const [wrenClient] = await t.db.select().from(clients).where(eq(clients.id, seed.clientIds!.wren));
    const wren = (await actorForUser(t.db, wrenClient.userId!))!;
    await expect(startCheckout(t.db, stripe, wren, wrenVisit, { appUrl: "http://x" })).rejects.toThrow(/not self-pay/);
    // The demo seed prices in-person visits too; this clinic has not (yet).
    await t.db.delete(visitPrices).where(eq(visitPrices.visitKind, "in_person"));
    const inPerson = await newVisit("dorian", "in_person");
    const refused = await startCheckout(t.db, stripe, dorian, inPerson, { appUrl: "http://x" }).catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(PaymentRefused);
    expect((refused as Error).message).toBe("The clinic has not set a price for in-person visits yet.");
    await expect(startCheckout(t.db, stripe, dorian, wrenVisit, { appUrl: "http://x" })).rejects.toMatchObject({ status: 404 });
    const badKey = paymentServiceFor({ secretKey: "sk_test_wrong", apiUrl: fake.url });
    await expect(badKey.checkout.sessions.retrieve("cs_test_x")).rejects.toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    expect(await t.db.select().from(payments).where(eq(payments.visitId, inPerson))).toHaveLength(0);
  });
});

describe("receipt", () => {
  it("states the amount, the visit time in the clinic's zone and the reference, and that no card data is held", () => {
    const { text } = receiptMessage({
      clinicName: "Saltmarsh Hand Therapy",
      clientName: "Dorian Vale",
      visitStartsAt: new Date("2026-07-03T10:00:00Z"),
      timezone: "Europe/London",
      visitKind: "video",
      payment: { amountMinor: 6500, currency: "gbp", paymentIntentId: "pi_123", checkoutSessionId: "cs_1" } as never,
      paidAt: new Date("2026-07-03T12:00:00Z"),
    });
    expect(text).toContain("Amount: £65.00.");
    // 10:00 UTC is 11:00 in London in July (British Summer Time, UTC+1 [common practice]).
    expect(text).toContain("3 July 2026 at 11:00");
    expect(text).toContain("Reference: pi_123");
    expect(text).toMatch(/neither Kinarc nor the clinic holds your card details/);
  });
});
