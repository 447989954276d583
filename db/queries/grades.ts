import { and, asc, eq } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { gradeEntries, type GradeEntry } from "@/db/schema";

export type NewGradeEntry = typeof gradeEntries.$inferInsert;

export async function listGradeEntries(db: DbOrTx, clinicId: string, clientId: string): Promise<GradeEntry[]> {
  return db
    .select()
    .from(gradeEntries)
    .where(and(eq(gradeEntries.clinicId, clinicId), eq(gradeEntries.clientId, clientId)))
    .orderBy(asc(gradeEntries.recordedAt));
}

export async function getGradeEntry(db: DbOrTx, clinicId: string, clientId: string, gradeId: string): Promise<GradeEntry | null> {
  const [row] = await db
    .select()
    .from(gradeEntries)
    .where(and(eq(gradeEntries.id, gradeId), eq(gradeEntries.clinicId, clinicId), eq(gradeEntries.clientId, clientId)));
  return row ?? null;
}

export async function createGradeEntry(db: DbOrTx, entry: NewGradeEntry): Promise<GradeEntry> {
  const [row] = await db.insert(gradeEntries).values(entry).returning();
  return row;
}

/**
 * Co-signs an assistant's entry. The `status = awaiting_cosign` condition is in the UPDATE itself, so a signed entry
 * can never be changed here, even by two co-signatures racing; returns null when nothing was waiting.
 */
export async function cosignGradeEntry(
  db: DbOrTx,
  ids: { clinicId: string; clientId: string; gradeId: string },
  signer: { userId: string; at: Date },
): Promise<GradeEntry | null> {
  const [row] = await db
    .update(gradeEntries)
    .set({ status: "signed", signedByUserId: signer.userId, signedAt: signer.at })
    .where(
      and(
        eq(gradeEntries.id, ids.gradeId),
        eq(gradeEntries.clinicId, ids.clinicId),
        eq(gradeEntries.clientId, ids.clientId),
        eq(gradeEntries.status, "awaiting_cosign"),
      ),
    )
    .returning();
  return row ?? null;
}
