import { and, eq, isNull } from "drizzle-orm";
import type { Database } from "@/db";
import { getVisitDetail } from "@/db/queries/visits";
import { payments, type Payment } from "@/db/schema";
import { renderMessage, sendMail } from "@/lib/mail";
import { formatMoney } from "./status";

export function receiptMessage(opts: { clinicName: string; clientName: string; visitStartsAt: Date; timezone: string; visitKind: string; payment: Payment; paidAt: Date }) {
  const when = new Intl.DateTimeFormat("en-GB", { dateStyle: "full", timeStyle: "short", timeZone: opts.timezone }).format(opts.visitStartsAt);
  return renderMessage({
    heading: `Receipt: ${formatMoney(opts.payment.amountMinor, opts.payment.currency)} paid to ${opts.clinicName}`,
    paragraphs: [
      `Received with thanks from ${opts.clientName} for the ${opts.visitKind === "video" ? "video" : "in-person"} visit on ${when}.`,
      `Amount: ${formatMoney(opts.payment.amountMinor, opts.payment.currency)}. Paid on ${opts.paidAt.toISOString().slice(0, 10)}. Reference: ${opts.payment.paymentIntentId ?? opts.payment.checkoutSessionId}.`,
      "Your card was handled by the clinic's payment service; neither Kinarc nor the clinic holds your card details.",
    ],
    footer: `${opts.clinicName}, through Kinarc. Keep this e-mail as your receipt.`,
  });
}

/** Sends the receipt for a paid payment once; a failure leaves receiptSentAt empty so it can be sent again. */
export async function sendReceipt(db: Database, paymentId: string): Promise<boolean> {
  const [payment] = await db.select().from(payments).where(eq(payments.id, paymentId));
  if (!payment || payment.status !== "paid" || payment.receiptSentAt) return false;
  const detail = await getVisitDetail(db, payment.visitId);
  if (!detail?.clientEmail) return false;
  const message = receiptMessage({
    clinicName: detail.clinicName,
    clientName: `${detail.clientGiven} ${detail.clientFamily}`,
    visitStartsAt: detail.visit.startsAt,
    timezone: detail.clinicTimezone,
    visitKind: detail.visit.kind,
    payment,
    paidAt: payment.paidAt ?? new Date(),
  });
  await sendMail({ to: detail.clientEmail, subject: `Your receipt from ${detail.clinicName}`, ...message });
  await db.update(payments).set({ receiptSentAt: new Date() }).where(eq(payments.id, payment.id));
  return true;
}

/**
 * Receipts still due: paid, never sent (the mail server was down when the payment came in). Run by the periodic jobs,
 * so a paying client always gets one, once.
 */
export async function sendDueReceipts(db: Database): Promise<{ sent: number; failed: number }> {
  const due = await db
    .select({ id: payments.id })
    .from(payments)
    .where(and(eq(payments.status, "paid"), isNull(payments.receiptSentAt)));
  let sent = 0;
  let failed = 0;
  for (const { id } of due) {
    try {
      if (await sendReceipt(db, id)) sent++;
    } catch {
      failed++;
    }
  }
  return { sent, failed };
}
