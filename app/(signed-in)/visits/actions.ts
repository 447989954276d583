"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db";
import { guardedAction, type FormState } from "@/lib/actions";
import { requestAddress } from "@/lib/auth/guard";
import { signTelehealthConsent } from "@/lib/consent/store";
import { TELEHEALTH_CONSENT } from "@/lib/consent/telehealth";
import { formDataToObject } from "@/lib/validation/common";
import { consentSchema, scheduleVisitSchema } from "@/lib/validation/visit";
import { changeVisitStatus, requireVisit, scheduleVisit } from "@/lib/visits/service";
import { headers } from "next/headers";
import { redirect } from "next/navigation";

export async function scheduleVisitAction(_prev: FormState, formData: FormData): Promise<FormState> {
  const values = formDataToObject(formData);
  const state = await guardedAction(["admin", "therapist"], async (actor) => {
    const input = scheduleVisitSchema.parse(values);
    const { invited, inviteProblem } = await scheduleVisit(getDb(), actor, input);
    return {
      ok: true,
      message: invited ? "Visit booked; the invitation is on its way to the client." : `Visit booked, but no invitation was sent: ${inviteProblem}.`,
    };
  });
  revalidatePath("/visits");
  return state.ok ? state : { ...state, values };
}

export async function cancelVisitAction(visitId: string): Promise<FormState> {
  const state = await guardedAction(["admin", "therapist"], async (actor) => {
    const db = getDb();
    const visit = await requireVisit(db, actor, visitId, "staff");
    await changeVisitStatus(db, actor, visit, "cancelled");
    return { ok: true, message: "Visit cancelled; the client has been told." };
  });
  revalidatePath("/visits");
  return state;
}

export async function signConsentAction(next: string, _prev: FormState, formData: FormData): Promise<FormState> {
  const values = formDataToObject(formData);
  const state = await guardedAction(["client"], async (actor) => {
    const input = consentSchema.parse(values);
    if (input.version !== TELEHEALTH_CONSENT.version) return { ok: false, message: "The consent text has changed; please read it again." };
    await signTelehealthConsent(getDb(), actor, input.signedName, requestAddress(await headers()));
    return { ok: true };
  });
  if (!state.ok) return { ...state, values };
  redirect(next.startsWith("/") ? next : "/home");
}
