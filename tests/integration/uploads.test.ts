import { createHash, randomUUID } from "node:crypto";
import { mkdtempSync, readdirSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, count, eq } from "drizzle-orm";
import { fileTypeFromBuffer } from "file-type";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { auditEvents, clients, clinics, uploads, users } from "@/db/schema";
import { seedDemo, type SeedResult } from "@/db/seed/demo";
import { AccessError, actorForUser, requireClientRecord, type Actor } from "@/lib/auth/guard";
import { DiskStore, type BlobStore } from "@/lib/storage";
import { requireUpload } from "@/lib/uploads/access";
import { inspectUpload, RefusedUpload, UPLOAD_RULES } from "@/lib/uploads/content";
import { saveUpload, UploadConflict, uploadStorageKey } from "@/lib/uploads/save";
import { uploadFieldsSchema } from "@/lib/validation/upload";
import { actorByEmail as actorByEmailIn, tempDatabase, type TempDb } from "./support";
import { mp4Bytes, pdfBytes, pngBytes, webmBytes } from "./upload-fixtures";

let t: TempDb;
let seed: SeedResult;
let root: string;
let store: BlobStore;
let dorian: Actor;
let therapist: Actor;

const actorByEmail = (email: string) => actorByEmailIn(t.db, email);

function clipFields(clientId: string, uploadUid = randomUUID()) {
  return uploadFieldsSchema.parse({ clientId, uploadUid, kind: "clip", motion: "wrist.flexion", side: "right", note: "" });
}

beforeAll(async () => {
  t = await tempDatabase();
  seed = await seedDemo(t.db, new Date("2026-12-01T09:00:00Z"));
  root = mkdtempSync(path.join(os.tmpdir(), "kinarc-uploads-"));
  store = new DiskStore(root);
  dorian = await actorByEmail("client@kinarc.test");
  therapist = await actorByEmail("therapist@kinarc.test");
});
afterAll(() => {
  t?.close();
  rmSync(root, { recursive: true, force: true });
});

describe("content checks", () => {
  it("agrees with file-type (registry) on the fixtures built from the published formats", async () => {
    expect((await fileTypeFromBuffer(webmBytes()))?.mime).toBe("video/webm");
    expect((await fileTypeFromBuffer(mp4Bytes()))?.mime).toBe("video/mp4");
    expect((await fileTypeFromBuffer(await pdfBytes()))?.mime).toBe("application/pdf");
    expect((await fileTypeFromBuffer(pngBytes()))?.mime).toBe("image/png");
  });

  it("accepts WebM and MP4 clips and PDF or PNG documents by content", async () => {
    expect(await inspectUpload("clip", webmBytes(), "wrist.webm")).toEqual({ mediaType: "video/webm", extension: "webm" });
    expect(await inspectUpload("clip", mp4Bytes(), "any-name.bin")).toEqual({ mediaType: "video/mp4", extension: "mp4" });
    expect(await inspectUpload("document", await pdfBytes(), "referral")).toEqual({ mediaType: "application/pdf", extension: "pdf" });
    expect(await inspectUpload("document", pngBytes(), "photo.png")).toEqual({ mediaType: "image/png", extension: "png" });
  });

  it("refuses a PDF renamed to .webm as a clip, saying what it really is and what is expected", async () => {
    const refusal = await inspectUpload("clip", await pdfBytes(), "my-wrist.webm").catch((e: unknown) => e);
    expect(refusal).toBeInstanceOf(RefusedUpload);
    expect((refusal as RefusedUpload).status).toBe(415);
    expect((refusal as RefusedUpload).message).toBe('"my-wrist.webm" was refused: its content is a PDF document, whatever its name says. Expected a WebM or MP4 video.');
  });

  it("refuses plain text named .mp4, an empty file and a file over the stated limit", async () => {
    await expect(inspectUpload("clip", new TextEncoder().encode("just some words, not a video"), "clip.mp4")).rejects.toThrow(/not a kind of file Kinarc recognises/);
    await expect(inspectUpload("document", new Uint8Array(0), "empty.pdf")).rejects.toThrow(/is empty/);
    const big = new Uint8Array(UPLOAD_RULES.document.maxBytes + 1);
    big.set(await pdfBytes());
    const tooBig = (await inspectUpload("document", big, "scan.pdf").catch((e: unknown) => e)) as RefusedUpload;
    expect(tooBig.status).toBe(413);
    expect(tooBig.message).toMatch(/limit for a document is 15 MB/);
  });

  it("names the missing field of a clip's form", () => {
    const r = uploadFieldsSchema.safeParse({ clientId: randomUUID(), uploadUid: "nope", kind: "clip", motion: "", side: "" });
    expect(r.success).toBe(false);
    const paths = r.error!.issues.map((i) => i.path.join("."));
    expect(paths).toContain("uploadUid");
  });
});

describe("saving uploads", () => {
  it("stores the bytes with their SHA-256 and an audit event, and a retry of the same upload is stored once", async () => {
    const client = await requireClientRecord(dorian, seed.clientIds!.dorian, { db: t.db });
    const bytes = webmBytes(20_000);
    const fields = clipFields(client.id);
    const first = await saveUpload(t.db, store, dorian, client, fields, { name: "flexion.webm", bytes });
    expect(first.created).toBe(true);
    expect(first.upload.sha256).toBe(createHash("sha256").update(bytes).digest("hex"));
    expect(Buffer.compare(await store.get(first.upload.storageKey), Buffer.from(bytes))).toBe(0);
    const again = await saveUpload(t.db, store, dorian, client, fields, { name: "flexion.webm", bytes });
    expect(again).toEqual({ upload: first.upload, created: false });
    expect((await t.db.select({ n: count() }).from(uploads).where(eq(uploads.uploadUid, fields.uploadUid)))[0].n).toBe(1);
    expect(readdirSync(path.join(root, client.clinicId, client.id)).filter((f) => f.startsWith(fields.uploadUid))).toHaveLength(1);
    const audited = await t.db.select().from(auditEvents).where(and(eq(auditEvents.action, "upload.create"), eq(auditEvents.subjectId, first.upload.id)));
    expect(audited).toHaveLength(1);
  });

  it("a crash after the bytes were stored but before the row: the retry stores one object and one row", async () => {
    const client = await requireClientRecord(dorian, seed.clientIds!.dorian, { db: t.db });
    const bytes = mp4Bytes(5000);
    const fields = clipFields(client.id);
    // The first attempt got as far as the store, then the server stopped.
    await store.put(uploadStorageKey({ clinicId: client.clinicId, clientId: client.id, uploadUid: fields.uploadUid, extension: "mp4" }), bytes, "video/mp4");
    const saved = await saveUpload(t.db, store, dorian, client, fields, { name: "retry.mp4", bytes });
    expect(saved.created).toBe(true);
    expect(readdirSync(path.join(root, client.clinicId, client.id)).filter((f) => f.startsWith(fields.uploadUid))).toEqual([`${fields.uploadUid}.mp4`]);
  });

  it("refuses other bytes under a used upload id, and stores nothing for a refused file", async () => {
    const client = await requireClientRecord(dorian, seed.clientIds!.dorian, { db: t.db });
    const fields = clipFields(client.id);
    await saveUpload(t.db, store, dorian, client, fields, { name: "a.webm", bytes: webmBytes(100) });
    await expect(saveUpload(t.db, store, dorian, client, fields, { name: "b.webm", bytes: webmBytes(200) })).rejects.toBeInstanceOf(UploadConflict);
    const before = (await t.db.select({ n: count() }).from(uploads))[0].n;
    await expect(saveUpload(t.db, store, dorian, client, clipFields(client.id), { name: "x.webm", bytes: await pdfBytes() })).rejects.toBeInstanceOf(RefusedUpload);
    expect((await t.db.select({ n: count() }).from(uploads))[0].n).toBe(before);
  });
});

describe("who may open an upload", () => {
  it("the owner and the clinic's therapist may; another client and another clinic see 404; each access is audited", async () => {
    const dorianRecord = await requireClientRecord(therapist, seed.clientIds!.dorian, { db: t.db });
    const { upload } = await saveUpload(t.db, store, therapist, dorianRecord, uploadFieldsSchema.parse({ clientId: dorianRecord.id, uploadUid: randomUUID(), kind: "document" }), {
      name: "referral.pdf",
      bytes: await pdfBytes(),
    });
    expect((await requireUpload(dorian, upload.id, { db: t.db, action: "upload.download" })).id).toBe(upload.id);
    expect((await requireUpload(therapist, upload.id, { db: t.db, action: "upload.download" })).id).toBe(upload.id);
    // Wren as a client account, and a therapist of another clinic.
    const wrenUser = (await t.db.select().from(clients).where(eq(clients.id, seed.clientIds!.wren)))[0].userId!;
    const wren = (await actorForUser(t.db, wrenUser))!;
    const [other] = await t.db.insert(clinics).values({ name: "Northgate Hand Clinic" }).returning();
    const [stranger] = await t.db.insert(users).values({ clinicId: other.id, email: "t@northgate.kinarc.test", role: "therapist" }).returning();
    const strangerActor = (await actorForUser(t.db, stranger.id))!;
    for (const who of [wren, strangerActor]) {
      const denied = await requireUpload(who, upload.id, { db: t.db, action: "upload.download" }).catch((e: unknown) => e);
      expect(denied).toBeInstanceOf(AccessError);
      expect((denied as AccessError).status).toBe(404);
    }
    const downloads = await t.db.select().from(auditEvents).where(and(eq(auditEvents.action, "upload.download"), eq(auditEvents.subjectId, upload.id)));
    expect(downloads.map((d) => d.actorUserId).sort()).toEqual([dorian.userId, therapist.userId].sort());
  });
});
