import { createHash } from "node:crypto";
import type { Database } from "@/db";
import { createUpload, getUploadByUid } from "@/db/queries/uploads";
import type { Client, Upload } from "@/db/schema";
import { auditActorEvent } from "@/lib/audit";
import type { Actor } from "@/lib/auth/guard";
import type { BlobStore } from "@/lib/storage";
import type { UploadFields } from "@/lib/validation/upload";
import { inspectUpload, RefusedUpload } from "./content";

export class UploadConflict extends Error {}

export function uploadStorageKey(u: { clinicId: string; clientId: string; uploadUid: string; extension: string }): string {
  // Derived from the browser's upload id, not random: a retry after a crash between storing and recording writes the
  // same object again instead of leaving an orphan beside a second copy.
  return `${u.clinicId}/${u.clientId}/${u.uploadUid}.${u.extension}`;
}

export interface SavedUpload {
  upload: Upload;
  created: boolean;
}

/**
 * Stores one uploaded file for a client the caller may see (checked by the caller with requireClientRecord).
 * Idempotent by `uploadUid`: the same file sent again (a retry after a dropped connection or a restart) is stored
 * once; a different file under a used id is a conflict. The bytes are stored first, then the row and its audit event
 * commit together, so a row never points at a missing object.
 */
export async function saveUpload(
  db: Database,
  store: BlobStore,
  actor: Actor,
  client: Client,
  fields: UploadFields,
  file: { name: string; bytes: Uint8Array },
  opts: { address?: string | null } = {},
): Promise<SavedUpload> {
  const sha256 = createHash("sha256").update(file.bytes).digest("hex");
  const existing = await getUploadByUid(db, fields.uploadUid);
  if (existing) return sameOrConflict(existing, client, sha256);
  const content = await inspectUpload(fields.kind, file.bytes, file.name);
  const storageKey = uploadStorageKey({ clinicId: client.clinicId, clientId: client.id, uploadUid: fields.uploadUid, extension: content.extension });
  await store.put(storageKey, file.bytes, content.mediaType);
  try {
    const upload = await db.transaction(async (tx) => {
      const row = await createUpload(tx, {
        uploadUid: fields.uploadUid,
        clinicId: client.clinicId,
        clientId: client.id,
        kind: fields.kind,
        mediaType: content.mediaType,
        extension: content.extension,
        originalName: file.name.slice(0, 200),
        bytes: file.bytes.byteLength,
        sha256,
        storageKey,
        note: fields.note,
        motion: fields.kind === "clip" ? (fields.motion ?? null) : null,
        side: fields.kind === "clip" ? (fields.side ?? null) : null,
        digit: fields.kind === "clip" ? (fields.digit ?? null) : null,
        uploadedByUserId: actor.userId,
        uploadedByRole: actor.role,
      });
      await auditActorEvent(tx, actor, {
        action: "upload.create",
        clinicId: client.clinicId,
        subjectType: "upload",
        subjectId: row.id,
        clientId: client.id,
        address: opts.address ?? null,
        detail: { kind: row.kind, mediaType: row.mediaType, bytes: row.bytes, sha256 },
      });
      return row;
    });
    return { upload, created: true };
  } catch (error) {
    // Two copies of one retry raced: the loser finds the winner's row (same key, same bytes) and answers with it.
    const raced = await getUploadByUid(db, fields.uploadUid);
    if (raced) return sameOrConflict(raced, client, sha256);
    throw error;
  }
}

function sameOrConflict(existing: Upload, client: Client, sha256: string): SavedUpload {
  if (existing.clientId !== client.id || existing.sha256 !== sha256) {
    throw new UploadConflict("This upload id was already used for a different file; choose the file again to send it as a new upload.");
  }
  return { upload: existing, created: false };
}

export { RefusedUpload };

export function uploadJson(u: Upload) {
  return {
    id: u.id,
    uploadUid: u.uploadUid,
    clientId: u.clientId,
    kind: u.kind,
    mediaType: u.mediaType,
    originalName: u.originalName,
    bytes: u.bytes,
    sha256: u.sha256,
    note: u.note,
    motion: u.motion,
    side: u.side,
    digit: u.digit,
    attemptId: u.attemptId,
    uploadedByRole: u.uploadedByRole,
    createdAt: u.createdAt.toISOString(),
    reviewedAt: u.reviewedAt?.toISOString() ?? null,
    downloadUrl: `/api/v1/uploads/${u.id}/file`,
  };
}
