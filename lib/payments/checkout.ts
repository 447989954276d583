import { randomUUID } from "node:crypto";
import type Stripe from "stripe";
import type { Database } from "@/db";
import { getClient } from "@/db/queries/clients";
import { createPayment, getVisitPrice, listVisitPayments, updatePayment } from "@/db/queries/payments";
import { getVisit } from "@/db/queries/visits";
import type { Payment } from "@/db/schema";
import { auditActorEvent } from "@/lib/audit";
import { AccessError, NOT_FOUND, type Actor } from "@/lib/auth/guard";
import { markPaid } from "./events";

export class PaymentRefused extends Error {
  constructor(
    message: string,
    public readonly field = "visitId",
  ) {
    super(message);
  }
}

export interface CheckoutStart {
  paymentId: string;
  url: string;
  reused: boolean;
}

/**
 * Opens (or reopens) a hosted checkout for a self-pay client's visit. The amount is the clinic's current price for
 * the visit's kind, decided here and never taken from the browser; the card is entered on the payment service's page,
 * so no card data reaches Kinarc. A checkout still open for the visit is reused rather than a second one started.
 */
export async function startCheckout(
  db: Database,
  stripe: Stripe,
  actor: Actor,
  visitId: string,
  opts: { appUrl: string; address?: string | null },
): Promise<CheckoutStart> {
  const visit = await getVisit(db, actor.clinicId, visitId);
  if (!visit || (actor.role === "client" && visit.clientId !== actor.clientId)) throw new AccessError(404, NOT_FOUND);
  const client = await getClient(db, actor.clinicId, visit.clientId);
  if (!client) throw new AccessError(404, NOT_FOUND);
  if (!client.selfPay) throw new PaymentRefused("This visit is not self-pay: the clinic bills it another way.");
  if (visit.status === "cancelled" || visit.status === "missed") throw new PaymentRefused(`This visit was ${visit.status}; there is nothing to pay.`);
  const existing = await listVisitPayments(db, visit.id);
  if (existing.some((p) => p.status === "paid")) throw new PaymentRefused("This visit is already paid.");
  for (const p of existing.filter((x) => x.status === "pending")) {
    const session = await stripe.checkout.sessions.retrieve(p.checkoutSessionId);
    if (session.status === "open" && session.url) return { paymentId: p.id, url: session.url, reused: true };
    if (session.status === "complete" && session.payment_status === "paid") {
      // The confirming event is late: the service's own record is authoritative, so apply it now.
      await markPaid(db, p, session);
      throw new PaymentRefused("This visit is already paid.");
    }
    if (session.status === "expired") await updatePayment(db, p.id, { status: "expired" });
  }
  const price = await getVisitPrice(db, actor.clinicId, visit.kind);
  if (!price) throw new PaymentRefused(`The clinic has not set a price for ${visit.kind === "video" ? "video" : "in-person"} visits yet.`);
  const paymentId = randomUUID();
  const back = `${opts.appUrl}/pay?visit=${visit.id}`;
  const session = await stripe.checkout.sessions.create(
    {
      mode: "payment",
      line_items: [{ quantity: 1, price_data: { currency: price.currency, unit_amount: price.amountMinor, product_data: { name: price.label } } }],
      client_reference_id: visit.id,
      customer_email: client.email ?? undefined,
      metadata: { kinarcPaymentId: paymentId, visitId: visit.id, clinicId: visit.clinicId },
      success_url: `${back}&returned=1`,
      cancel_url: `${back}&cancelled=1`,
    },
    // The same payment id never opens two checkouts, even if the SDK retries after a dropped connection.
    { idempotencyKey: `kinarc-checkout-${paymentId}` },
  );
  if (!session.url) throw new Error("The payment service returned a checkout without a page to open.");
  await db.transaction(async (tx) => {
    await createPayment(tx, {
      id: paymentId,
      clinicId: visit.clinicId,
      visitId: visit.id,
      clientId: client.id,
      amountMinor: price.amountMinor,
      currency: price.currency,
      status: "pending",
      checkoutSessionId: session.id,
      checkoutUrl: session.url,
      createdByUserId: actor.userId,
    });
    await auditActorEvent(tx, actor, {
      action: "payment.checkout",
      clinicId: visit.clinicId,
      subjectType: "payment",
      subjectId: paymentId,
      clientId: client.id,
      address: opts.address ?? null,
      detail: { visitId: visit.id, amountMinor: price.amountMinor, currency: price.currency },
    });
  });
  return { paymentId, url: session.url, reused: false };
}

/** The admin refunds a paid visit in full through the payment service; the visit then shows refunded. */
export async function refundPayment(db: Database, stripe: Stripe, actor: Actor, payment: Payment, opts: { address?: string | null } = {}): Promise<Payment> {
  if (payment.status !== "paid" || !payment.paymentIntentId) throw new PaymentRefused("Only a paid visit can be refunded.", "paymentId");
  const refund = await stripe.refunds.create({ payment_intent: payment.paymentIntentId }, { idempotencyKey: `kinarc-refund-${payment.id}` });
  const done = refund.status === "succeeded";
  await db.transaction(async (tx) => {
    await updatePayment(tx, payment.id, { refundId: refund.id, ...(done ? { status: "refunded", refundedAt: new Date() } : {}) });
    await auditActorEvent(tx, actor, {
      action: "payment.refund",
      clinicId: payment.clinicId,
      subjectType: "payment",
      subjectId: payment.id,
      clientId: payment.clientId,
      address: opts.address ?? null,
      detail: { refundId: refund.id, status: refund.status },
    });
  });
  return { ...payment, refundId: refund.id, status: done ? "refunded" : payment.status };
}
