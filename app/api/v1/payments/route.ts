import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { listSelfPayVisits } from "@/db/queries/payments";
import { auditActorEvent } from "@/lib/audit";
import { requestAddress, requireClientRecord } from "@/lib/auth/guard";
import { route } from "@/lib/http";
import { visitPaymentState } from "@/lib/payments/status";
import { paymentListQuerySchema } from "@/lib/validation/payment";

/** Self-pay visits with their payment state: a client's own, or for the admin the clinic's (optionally one client's). */
export const GET = route(["client", "admin"], async ({ actor, request }) => {
  const query = paymentListQuerySchema.parse(Object.fromEntries(new URL(request.url).searchParams));
  const db = getDb();
  const address = requestAddress(request.headers);
  const clientId = actor.role === "client" ? actor.clientId! : query.clientId;
  if (clientId) await requireClientRecord(actor, clientId, { db, address, purpose: "payment.list" });
  else await auditActorEvent(db, actor, { action: "payment.list", address });
  const rows = await listSelfPayVisits(db, actor.clinicId, clientId);
  return NextResponse.json({
    rows: rows.map((r) => ({
      visitId: r.visit.id,
      clientId: r.visit.clientId,
      clientName: `${r.clientGiven} ${r.clientFamily}`,
      kind: r.visit.kind,
      startsAt: r.visit.startsAt.toISOString(),
      visitStatus: r.visit.status,
      paymentState: visitPaymentState(r.payments),
      payments: r.payments.map((p) => ({ id: p.id, status: p.status, amountMinor: p.amountMinor, currency: p.currency, paidAt: p.paidAt?.toISOString() ?? null, refundedAt: p.refundedAt?.toISOString() ?? null, receiptSent: Boolean(p.receiptSentAt) })),
    })),
  });
});
