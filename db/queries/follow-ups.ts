import { and, asc, eq, gte, inArray, isNull } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { clients, visits } from "@/db/schema";

/** Current clients of a clinic, for the follow-up queue. */
export async function listQueueClients(db: DbOrTx, clinicId: string) {
  return db
    .select()
    .from(clients)
    .where(and(eq(clients.clinicId, clinicId), isNull(clients.archivedAt)))
    .orderBy(asc(clients.familyName), asc(clients.givenName));
}

/** Scheduled in-person visits from `from` on, for a whole clinic or one client. */
export async function listUpcomingInPerson(db: DbOrTx, f: { clinicId: string; clientId?: string; from: Date }) {
  const where = [eq(visits.clinicId, f.clinicId), eq(visits.kind, "in_person"), inArray(visits.status, ["scheduled", "waiting", "in_progress"] as const), gte(visits.startsAt, f.from)];
  if (f.clientId) where.push(eq(visits.clientId, f.clientId));
  return db
    .select()
    .from(visits)
    .where(and(...where))
    .orderBy(asc(visits.startsAt));
}

export async function setPlannedTests(db: DbOrTx, visitId: string, plannedTests: { motion: string; side: string; digit: string | null }[]) {
  await db.update(visits).set({ plannedTests, updatedAt: new Date() }).where(eq(visits.id, visitId));
}
