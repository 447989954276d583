import { NextResponse } from "next/server";
import { z } from "zod";
import { getDb } from "@/db";
import { getPayment } from "@/db/queries/payments";
import { AccessError, NOT_FOUND, requestAddress } from "@/lib/auth/guard";
import { route } from "@/lib/http";
import { PaymentRefused, refundPayment } from "@/lib/payments/checkout";
import { paymentService } from "@/lib/payments/service";

/** The admin refunds a paid visit in full. */
export const POST = route<{ id: string }>(["admin"], async ({ actor, request, params }) => {
  const db = getDb();
  const payment = z.uuid().safeParse(params.id).success ? await getPayment(db, actor.clinicId, params.id) : null;
  if (!payment) throw new AccessError(404, NOT_FOUND);
  try {
    const after = await refundPayment(db, paymentService(), actor, payment, { address: requestAddress(request.headers) });
    return NextResponse.json({ id: after.id, status: after.status, refundId: after.refundId });
  } catch (error) {
    if (error instanceof PaymentRefused) return NextResponse.json({ error: error.message, fields: { [error.field]: error.message } }, { status: 409 });
    throw error;
  }
});
