import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { listUploads } from "@/db/queries/uploads";
import { auditActorEvent } from "@/lib/audit";
import { requestAddress, requireClientRecord } from "@/lib/auth/guard";
import { BadRequest, route } from "@/lib/http";
import { getStorage } from "@/lib/storage";
import { UPLOAD_ROLES } from "@/lib/uploads/access";
import { describeLimit, RefusedUpload, UPLOAD_BODY_LIMIT_BYTES } from "@/lib/uploads/content";
import { saveUpload, UploadConflict, uploadJson } from "@/lib/uploads/save";
import { uploadFieldsSchema, uploadListQuerySchema } from "@/lib/validation/upload";

/**
 * Receives one file (multipart/form-data: `file` plus the fields of lib/validation/upload.ts). 201 stored, 200 the same
 * upload id and bytes were stored before, 413 too large, 415 content of the wrong type, 409 a used id with other bytes.
 */
export const POST = route(UPLOAD_ROLES, async ({ actor, request }) => {
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > UPLOAD_BODY_LIMIT_BYTES) {
    return NextResponse.json({ error: `The file is too large: a clip may be up to ${describeLimit("clip")}, a document up to ${describeLimit("document")}.` }, { status: 413 });
  }
  let form: FormData;
  try {
    form = await request.formData();
  } catch {
    throw new BadRequest("The request must be multipart/form-data with a file; it was cut off or malformed, so nothing was stored.", { file: "expected a file" });
  }
  const file = form.get("file");
  if (!(file instanceof File)) throw new BadRequest("No file was sent.", { file: "expected a file" });
  const fields = uploadFieldsSchema.parse(Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === "string")));
  const address = requestAddress(request.headers);
  const db = getDb();
  const client = await requireClientRecord(actor, fields.clientId, { db, address, purpose: "upload.create" });
  try {
    const saved = await saveUpload(db, getStorage(), actor, client, fields, { name: file.name || "unnamed", bytes: new Uint8Array(await file.arrayBuffer()) }, { address });
    return NextResponse.json(uploadJson(saved.upload), { status: saved.created ? 201 : 200 });
  } catch (error) {
    if (error instanceof RefusedUpload) return NextResponse.json({ error: error.message, fields: { file: error.message } }, { status: error.status });
    if (error instanceof UploadConflict) return NextResponse.json({ error: error.message, fields: { uploadUid: "expected an id not used before" } }, { status: 409 });
    throw error;
  }
});

/** Lists uploads: a client's own, or for staff the clinic's (optionally one client's). Unreviewed first. */
export const GET = route(UPLOAD_ROLES, async ({ actor, request }) => {
  const query = uploadListQuerySchema.parse(Object.fromEntries(new URL(request.url).searchParams));
  const db = getDb();
  const address = requestAddress(request.headers);
  let clientId = query.clientId;
  if (actor.role === "client") clientId = actor.clientId!;
  if (clientId) await requireClientRecord(actor, clientId, { db, address, purpose: "upload.list" });
  else await auditActorEvent(db, actor, { action: "upload.list", address });
  const rows = await listUploads(db, actor.clinicId, { clientId, kind: query.kind });
  return NextResponse.json({
    rows: rows.map((r) => ({ ...uploadJson(r.upload), clientName: `${r.clientGiven} ${r.clientFamily}`, uploaderName: r.uploaderName })),
  });
});
