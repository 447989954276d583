/**
 * The body of `POST /api/v1/captures`, shared by the browser (outbox) and the server. The capture itself is checked
 * by the measurement engine's own schema (lib/capture) on the server; here it is only carried.
 */
import { z } from "zod";
import type { CaptureFile } from "@/lib/capture/schema";

export const ATTEMPT_SOURCES = ["self_check", "visit", "practice", "upload"] as const;
export type AttemptSource = (typeof ATTEMPT_SOURCES)[number];

/**
 * Largest accepted request body. A 60-second attempt at 30 frames per second is about 1,800 frames of 21 points, some
 * 2.5 MB of JSON; 8 MB leaves room for slower clients' longer attempts without letting one request fill the server.
 */
export const CAPTURE_BODY_LIMIT_BYTES = 8 * 1024 * 1024;

/** The most a capture with both hand models' frames may weigh: room under the limit for the request's other fields. */
export const FULL_MODEL_BUDGET_BYTES = CAPTURE_BODY_LIMIT_BYTES - 256 * 1024;

/** Whether a capture carrying both models' frames stays under FULL_MODEL_BUDGET_BYTES (else one model's is sent). */
export function fitsWithBothModels(capture: CaptureFile): boolean {
  return JSON.stringify(capture).length <= FULL_MODEL_BUDGET_BYTES;
}

// Chosen by the recording browser (crypto.randomUUID or similar); letters, digits, - and _ only so it is safe in logs.
const CAPTURE_UID = /^[A-Za-z0-9_-]{16,64}$/;

export const captureUploadSchema = z
  .object({
    captureUid: z.string({ error: "expected a capture id" }).regex(CAPTURE_UID, { error: "expected 16-64 letters, digits, - or _" }),
    source: z.enum(ATTEMPT_SOURCES, { error: `expected one of ${ATTEMPT_SOURCES.join(", ")}` }),
    clientId: z.uuid({ error: "expected the client's id (a UUID)" }),
    visitId: z.uuid({ error: "expected a visit id (a UUID)" }).optional(),
    /** Practice only: the home program item practised, and the sitting's id (chosen by the browser when it starts). */
    practiceItemId: z.uuid({ error: "expected a home program item id (a UUID)" }).optional(),
    practiceSessionId: z.uuid({ error: "expected a practice session id (a UUID)" }).optional(),
    /** Upload only: the uploaded clip this capture was analyzed from; the attempt is linked to it (the app always sends it). */
    uploadId: z.uuid({ error: "expected the uploaded clip's id (a UUID)" }).optional(),
    /** When the attempt was recorded, UTC milliseconds (the browser's clock); the server's time when absent. */
    recordedAt: z.number({ error: "expected UTC milliseconds" }).int({ error: "expected whole milliseconds" }).positive({ error: "expected UTC milliseconds" }).optional(),
    capture: z.unknown(),
  })
  .superRefine((body, ctx) => {
    if (body.source === "visit" && !body.visitId) ctx.addIssue({ code: "custom", path: ["visitId"], message: 'expected the visit\'s id when source is "visit"' });
    if (body.source !== "visit" && body.visitId) ctx.addIssue({ code: "custom", path: ["visitId"], message: 'expected no visit id unless source is "visit"' });
    if (body.source === "practice" && !body.practiceItemId) ctx.addIssue({ code: "custom", path: ["practiceItemId"], message: 'expected the program item\'s id when source is "practice"' });
    if (body.source === "practice" && !body.practiceSessionId) ctx.addIssue({ code: "custom", path: ["practiceSessionId"], message: 'expected a practice session id when source is "practice"' });
    if (body.source !== "practice" && (body.practiceItemId || body.practiceSessionId))
      ctx.addIssue({ code: "custom", path: [body.practiceItemId ? "practiceItemId" : "practiceSessionId"], message: 'expected no practice ids unless source is "practice"' });
    if (body.source !== "upload" && body.uploadId) ctx.addIssue({ code: "custom", path: ["uploadId"], message: 'expected no upload id unless source is "upload"' });
    if (body.capture === undefined) ctx.addIssue({ code: "custom", path: ["capture"], message: "expected a capture file (format kinarc.capture, version 1)" });
  });

export type CaptureUpload = Omit<z.infer<typeof captureUploadSchema>, "capture"> & { capture: CaptureFile };

/** What the server answers for a stored attempt (201 first time, 200 for a retry of the same capture id). */
export interface StoredAttempt {
  id: string;
  captureUid: string;
  clientId: string;
  source: AttemptSource;
  visitId: string | null;
  practiceSessionId: string | null;
  motion: string;
  side: "left" | "right";
  digit: string | null;
  condition: "against_gravity" | "gravity_minimized";
  recordedAt: string;
  frames: number;
  usableFrames: number;
  reps: number;
  startDeg: number | null;
  peakDeg: number | null;
  arcDeg: number | null;
  /** 90% interval half-width of the angles (vision/uncertainty.ts). */
  uncertaintyDeg: number | null;
  planeVerdict: string;
  planeVerified: boolean;
  axisToGravityDeg: number | null;
  method: string | null;
  cameraView: string | null;
  viewQuality: string | null;
  forearmSource: string | null;
  /** Read as one finger tested on its own, the others held straight. */
  oneFinger: boolean;
  engineVersion: string;
  /** The angle correction applied, e.g. "kinarc-correction-1"; null when the angles are raw. */
  correctionVersion: string | null;
  warnings: string[];
}

export interface CaptureSaveResponse {
  attempt: StoredAttempt;
  /** False when this capture id had been stored before (a retry). */
  created: boolean;
}
