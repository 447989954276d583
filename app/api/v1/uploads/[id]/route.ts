import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { markUploadReviewed, setClipAttemptKept } from "@/db/queries/uploads";
import { requestAddress } from "@/lib/auth/guard";
import { BadRequest, readJson, route } from "@/lib/http";
import { auditUpload, requireUpload, UPLOAD_REVIEW_ROLES, UPLOAD_ROLES } from "@/lib/uploads/access";
import { uploadJson } from "@/lib/uploads/save";
import { uploadReviewSchema } from "@/lib/validation/upload";

type Params = { id: string };

export const GET = route<Params>(UPLOAD_ROLES, async ({ actor, request, params }) => {
  const upload = await requireUpload(actor, params.id, { db: getDb(), address: requestAddress(request.headers), action: "upload.read" });
  return NextResponse.json(uploadJson(upload));
});

/**
 * A therapist or assistant marks an upload as reviewed (`{"reviewed": true}`); for an analyzed clip, `"counts": true`
 * keeps its attempt as one that counts towards the grade and `false` un-keeps it.
 */
export const PATCH = route<Params>(UPLOAD_REVIEW_ROLES, async ({ actor, request, params }) => {
  const db = getDb();
  const address = requestAddress(request.headers);
  const upload = await requireUpload(actor, params.id, { db, address, action: "upload.read" });
  const review = uploadReviewSchema.parse(await readJson(request));
  const attemptId = upload.attemptId;
  if (review.counts !== undefined && !attemptId) {
    throw new BadRequest("This upload has no measured attempt yet, so it cannot count towards a grade.", { counts: "expected only for a clip that has been analyzed" });
  }
  await db.transaction(async (tx) => {
    await markUploadReviewed(tx, upload.id, actor.userId);
    if (review.counts !== undefined && attemptId) await setClipAttemptKept(tx, attemptId, review.counts ? actor.userId : null);
    await auditUpload(tx, actor, upload, "upload.review", { address, detail: review.counts === undefined ? undefined : { attemptId, counts: review.counts } });
  });
  const after = await requireUpload(actor, params.id, { db, address, action: "upload.read" });
  return NextResponse.json(uploadJson(after));
});
