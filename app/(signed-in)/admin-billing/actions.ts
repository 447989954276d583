"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { headers } from "next/headers";
import { getDb } from "@/db";
import { getPayment, upsertVisitPrice } from "@/db/queries/payments";
import { guardedAction, type FormState } from "@/lib/actions";
import { auditActorEvent } from "@/lib/audit";
import { AccessError, NOT_FOUND, requestAddress } from "@/lib/auth/guard";
import { PaymentRefused, refundPayment } from "@/lib/payments/checkout";
import { paymentService } from "@/lib/payments/service";
import { formDataToObject } from "@/lib/validation/common";
import { visitPriceSchema } from "@/lib/validation/payment";

export async function saveVisitPriceAction(_prev: FormState, formData: FormData): Promise<FormState> {
  const values = formDataToObject(formData);
  const state = await guardedAction(["admin"], async (actor) => {
    const input = visitPriceSchema.parse(values);
    const db = getDb();
    await db.transaction(async (tx) => {
      await upsertVisitPrice(tx, { clinicId: actor.clinicId, visitKind: input.visitKind, amountMinor: input.amount, currency: input.currency, label: input.label, updatedByUserId: actor.userId });
      await auditActorEvent(tx, actor, { action: "billing.price_set", detail: { visitKind: input.visitKind, amountMinor: input.amount, currency: input.currency } });
    });
    revalidatePath("/admin-billing");
    return { ok: true, message: "Price saved. New checkouts use it; ones already open keep theirs." };
  });
  return state.ok ? state : { ...state, values };
}

export async function refundPaymentAction(_prev: FormState, formData: FormData): Promise<FormState> {
  return guardedAction(["admin"], async (actor) => {
    const { paymentId } = z.object({ paymentId: z.uuid({ error: "expected a payment id" }) }).parse(formDataToObject(formData));
    const db = getDb();
    const payment = await getPayment(db, actor.clinicId, paymentId);
    if (!payment) throw new AccessError(404, NOT_FOUND);
    try {
      await refundPayment(db, paymentService(), actor, payment, { address: requestAddress(await headers()) });
    } catch (error) {
      if (error instanceof PaymentRefused) return { ok: false, message: error.message };
      throw error;
    }
    revalidatePath("/admin-billing");
    return { ok: true, message: "Refunded in full." };
  });
}
