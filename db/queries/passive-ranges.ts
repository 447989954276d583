import { and, asc, eq } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { passiveRanges, type PassiveRange } from "@/db/schema";

export type NewPassiveRange = typeof passiveRanges.$inferInsert;

export async function listPassiveRanges(db: DbOrTx, clinicId: string, clientId: string): Promise<PassiveRange[]> {
  return db
    .select()
    .from(passiveRanges)
    .where(and(eq(passiveRanges.clinicId, clinicId), eq(passiveRanges.clientId, clientId)))
    .orderBy(asc(passiveRanges.measuredAt));
}

export async function createPassiveRange(db: DbOrTx, row: NewPassiveRange): Promise<PassiveRange> {
  const [created] = await db.insert(passiveRanges).values(row).returning();
  return created;
}
