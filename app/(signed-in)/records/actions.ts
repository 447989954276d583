"use server";

import { revalidatePath } from "next/cache";
import { headers } from "next/headers";
import { z } from "zod";
import { getDb } from "@/db";
import { getClient } from "@/db/queries/clients";
import { guardedAction, type FormState } from "@/lib/actions";
import { AccessError, NOT_FOUND, requestAddress } from "@/lib/auth/guard";
import { eraseClient, ErasureRefused } from "@/lib/export/erase";
import { BadRequest } from "@/lib/http";
import { getStorage } from "@/lib/storage";
import { formDataToObject, isoDate } from "@/lib/validation/common";

const erasureSchema = z.object({
  clientId: z.uuid({ error: "expected a client" }),
  confirmName: z.string().trim().min(1, { error: "type the client's full name to confirm" }),
  requestedOn: isoDate,
});

/** The admin erases a client on their request, after typing the client's full name to confirm. */
export async function eraseClientAction(_prev: FormState, formData: FormData): Promise<FormState> {
  const values = formDataToObject(formData);
  const state = await guardedAction(["admin"], async (actor) => {
    const input = erasureSchema.parse(values);
    const db = getDb();
    const client = await getClient(db, actor.clinicId, input.clientId);
    if (!client) throw new AccessError(404, NOT_FOUND);
    if (input.confirmName.toLowerCase() !== `${client.givenName} ${client.familyName}`.toLowerCase()) {
      throw new BadRequest("Invalid input", { confirmName: `expected the client's full name exactly: ${client.givenName} ${client.familyName}` });
    }
    try {
      const summary = await eraseClient(db, getStorage(), actor, client.id, { requestedAt: new Date(`${input.requestedOn}T00:00:00Z`), address: requestAddress(await headers()) });
      revalidatePath("/records");
      const removed = Object.entries(summary.deleted).map(([k, n]) => `${k} ${n}`).join(", ");
      return { ok: true, message: `Erased. Deleted: ${removed}. The signed clinical record and the audit trail are kept without the name.` };
    } catch (error) {
      if (error instanceof ErasureRefused) return { ok: false, message: error.message };
      throw error;
    }
  });
  return state.ok ? state : { ...state, values };
}
