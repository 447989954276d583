import { and, asc, eq, isNotNull } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { attempts, clinics, homeProgramItems, practiceSessions, type HomeProgramItem, type PracticeSession } from "@/db/schema";

export type NewProgramItem = typeof homeProgramItems.$inferInsert;
export type ProgramItemValues = Pick<
  NewProgramItem,
  "motion" | "side" | "digit" | "condition" | "repetitions" | "sessionsPerPeriod" | "period" | "startDate" | "endDate" | "notes"
>;

export async function listProgramItems(db: DbOrTx, clinicId: string, clientId: string): Promise<HomeProgramItem[]> {
  return db
    .select()
    .from(homeProgramItems)
    .where(and(eq(homeProgramItems.clinicId, clinicId), eq(homeProgramItems.clientId, clientId)))
    .orderBy(asc(homeProgramItems.startDate), asc(homeProgramItems.createdAt));
}

export async function getProgramItem(db: DbOrTx, clinicId: string, clientId: string, itemId: string): Promise<HomeProgramItem | null> {
  const [row] = await db
    .select()
    .from(homeProgramItems)
    .where(and(eq(homeProgramItems.id, itemId), eq(homeProgramItems.clinicId, clinicId), eq(homeProgramItems.clientId, clientId)));
  return row ?? null;
}

export async function createProgramItem(db: DbOrTx, row: NewProgramItem): Promise<HomeProgramItem> {
  const [created] = await db.insert(homeProgramItems).values(row).returning();
  return created;
}

export async function updateProgramItem(db: DbOrTx, itemId: string, values: ProgramItemValues, now = new Date()): Promise<HomeProgramItem> {
  const [updated] = await db
    .update(homeProgramItems)
    .set({ ...values, updatedAt: now })
    .where(eq(homeProgramItems.id, itemId))
    .returning();
  return updated;
}

export async function endProgramItem(db: DbOrTx, itemId: string, byUserId: string, at = new Date()): Promise<HomeProgramItem> {
  const [ended] = await db
    .update(homeProgramItems)
    .set({ endedAt: at, endedByUserId: byUserId, updatedAt: at })
    .where(eq(homeProgramItems.id, itemId))
    .returning();
  return ended;
}

export async function getPracticeSession(db: DbOrTx, sessionId: string): Promise<PracticeSession | null> {
  const [row] = await db.select().from(practiceSessions).where(eq(practiceSessions.id, sessionId));
  return row ?? null;
}

/** Creates the session the first time one of its attempts arrives; later attempts (or retries) find it. */
export async function insertPracticeSessionIfMissing(db: DbOrTx, row: typeof practiceSessions.$inferInsert): Promise<PracticeSession> {
  await db.insert(practiceSessions).values(row).onConflictDoNothing({ target: practiceSessions.id });
  return (await getPracticeSession(db, row.id))!;
}

export async function listPracticeSessions(db: DbOrTx, clinicId: string, clientId: string): Promise<PracticeSession[]> {
  return db
    .select()
    .from(practiceSessions)
    .where(and(eq(practiceSessions.clinicId, clinicId), eq(practiceSessions.clientId, clientId)))
    .orderBy(asc(practiceSessions.startedAt));
}

/** Every practice attempt of a client with its session, oldest first. */
export async function listPracticeAttempts(db: DbOrTx, clinicId: string, clientId: string) {
  return db
    .select({
      attemptId: attempts.id,
      sessionId: practiceSessions.id,
      itemId: practiceSessions.itemId,
      startedAt: practiceSessions.startedAt,
      localDate: practiceSessions.localDate,
      motion: attempts.motion,
      peakDeg: attempts.peakDeg,
      arcDeg: attempts.arcDeg,
      uncertaintyDeg: attempts.uncertaintyDeg,
      reps: attempts.reps,
      planeVerified: attempts.planeVerified,
    })
    .from(attempts)
    .innerJoin(practiceSessions, eq(practiceSessions.id, attempts.practiceSessionId))
    .where(and(eq(attempts.clinicId, clinicId), eq(attempts.clientId, clientId), eq(attempts.source, "practice"), isNotNull(attempts.practiceSessionId)))
    .orderBy(asc(attempts.recordedAt));
}

/** The clinic's IANA time zone, which decides on which day a session counts. */
export async function getClinicTimeZone(db: DbOrTx, clinicId: string): Promise<string> {
  const [row] = await db.select({ timezone: clinics.timezone }).from(clinics).where(eq(clinics.id, clinicId));
  return row?.timezone ?? "UTC";
}
