import { getDb } from "@/db";
import { CLINICAL_ROLES } from "@/db/schema";
import { requestAddress, requireClientRecord, type Actor } from "@/lib/auth/guard";
import { clinicToday } from "./chart";

/** Therapists and assistants work on charts; admins see nothing clinical here. */
export const CHART_STAFF = CLINICAL_ROLES;

/** The record (access-checked and audited) and the clinic's today, which every chart request needs. */
export async function chartContext(actor: Actor, clientId: string, request: Request, purpose: string) {
  const db = getDb();
  const address = requestAddress(request.headers);
  const [client, today] = await Promise.all([requireClientRecord(actor, clientId, { db, address, purpose }), clinicToday(db, actor.clinicId)]);
  return { db, client, today, address, ctx: { actor, client, today, address } };
}
