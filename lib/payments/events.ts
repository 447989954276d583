import type Stripe from "stripe";
import type { Database, DbOrTx } from "@/db";
import { getPaymentByIntent, getPaymentBySession, updatePayment } from "@/db/queries/payments";
import { paymentEvents, type Payment } from "@/db/schema";
import { recordAudit } from "@/lib/audit";

export interface HandledEvent {
  type: string;
  duplicate: boolean;
  /** A payment that became paid with this event (its receipt is due). */
  paidPaymentId?: string;
}

/** Marks a payment paid from the service's record of its checkout; amount and currency must match what was asked. */
export async function markPaid(db: DbOrTx, payment: Payment, session: Stripe.Checkout.Session): Promise<boolean> {
  if (payment.status === "paid" || payment.status === "refunded") return false;
  const matches = session.amount_total === payment.amountMinor && session.currency === payment.currency;
  if (!matches) {
    await recordAudit(db, {
      action: "payment.mismatch",
      clinicId: payment.clinicId,
      actorRole: "system",
      subjectType: "payment",
      subjectId: payment.id,
      clientId: payment.clientId,
      detail: { expected: [payment.amountMinor, payment.currency], got: [session.amount_total, session.currency] },
    });
    return false;
  }
  const paymentIntentId = typeof session.payment_intent === "string" ? session.payment_intent : (session.payment_intent?.id ?? null);
  await updatePayment(db, payment.id, { status: "paid", paidAt: new Date(), paymentIntentId });
  await recordAudit(db, {
    action: "payment.paid",
    clinicId: payment.clinicId,
    actorRole: "system",
    subjectType: "payment",
    subjectId: payment.id,
    clientId: payment.clientId,
    detail: { checkoutSessionId: session.id, paymentIntentId },
  });
  return true;
}

/**
 * Applies one event whose signature the caller has verified (stripe.webhooks.constructEvent). Each event id is applied
 * once: a redelivery finds its id in payment_events and changes nothing.
 */
export async function applyPaymentEvent(db: Database, event: Stripe.Event): Promise<HandledEvent> {
  return db.transaction(async (tx) => {
    const fresh = await tx.insert(paymentEvents).values({ eventId: event.id, type: event.type, receivedAt: new Date() }).onConflictDoNothing().returning();
    if (!fresh.length) return { type: event.type, duplicate: true };
    const out: HandledEvent = { type: event.type, duplicate: false };
    if (event.type === "checkout.session.completed" || event.type === "checkout.session.async_payment_succeeded") {
      const session = event.data.object;
      const payment = await getPaymentBySession(tx, session.id);
      if (payment && session.payment_status === "paid" && (await markPaid(tx, payment, session))) out.paidPaymentId = payment.id;
    } else if (event.type === "checkout.session.expired") {
      const payment = await getPaymentBySession(tx, event.data.object.id);
      if (payment?.status === "pending") await updatePayment(tx, payment.id, { status: "expired" });
    } else if (event.type === "charge.refunded") {
      const charge = event.data.object;
      const intent = typeof charge.payment_intent === "string" ? charge.payment_intent : charge.payment_intent?.id;
      const payment = intent ? await getPaymentByIntent(tx, intent) : null;
      if (payment && charge.refunded && payment.status !== "refunded") {
        await updatePayment(tx, payment.id, { status: "refunded", refundedAt: new Date() });
        await recordAudit(tx, { action: "payment.refunded", clinicId: payment.clinicId, actorRole: "system", subjectType: "payment", subjectId: payment.id, clientId: payment.clientId });
      }
    }
    return out;
  });
}
