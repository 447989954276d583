import { eq } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { attemptCaptures, attempts, type Attempt, type NewAttempt } from "@/db/schema";

/** The attempt a browser stored under this capture id, if any (retries of one capture find it). */
export async function getAttemptByCaptureUid(db: DbOrTx, captureUid: string): Promise<Attempt | null> {
  const [row] = await db.select().from(attempts).where(eq(attempts.captureUid, captureUid));
  return row ?? null;
}

/** Writes an attempt and its raw capture; call inside a transaction so neither is stored without the other. */
export async function insertAttemptWithCapture(
  db: DbOrTx,
  row: NewAttempt,
  capture: { gzip: Buffer; sha256: string; bytes: number },
): Promise<Attempt> {
  const [created] = await db.insert(attempts).values(row).returning();
  await db.insert(attemptCaptures).values({ attemptId: created.id, ...capture });
  return created;
}

export async function getAttemptCapture(db: DbOrTx, attemptId: string) {
  const [row] = await db.select().from(attemptCaptures).where(eq(attemptCaptures.attemptId, attemptId));
  return row ?? null;
}
