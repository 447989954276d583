/**
 * A clip's measurement saved through the captures path (lib/captures/save.ts) against a real libSQL database
 * (tests/integration/support.ts): linked to its clip in the same transaction, once, and refused with the field named
 * when it does not fit the clip.
 */
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createUpload } from "@/db/queries/uploads";
import { attempts, clients, uploads, users } from "@/db/schema";
import { seedDemo, type SeedResult } from "@/db/seed/demo";
import { AccessError, actorForUser, type Actor } from "@/lib/auth/guard";
import { saveCapture } from "@/lib/captures/save";
import { BadRequest } from "@/lib/http";
import { buildSyntheticCapture, type SyntheticCaptureSpec } from "@/vision/testing/synthetic-hand";
import { tempDatabase, type TempDb } from "@/tests/integration/support";
import { clipCaptureUid } from "./clip-target";

let t: TempDb;
let seed: SeedResult;
let therapist: Actor;

// The synthetic hand (vision/testing) bends the index PIP joint to a known 80 degrees twice, as a client's clip would.
const SPEC: SyntheticCaptureSpec = {
  motion: "pip.flexion",
  side: "right",
  digit: "index",
  condition: "gravity_minimized",
  placement: { forearmDistal: [0, -1, 0], forearmRadial: [1, 0, 0], wrist: [0, 0.1, 0.45] },
  reps: [{ peakDeg: 80 }, { peakDeg: 80 }],
  seed: 11,
};

async function clientRow(key: string) {
  const [row] = await t.db.select().from(clients).where(eq(clients.id, seed.clientIds![key]));
  return row;
}

async function clip(clientKey: string, overrides: Partial<typeof uploads.$inferInsert> = {}) {
  const client = await clientRow(clientKey);
  const uploadUid = randomUUID();
  return createUpload(t.db, {
    uploadUid,
    clinicId: client.clinicId,
    clientId: client.id,
    kind: "clip",
    mediaType: "video/webm",
    extension: "webm",
    originalName: "pip.webm",
    bytes: 1000,
    sha256: "0".repeat(64),
    storageKey: `${client.clinicId}/${client.id}/${uploadUid}.webm`,
    motion: "pip.flexion",
    side: "right",
    digit: "index",
    uploadedByRole: "client",
    ...overrides,
  });
}

function body(upload: { id: string; uploadUid: string; clientId: string }, captureOverrides: Partial<SyntheticCaptureSpec> = {}, extra: Record<string, unknown> = {}) {
  return { captureUid: clipCaptureUid(upload.uploadUid), source: "upload", clientId: upload.clientId, uploadId: upload.id, capture: buildSyntheticCapture({ ...SPEC, ...captureOverrides }), ...extra };
}

/** The refusal's status and the fields it names. */
async function refusal(run: Promise<unknown>): Promise<{ status: number; fields: string[] }> {
  try {
    await run;
  } catch (error) {
    if (error instanceof BadRequest) return { status: 400, fields: Object.keys(error.fields) };
    if (error instanceof AccessError) return { status: error.status, fields: [] };
    if (error instanceof Error && error.name === "ZodError") return { status: 400, fields: (error as unknown as { issues: { path: string[] }[] }).issues.map((i) => i.path.join(".")) };
    throw error;
  }
  throw new Error("accepted");
}

beforeAll(async () => {
  t = await tempDatabase();
  seed = await seedDemo(t.db, new Date("2026-12-01T09:00:00Z"));
  const [u] = await t.db.select().from(users).where(eq(users.email, "therapist@kinarc.test"));
  therapist = (await actorForUser(t.db, u.id))!;
});
afterAll(() => t?.close());

describe("a clip's measurement saved as an attempt", () => {
  it("stores the server's own analysis as an uploaded-clip attempt and links the clip to it", async () => {
    const upload = await clip("dorian");
    const saved = await saveCapture(t.db, therapist, await clientRow("dorian"), body(upload));
    expect(saved.created).toBe(true);
    expect(saved.attempt).toMatchObject({ source: "upload", motion: "pip.flexion", digit: "index", reps: 2 });
    // Exact landmarks bent to 80 degrees: the engine's peak lies within its stated uncertainty of it.
    expect(Math.abs(saved.attempt.peakDeg! - 80)).toBeLessThanOrEqual(saved.attempt.uncertaintyDeg!);
    const [linked] = await t.db.select().from(uploads).where(eq(uploads.id, upload.id));
    expect(linked.attemptId).toBe(saved.attempt.id);

    // The same clip measured again by another browser, under the clip's one capture id: the same attempt, not a second.
    const again = await saveCapture(t.db, therapist, await clientRow("dorian"), body(upload, { seed: 12 }));
    expect(again).toMatchObject({ created: false, attempt: { id: saved.attempt.id } });
    expect(await t.db.select().from(attempts).where(eq(attempts.captureUid, clipCaptureUid(upload.uploadUid)))).toHaveLength(1);
    // Under another capture id it is refused, naming the upload id: one clip is one attempt.
    expect(await refusal(saveCapture(t.db, therapist, await clientRow("dorian"), body(upload, {}, { captureUid: `other-${randomUUID()}` })))).toEqual({ status: 400, fields: ["uploadId"] });
  });

  it("refuses a measurement that does not fit its clip, naming the field, and stores nothing", async () => {
    const before = (await t.db.select().from(attempts)).length;
    const upload = await clip("dorian");
    const dorian = await clientRow("dorian");
    expect(await refusal(saveCapture(t.db, therapist, dorian, body(upload, { digit: "middle" })))).toEqual({ status: 400, fields: ["capture.digit"] });
    expect(await refusal(saveCapture(t.db, therapist, dorian, body(upload, { side: "left" })))).toEqual({ status: 400, fields: ["capture.side"] });
    expect(await refusal(saveCapture(t.db, therapist, dorian, body(upload, { motion: "dip.flexion" })))).toEqual({ status: 400, fields: ["capture.motion"] });
    const document = await clip("dorian", { kind: "document", mediaType: "application/pdf", extension: "pdf", motion: null, side: null, digit: null });
    expect(await refusal(saveCapture(t.db, therapist, dorian, body(document)))).toEqual({ status: 400, fields: ["uploadId"] });
    // Another client's clip looks missing, so upload ids cannot be probed.
    const kofisClip = await clip("kofi");
    expect(await refusal(saveCapture(t.db, therapist, dorian, { ...body(kofisClip), clientId: dorian.id }))).toEqual({ status: 404, fields: [] });
    // An upload id belongs only with an uploaded clip's measurement.
    expect(await refusal(saveCapture(t.db, therapist, dorian, body(upload, {}, { source: "self_check" })))).toEqual({ status: 400, fields: ["uploadId"] });
    expect((await t.db.select().from(attempts)).length).toBe(before);
    const [untouched] = await t.db.select().from(uploads).where(eq(uploads.id, upload.id));
    expect(untouched.attemptId).toBeNull();
  });
});
