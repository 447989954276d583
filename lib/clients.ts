import type { Database } from "@/db";
import { createClientRecord, getClient, isClinicianOf, updateClientRecord } from "@/db/queries/clients";
import type { Client } from "@/db/schema";
import { auditActorEvent } from "@/lib/audit";
import type { Actor } from "@/lib/auth/guard";
import { AccessError, NOT_FOUND } from "@/lib/auth/guard";
import { BadRequest } from "@/lib/http";
import { precautionDateProblem, type ClientInput, type ClientPatch } from "@/lib/validation/client";

/** Roles that may create and change client records (clinical data). Admins read only. */
export const CLIENT_EDITORS = ["therapist", "assistant"] as const;
export const STAFF = ["admin", "therapist", "assistant"] as const;

/** The JSON shape of a client record in the API (staff view). */
export function clientJson(c: Client) {
  return {
    id: c.id,
    givenName: c.givenName,
    familyName: c.familyName,
    email: c.email,
    dateOfBirth: c.dateOfBirth,
    sex: c.sex,
    dominantHand: c.dominantHand,
    affectedSide: c.affectedSide,
    diagnosisNote: c.diagnosisNote,
    referringPhysician: c.referringPhysician,
    precautionFlags: c.precautionFlags,
    precautionNote: c.precautionNote,
    noResistedUntil: c.noResistedUntil,
    primaryTherapistId: c.primaryTherapistId,
    selfPay: c.selfPay,
    hasAccount: Boolean(c.userId),
    createdAt: c.createdAt.toISOString(),
    updatedAt: c.updatedAt.toISOString(),
  };
}

async function checkTherapist(db: Database, clinicId: string, therapistId: string | null | undefined) {
  if (therapistId && !(await isClinicianOf(db, clinicId, therapistId))) {
    throw new BadRequest("Invalid input (primaryTherapistId: expected an active therapist of this clinic)", {
      primaryTherapistId: "expected an active therapist of this clinic",
    });
  }
}

/** Creates a client record and its audit event in one transaction. */
export async function createClientFor(db: Database, actor: Actor, input: ClientInput): Promise<Client> {
  await checkTherapist(db, actor.clinicId, input.primaryTherapistId);
  return db.transaction(async (tx) => {
    const created = await createClientRecord(tx, actor.clinicId, input);
    await auditActorEvent(tx, actor, {
      action: "client.create",
      subjectType: "client",
      subjectId: created.id,
      clientId: created.id,
    });
    return created;
  });
}

/** Applies a partial change; the merged record must still satisfy the cross-field rules. One transaction. */
export async function updateClientFor(db: Database, actor: Actor, clientId: string, patch: ClientPatch): Promise<Client> {
  await checkTherapist(db, actor.clinicId, patch.primaryTherapistId);
  return db.transaction(async (tx) => {
    const current = await getClient(tx, actor.clinicId, clientId);
    if (!current) throw new AccessError(404, NOT_FOUND);
    const problem = precautionDateProblem({ ...current, ...patch });
    if (problem) throw new BadRequest(`Invalid input (precautionFlags: ${problem})`, { precautionFlags: problem });
    const updated = await updateClientRecord(tx, actor.clinicId, clientId, patch);
    if (!updated) throw new AccessError(404, NOT_FOUND);
    await auditActorEvent(tx, actor, {
      action: "client.update",
      subjectType: "client",
      subjectId: clientId,
      clientId,
      detail: { fields: Object.keys(patch) },
    });
    return updated;
  });
}
