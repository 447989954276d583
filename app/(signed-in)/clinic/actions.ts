"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db";
import { updateClinic } from "@/db/queries/clinics";
import { guardedAction, type FormState } from "@/lib/actions";
import { auditActorEvent } from "@/lib/audit";
import { formDataToObject } from "@/lib/validation/common";
import { clinicSettingsSchema } from "@/lib/validation/staff";
import { RANGE_TABLE_IDS } from "@/lib/motions/catalog";
import { BadRequest } from "@/lib/http";

export async function saveClinicSettingsAction(_prev: FormState, formData: FormData): Promise<FormState> {
  const values = formDataToObject(formData);
  const state = await guardedAction(["admin"], async (actor) => {
    const input = clinicSettingsSchema.parse(values);
    if (!(RANGE_TABLE_IDS as readonly string[]).includes(input.normTable)) {
      throw new BadRequest("Invalid input", { normTable: `expected one of ${RANGE_TABLE_IDS.join(", ")}` });
    }
    const db = getDb();
    await db.transaction(async (tx) => {
      await updateClinic(tx, actor.clinicId, input);
      await auditActorEvent(tx, actor, { action: "clinic.settings_update", detail: { fields: Object.keys(input) } });
    });
    revalidatePath("/clinic");
    return { ok: true, message: "Settings saved." };
  });
  return state.ok ? state : { ...state, values };
}
