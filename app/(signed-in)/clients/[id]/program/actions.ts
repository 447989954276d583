"use server";

import { headers } from "next/headers";
import { revalidatePath } from "next/cache";
import { getDb } from "@/db";
import { guardedAction, type FormState } from "@/lib/actions";
import { requestAddress } from "@/lib/auth/guard";
import { assignProgramItem, changeProgramItem, endProgramItemFor, PROGRAM_EDITORS } from "@/lib/practice/manage";
import { formDataToObject } from "@/lib/validation/common";

/** Assigns a new item (itemId null) or changes an existing one. */
export async function saveProgramItemAction(clientId: string, itemId: string | null, _prev: FormState, formData: FormData): Promise<FormState> {
  const values = formDataToObject(formData);
  const state = await guardedAction(PROGRAM_EDITORS, async (actor) => {
    const address = requestAddress(await headers());
    if (itemId) await changeProgramItem(getDb(), actor, clientId, itemId, values, { address });
    else await assignProgramItem(getDb(), actor, clientId, values, { address });
    return { ok: true, message: itemId ? "Program item saved." : "Program item assigned." };
  });
  if (!state.ok) return { ...state, values };
  revalidatePath(`/clients/${clientId}/program`);
  return state;
}

export async function endProgramItemAction(clientId: string, itemId: string): Promise<FormState> {
  const state = await guardedAction(PROGRAM_EDITORS, async (actor) => {
    await endProgramItemFor(getDb(), actor, clientId, itemId, { address: requestAddress(await headers()) });
    return { ok: true, message: "Program item ended." };
  });
  if (state.ok) revalidatePath(`/clients/${clientId}/program`);
  return state;
}
