import type { Database, DbOrTx } from "@/db";
import { getUpload } from "@/db/queries/uploads";
import type { Upload } from "@/db/schema";
import { auditActorEvent } from "@/lib/audit";
import { AccessError, NOT_FOUND, type Actor } from "@/lib/auth/guard";
import { z } from "zod";

/** Roles that may see and send uploads; the admin reaches a client's files only through the audited export. */
export const UPLOAD_ROLES = ["client", "therapist", "assistant"] as const;
export const UPLOAD_REVIEW_ROLES = ["therapist", "assistant"] as const;

/**
 * Loads an upload the actor may see, or 404 (another clinic's, or another client's for a client account, looks
 * missing). Every access is audited, downloads included.
 */
export async function requireUpload(actor: Actor, uploadId: string, opts: { db: Database; address?: string | null; action: string }): Promise<Upload> {
  if (!z.uuid().safeParse(uploadId).success) throw new AccessError(404, NOT_FOUND);
  const upload = await getUpload(opts.db, actor.clinicId, uploadId);
  if (!upload) throw new AccessError(404, NOT_FOUND);
  if (actor.role === "client" && actor.clientId !== upload.clientId) throw new AccessError(404, NOT_FOUND);
  await auditUpload(opts.db, actor, upload, opts.action, { address: opts.address });
  return upload;
}

/** One audit event about an upload (read, download, review), with its client. */
export async function auditUpload(
  db: DbOrTx,
  actor: Actor,
  upload: Pick<Upload, "id" | "clientId">,
  action: string,
  opts: { address?: string | null; detail?: Record<string, unknown> } = {},
): Promise<void> {
  await auditActorEvent(db, actor, {
    action,
    subjectType: "upload",
    subjectId: upload.id,
    clientId: upload.clientId,
    address: opts.address ?? null,
    detail: opts.detail,
  });
}
