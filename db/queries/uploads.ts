import { and, asc, desc, eq, inArray, isNull, sql, type SQL } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { attempts, clients, uploads, users, type Upload, type UploadKind } from "@/db/schema";

export async function getUploadByUid(db: DbOrTx, uploadUid: string): Promise<Upload | null> {
  const [row] = await db.select().from(uploads).where(eq(uploads.uploadUid, uploadUid));
  return row ?? null;
}

/** One upload of the clinic, or null (another clinic's upload is treated as missing). */
export async function getUpload(db: DbOrTx, clinicId: string, uploadId: string): Promise<Upload | null> {
  const [row] = await db
    .select()
    .from(uploads)
    .where(and(eq(uploads.id, uploadId), eq(uploads.clinicId, clinicId)));
  return row ?? null;
}

export async function createUpload(db: DbOrTx, row: typeof uploads.$inferInsert): Promise<Upload> {
  const [created] = await db.insert(uploads).values(row).returning();
  return created;
}

/** The clinic's uploads, unreviewed first then newest first, with the client's and sender's names. */
export async function listUploads(db: DbOrTx, clinicId: string, f: { clientId?: string; kind?: UploadKind; limit?: number }) {
  const where: SQL[] = [eq(uploads.clinicId, clinicId)];
  if (f.clientId) where.push(eq(uploads.clientId, f.clientId));
  if (f.kind) where.push(eq(uploads.kind, f.kind));
  return db
    .select({
      upload: uploads,
      clientGiven: clients.givenName,
      clientFamily: clients.familyName,
      uploaderName: users.name,
    })
    .from(uploads)
    .innerJoin(clients, eq(clients.id, uploads.clientId))
    .leftJoin(users, eq(users.id, uploads.uploadedByUserId))
    .where(and(...where))
    .orderBy(sql`${uploads.reviewedAt} is not null`, desc(uploads.createdAt), asc(uploads.id))
    .limit(f.limit ?? 200);
}

export async function markUploadReviewed(db: DbOrTx, uploadId: string, userId: string): Promise<void> {
  await db
    .update(uploads)
    .set({ reviewedAt: new Date(), reviewedByUserId: userId })
    .where(and(eq(uploads.id, uploadId), isNull(uploads.reviewedAt)));
}

export async function listClientUploads(db: DbOrTx, clientId: string): Promise<Upload[]> {
  return db.select().from(uploads).where(eq(uploads.clientId, clientId)).orderBy(asc(uploads.createdAt));
}

/** Links a clip to the attempt analyzed from it, once; false when it was linked already. */
export async function setUploadAttempt(db: DbOrTx, uploadId: string, attemptId: string): Promise<boolean> {
  const linked = await db
    .update(uploads)
    .set({ attemptId })
    .where(and(eq(uploads.id, uploadId), isNull(uploads.attemptId)))
    .returning({ id: uploads.id });
  return linked.length === 1;
}

/**
 * Whether a clip's attempt counts towards the grade: kept (by this user, now) or not kept. The grade proposal rests
 * on the kept attempts of a motion when there are any (db/queries/attempts.ts `recentAttempts`).
 */
export async function setClipAttemptKept(db: DbOrTx, attemptId: string, keptByUserId: string | null): Promise<void> {
  await db
    .update(attempts)
    .set(keptByUserId ? { keptAt: new Date(), keptByUserId } : { keptAt: null, keptByUserId: null })
    .where(eq(attempts.id, attemptId));
}

/** The attempt analyzed from a clip, with the clip's client and clinic checked. */
export async function getClipAttempt(db: DbOrTx, upload: Pick<Upload, "attemptId" | "clinicId" | "clientId">) {
  if (!upload.attemptId) return null;
  const [row] = await db
    .select()
    .from(attempts)
    .where(and(eq(attempts.id, upload.attemptId), eq(attempts.clinicId, upload.clinicId), eq(attempts.clientId, upload.clientId)));
  return row ?? null;
}

/** The headline numbers of the attempts measured from a page of clips, by attempt id. */
export async function clipAttemptSummaries(db: DbOrTx, clinicId: string, attemptIds: readonly string[]) {
  if (attemptIds.length === 0) return new Map<string, { peakDeg: number | null; uncertaintyDeg: number | null; reps: number; kept: boolean }>();
  const rows = await db
    .select({ id: attempts.id, peakDeg: attempts.peakDeg, uncertaintyDeg: attempts.uncertaintyDeg, reps: attempts.reps, keptAt: attempts.keptAt })
    .from(attempts)
    .where(and(eq(attempts.clinicId, clinicId), inArray(attempts.id, [...attemptIds])));
  return new Map(rows.map((r) => [r.id, { peakDeg: r.peakDeg, uncertaintyDeg: r.uncertaintyDeg, reps: r.reps, kept: r.keptAt !== null }]));
}
