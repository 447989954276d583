/**
 * Server side of saving an attempt: the capture is validated with the measurement engine's schema and analyzed again
 * here with the same engine, so no number the browser computed is ever stored. Server-only (node:zlib, node:crypto).
 */
import { createHash } from "node:crypto";
import { gzipSync } from "node:zlib";
import { and, eq } from "drizzle-orm";
import type { Database } from "@/db";
import { getAttemptByCaptureUid, insertAttemptWithCapture } from "@/db/queries/captures";
import { visits, type Attempt, type Client } from "@/db/schema";
import { auditActorEvent } from "@/lib/audit";
import { AccessError, NOT_FOUND, type Actor } from "@/lib/auth/guard";
import { CaptureFormatError, parseCapture } from "@/lib/capture/parse";
import { BadRequest } from "@/lib/http";
import { checkPracticeMatches, joinPracticeSession, requirePracticeItem } from "@/lib/practice/sessions";
import { linkClipAttempt, requireClipForCapture } from "@/lib/uploads/clip-attempt";
import { analyzeCaptureFile } from "@/vision/model-pair";
import { measuredColumns } from "./columns";
import { captureUploadSchema, type CaptureSaveResponse, type StoredAttempt } from "./upload";

/**
 * Stored with every attempt so a later engine can tell which analysis produced its numbers. The engine has no version
 * constant of its own yet; this names the capture format and the analysis generation (the correction has its own,
 * stored beside it). analysis-2: a repetition's hold plateau is found over half a second of time, not 15 frames, so a
 * capture at fewer than 30 frames a second no longer reads its peaks low (vision/reps.ts). analysis-3: the rest
 * before the first repetition is a third of a second of the capture's frames, not 10 samples. analysis-4: the resting
 * angle follows drift with the same time constants at any frame rate, and a repetition's start angle comes from the
 * last two thirds of a second of rest, not the last 20 samples (identical at 30 frames a second). analysis-5: a frame
 * whose hand the picture shows side-on takes the radial or ulnar view from the picture, not from the 3-D axes
 * (vision/correction-views.ts viewOfHand), so its correction and its uncertainty come from that view's cells.
 * analysis-6: only where the picture contradicts the 3-D view (a face or an edge); oblique and from-above frames keep
 * their 3-D view (analysis-5 turned an open hand seen obliquely from the back into a side view). analysis-7: the
 * finger estimator's view fit is chosen by that same view too, not by the 3-D axes (vision/estimator.ts
 * estimateFingerJointDeg), so a thumb-side frame is read by the thumb-side fit. analysis-8: angles as analysis-7; a
 * thumb-side finger or wrist capture whose hand at the start filled the picture outside the set-up check's band
 * carries a warning (vision/analyze-capture.ts framingWarning; an upload, which no set-up check held). analysis-9:
 * angles as analysis-8; a reading by both hand models states framing once (judged on both models' start frames) and
 * the test plane once (the combined reading's), and a finger tested on its own once (the wider-interval model's),
 * where analysis-8 could repeat each model's own note; a finger bent alone in a view where held-out one-finger clips
 * measured that finger states its own interval (vision/uncertainty.ts FingerAloneCell.byDigit).
 */
export const ENGINE_VERSION = "kinarc-engine/capture-v1/analysis-9";

/**
 * A visit accepts attempts while it runs, and for a while after it ends: an attempt recorded near the end may reach
 * the server late from the browser's outbox after a dropped connection, and must not be lost.
 */
const VISIT_LATE_UPLOAD_MS = 12 * 60 * 60_000;

export class CaptureConflict extends Error {}

export function attemptJson(a: Attempt): StoredAttempt {
  return {
    id: a.id,
    captureUid: a.captureUid,
    clientId: a.clientId,
    source: a.source,
    visitId: a.visitId,
    practiceSessionId: a.practiceSessionId,
    motion: a.motion,
    side: a.side,
    digit: a.digit,
    condition: a.condition,
    recordedAt: a.recordedAt.toISOString(),
    frames: a.frames,
    usableFrames: a.usableFrames,
    reps: a.reps,
    startDeg: a.startDeg,
    peakDeg: a.peakDeg,
    arcDeg: a.arcDeg,
    planeVerdict: a.planeVerdict,
    planeVerified: a.planeVerified,
    axisToGravityDeg: a.axisToGravityDeg,
    uncertaintyDeg: a.uncertaintyDeg,
    method: a.method,
    cameraView: a.cameraView,
    viewQuality: a.viewQuality,
    forearmSource: a.forearmSource,
    oneFinger: a.oneFinger,
    engineVersion: a.engineVersion,
    correctionVersion: a.correctionVersion,
    warnings: a.warnings,
  };
}

function existingFor(found: Attempt, client: Client): CaptureSaveResponse {
  // The same id under another client is a client-side bug or a guess: never reveal or merge the other attempt.
  if (found.clientId !== client.id) throw new CaptureConflict("This capture id is already used by another attempt; record the attempt again.");
  return { attempt: attemptJson(found), created: false };
}

async function checkVisit(db: Database, client: Client, visitId: string, now: Date): Promise<void> {
  const [visit] = await db
    .select()
    .from(visits)
    .where(and(eq(visits.id, visitId), eq(visits.clinicId, client.clinicId), eq(visits.clientId, client.id)));
  // Someone else's visit answers like a missing one, so visit ids cannot be probed.
  if (!visit) throw new AccessError(404, "No such visit for this client.");
  if (visit.status === "waiting" || visit.status === "in_progress") return;
  if (visit.status === "finished" && visit.endedAt && now.getTime() - visit.endedAt.getTime() <= VISIT_LATE_UPLOAD_MS) return;
  throw new BadRequest(`This visit is ${visit.status.replace("_", " ")}; attempts can be added only while it is open.`, { visitId: "expected an open visit" });
}

/**
 * Validates, re-analyzes and stores one attempt. `client` must already have passed the access guard
 * (`requireClientRecord`) for `actor`. A capture id seen before returns the stored attempt (`created: false`).
 */
export function saveCapture(db: Database, actor: Actor, client: Client, rawBody: unknown, options: SaveOptions = {}): Promise<CaptureSaveResponse> {
  // Concurrent writers in one process take turns in db/serialize.ts; the unique capture id guards across processes.
  return saveNow(db, actor, client, rawBody, options);
}

interface SaveOptions {
  address?: string | null;
  now?: Date;
}

async function saveNow(db: Database, actor: Actor, client: Client, rawBody: unknown, options: SaveOptions): Promise<CaptureSaveResponse> {
  const now = options.now ?? new Date();
  const body = captureUploadSchema.parse(rawBody);
  if (body.clientId !== client.id) throw new AccessError(404, NOT_FOUND);

  const earlier = await getAttemptByCaptureUid(db, body.captureUid);
  if (earlier) return existingFor(earlier, client);

  let capture;
  try {
    capture = parseCapture(body.capture, "capture");
  } catch (error) {
    if (error instanceof CaptureFormatError) {
      const field = error.field ? `capture.${error.field}` : "capture";
      throw new BadRequest(`The capture file is not valid: ${error.message}`, { [field]: error.message.replace(/^capture: /, "") });
    }
    throw error;
  }
  if (body.visitId) await checkVisit(db, client, body.visitId, now);

  const practiceItem = body.practiceItemId ? await requirePracticeItem(db, client, body.practiceItemId) : null;
  const clip = body.uploadId ? await requireClipForCapture(db, client, body.uploadId, capture) : null;

  const analysis = analyzeCaptureFile(capture);
  if (practiceItem) checkPracticeMatches(practiceItem, analysis);
  const recordedAt = new Date(body.recordedAt ?? now.getTime());
  const json = JSON.stringify(capture);
  const stored = { gzip: gzipSync(json), sha256: createHash("sha256").update(json).digest("hex"), bytes: Buffer.byteLength(json) };

  try {
    const attempt = await db.transaction(async (tx) => {
      const practiceSessionId = practiceItem ? await joinPracticeSession(tx, client, practiceItem, body.practiceSessionId!, recordedAt) : null;
      const created = await insertAttemptWithCapture(
        tx,
        {
          captureUid: body.captureUid,
          clinicId: client.clinicId,
          clientId: client.id,
          source: body.source,
          visitId: body.visitId ?? null,
          practiceSessionId,
          recordedByUserId: actor.userId,
          recordedAt,
          ...measuredColumns(analysis, ENGINE_VERSION),
        },
        stored,
      );
      if (clip) await linkClipAttempt(tx, clip.id, created.id);
      await auditActorEvent(tx, actor, {
        action: "attempt.create",
        clinicId: client.clinicId,
        subjectType: "attempt",
        subjectId: created.id,
        clientId: client.id,
        address: options.address ?? null,
        detail: { source: body.source, motion: created.motion, side: created.side, digit: created.digit, visitId: created.visitId, practiceSessionId, uploadId: clip?.id ?? null, captureBytes: stored.bytes },
      });
      return created;
    });
    return { attempt: attemptJson(attempt), created: true };
  } catch (error) {
    // Two deliveries of one capture raced: the loser finds the winner's row.
    const raced = await getAttemptByCaptureUid(db, body.captureUid);
    if (raced) return existingFor(raced, client);
    throw error;
  }
}
