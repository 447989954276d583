import { NextResponse } from "next/server";
import { z } from "zod";
import { getDb } from "@/db";
import { requestAddress, requireClientRecord } from "@/lib/auth/guard";
import { PayloadTooLarge, readJsonWithin } from "@/lib/captures/body-limit";
import { CaptureConflict, saveCapture } from "@/lib/captures/save";
import { CAPTURE_BODY_LIMIT_BYTES } from "@/lib/captures/upload";
import { route } from "@/lib/http";

/**
 * Saves one recorded attempt (capture file v1). A client posts only for themselves; therapists and assistants for
 * their clinic's clients. 201 when stored, 200 when the same capture id was stored before, 413 over the size limit.
 */
export const POST = route(["client", "therapist", "assistant"], async ({ actor, request }) => {
  let body: unknown;
  try {
    body = await readJsonWithin(request, CAPTURE_BODY_LIMIT_BYTES);
  } catch (error) {
    if (error instanceof PayloadTooLarge) return NextResponse.json({ error: error.message, limitBytes: error.limitBytes }, { status: 413 });
    throw error;
  }
  const clientId = z.object({ clientId: z.uuid({ error: "expected the client's id (a UUID)" }) }).parse(body).clientId;
  const address = requestAddress(request.headers);
  const db = getDb();
  const client = await requireClientRecord(actor, clientId, { db, address, purpose: "capture.save" });
  try {
    const saved = await saveCapture(db, actor, client, body, { address });
    return NextResponse.json(saved, { status: saved.created ? 201 : 200 });
  } catch (error) {
    if (error instanceof CaptureConflict) return NextResponse.json({ error: error.message, fields: { captureUid: "expected an id not used before" } }, { status: 409 });
    throw error;
  }
});
