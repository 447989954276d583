import { and, asc, desc, eq, gte, inArray, isNull, lt, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import type { Database, DbOrTx } from "@/db";
import { clients, clinics, users, visits, type Visit, type VisitStatus } from "@/db/schema";

export const OPEN_STATUSES: VisitStatus[] = ["scheduled", "waiting", "in_progress"];

export async function getVisit(db: Pick<Database, "select">, clinicId: string, visitId: string): Promise<Visit | null> {
  const [row] = await db
    .select()
    .from(visits)
    .where(and(eq(visits.id, visitId), eq(visits.clinicId, clinicId)));
  return row ?? null;
}

/** A visit with the names a screen or an e-mail needs. */
export async function getVisitDetail(db: Pick<Database, "select">, visitId: string) {
  const therapist = alias(users, "therapist");
  const [row] = await db
    .select({
      visit: visits,
      clientGiven: clients.givenName,
      clientFamily: clients.familyName,
      clientEmail: clients.email,
      clientUserId: clients.userId,
      therapistName: therapist.name,
      therapistEmail: therapist.email,
      clinicName: clinics.name,
      clinicEmail: clinics.contactEmail,
      clinicTimezone: clinics.timezone,
    })
    .from(visits)
    .innerJoin(clients, eq(clients.id, visits.clientId))
    .innerJoin(therapist, eq(therapist.id, visits.therapistId))
    .innerJoin(clinics, eq(clinics.id, visits.clinicId))
    .where(eq(visits.id, visitId));
  return row ?? null;
}
export type VisitDetail = NonNullable<Awaited<ReturnType<typeof getVisitDetail>>>;

export interface VisitListFilter {
  clinicId: string;
  clientId?: string;
  therapistId?: string;
  from?: Date;
  to?: Date;
  statuses?: VisitStatus[];
  limit?: number;
  newestFirst?: boolean;
}

export async function listVisits(db: Database, f: VisitListFilter) {
  const where: SQL[] = [eq(visits.clinicId, f.clinicId)];
  if (f.clientId) where.push(eq(visits.clientId, f.clientId));
  if (f.therapistId) where.push(eq(visits.therapistId, f.therapistId));
  if (f.from) where.push(gte(visits.startsAt, f.from));
  if (f.to) where.push(lt(visits.startsAt, f.to));
  if (f.statuses?.length) where.push(inArray(visits.status, f.statuses));
  const therapist = alias(users, "therapist");
  return db
    .select({
      id: visits.id,
      kind: visits.kind,
      status: visits.status,
      startsAt: visits.startsAt,
      durationMin: visits.durationMin,
      reason: visits.reason,
      location: visits.location,
      clientId: visits.clientId,
      clientName: clients.givenName,
      clientFamily: clients.familyName,
      therapistId: visits.therapistId,
      therapistName: therapist.name,
    })
    .from(visits)
    .innerJoin(clients, eq(clients.id, visits.clientId))
    .innerJoin(therapist, eq(therapist.id, visits.therapistId))
    .where(and(...where))
    .orderBy(f.newestFirst ? desc(visits.startsAt) : asc(visits.startsAt))
    .limit(f.limit ?? 200);
}
export type VisitListRow = Awaited<ReturnType<typeof listVisits>>[number];

/** Visits whose reminder is due: not yet reminded, still open, starting between `now` and `until`. */
export async function listRemindersDue(db: Database, now: Date, until: Date) {
  return db
    .select({ id: visits.id })
    .from(visits)
    .where(and(isNull(visits.reminderSentAt), inArray(visits.status, ["scheduled"]), gte(visits.startsAt, now), lt(visits.startsAt, until)));
}

export async function updateVisit(db: DbOrTx, visitId: string, patch: Partial<typeof visits.$inferInsert>) {
  await db
    .update(visits)
    .set({ ...patch, updatedAt: new Date() })
    .where(eq(visits.id, visitId));
}
