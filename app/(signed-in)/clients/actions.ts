"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { getDb } from "@/db";
import { guardedAction, type FormState } from "@/lib/actions";
import { requireClientRecord } from "@/lib/auth/guard";
import { CLIENT_EDITORS, createClientFor, updateClientFor } from "@/lib/clients";
import { clientInputSchema } from "@/lib/validation/client";
import { formDataToObject } from "@/lib/validation/common";

export async function createClientAction(_prev: FormState, formData: FormData): Promise<FormState> {
  const values = formDataToObject(formData);
  let createdId = "";
  const state = await guardedAction(CLIENT_EDITORS, async (actor) => {
    const input = clientInputSchema.parse(values);
    createdId = (await createClientFor(getDb(), actor, input)).id;
    return { ok: true };
  });
  if (!state.ok) return { ...state, values };
  revalidatePath("/clients");
  redirect(`/clients/${createdId}`);
}

export async function updateClientAction(clientId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  const values = formDataToObject(formData);
  const state = await guardedAction(CLIENT_EDITORS, async (actor) => {
    await requireClientRecord(actor, clientId, { purpose: "edit" });
    // The form always sends every field, so the whole-record schema applies (unticked boxes mean "none").
    const input = clientInputSchema.parse({ precautionFlags: [], selfPay: false, ...values });
    await updateClientFor(getDb(), actor, clientId, input);
    return { ok: true };
  });
  if (!state.ok) return { ...state, values };
  revalidatePath(`/clients/${clientId}`);
  redirect(`/clients/${clientId}`);
}
