/**
 * Server side of a clip's analysis: the capture a browser made from an uploaded clip is stored as an attempt like any
 * other (lib/captures/save.ts) and linked to the clip, in the same transaction. Server-only.
 */
import type { DbOrTx } from "@/db";
import { getUpload, setUploadAttempt } from "@/db/queries/uploads";
import type { Client, Upload } from "@/db/schema";
import type { CaptureFile } from "@/lib/capture/schema";
import { AccessError } from "@/lib/auth/guard";
import { BadRequest } from "@/lib/http";

/** The client's uploaded clip a capture says it was analyzed from, checked against what the capture declares. */
export async function requireClipForCapture(db: DbOrTx, client: Client, uploadId: string, capture: Pick<CaptureFile, "motion" | "side" | "digit">): Promise<Upload> {
  const upload = await getUpload(db, client.clinicId, uploadId);
  // Another client's clip answers like a missing one, so upload ids cannot be probed.
  if (!upload || upload.clientId !== client.id) throw new AccessError(404, "No such uploaded clip for this client.");
  if (upload.kind !== "clip") throw new BadRequest("Only a clip can be analyzed into an attempt.", { uploadId: "expected an uploaded clip, not a document" });
  if (upload.attemptId) throw new BadRequest("This clip has already been analyzed into an attempt.", { uploadId: "expected a clip not analyzed yet" });
  if (upload.motion && upload.motion !== capture.motion) throw new BadRequest(`The clip was sent as ${upload.motion}, not ${capture.motion}.`, { "capture.motion": `expected ${upload.motion}, as sent with the clip` });
  if (upload.side && upload.side !== capture.side) throw new BadRequest(`The clip was sent as the ${upload.side} side, not the ${capture.side}.`, { "capture.side": `expected ${upload.side}, as sent with the clip` });
  if (upload.digit && upload.digit !== capture.digit) throw new BadRequest(`The clip was sent for the ${upload.digit} digit, not ${capture.digit ?? "none"}.`, { "capture.digit": `expected ${upload.digit}, as sent with the clip` });
  return upload;
}

/** Links the clip to its attempt; inside the transaction that stores the attempt. */
export async function linkClipAttempt(tx: DbOrTx, uploadId: string, attemptId: string): Promise<void> {
  const linked = await setUploadAttempt(tx, uploadId, attemptId);
  // Two analyses of one clip under different capture ids raced: the second must not replace the first.
  if (!linked) throw new BadRequest("This clip has already been analyzed into an attempt.", { uploadId: "expected a clip not analyzed yet" });
}
