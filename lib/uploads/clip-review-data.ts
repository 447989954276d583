/**
 * Loads what the review of one uploaded clip shows: the clip, its stored attempt (the server's own analysis) and the
 * per-frame trace read again from the stored capture. Server-only; the caller has passed `requireUpload`.
 */
import { gunzipSync } from "node:zlib";
import type { Database } from "@/db";
import { getAttemptCapture } from "@/db/queries/captures";
import { getClipAttempt } from "@/db/queries/uploads";
import type { Upload } from "@/db/schema";
import { parseCaptureText } from "@/lib/capture/parse";
import { attemptJson } from "@/lib/captures/save";
import type { StoredAttempt } from "@/lib/captures/upload";
import { clipReviewTrace, type ClipReviewTrace } from "./clip-review";

export interface ClipReviewData {
  attempt: (StoredAttempt & { keptAt: string | null }) | null;
  trace: ClipReviewTrace | null;
}

export async function loadClipReview(db: Database, upload: Upload): Promise<ClipReviewData> {
  const attempt = await getClipAttempt(db, upload);
  if (!attempt) return { attempt: null, trace: null };
  const stored = await getAttemptCapture(db, attempt.id);
  // The stored capture passed the schema when it was saved; parsing again keeps one reader of the format.
  const trace = stored ? clipReviewTrace(parseCaptureText(gunzipSync(stored.gzip).toString("utf8"), `attempt ${attempt.id}`)) : null;
  return { attempt: { ...attemptJson(attempt), keptAt: attempt.keptAt?.toISOString() ?? null }, trace };
}
