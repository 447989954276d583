import { createHash, randomUUID } from "node:crypto";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, count, eq, getTableName, isNotNull } from "drizzle-orm";
import { strFromU8, unzipSync } from "fflate";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { attempts, auditEvents, clientErasures, clients, consents, gradeEntries, uploads, users, visits } from "@/db/schema";
import { seedDemo, type SeedResult } from "@/db/seed/demo";
import { requireClientRecord, type Actor } from "@/lib/auth/guard";
import { buildClientExport, tablesWithClientId } from "@/lib/export/client-export";
import { eraseClient, ErasureRefused } from "@/lib/export/erase";
import { DiskStore } from "@/lib/storage";
import { saveUpload } from "@/lib/uploads/save";
import { uploadFieldsSchema } from "@/lib/validation/upload";
import { actorByEmail as actorByEmailIn, tempDatabase, type TempDb } from "./support";
import { pdfBytes, webmBytes } from "./upload-fixtures";

let t: TempDb;
let seed: SeedResult;
let root: string;
let store: DiskStore;
let admin: Actor;
let dorian: Actor;

const actorByEmail = (email: string) => actorByEmailIn(t.db, email);

beforeAll(async () => {
  t = await tempDatabase();
  seed = await seedDemo(t.db, new Date("2026-12-01T09:00:00Z"));
  root = mkdtempSync(path.join(os.tmpdir(), "kinarc-export-"));
  store = new DiskStore(root);
  admin = await actorByEmail("admin@kinarc.test");
  dorian = await actorByEmail("client@kinarc.test");
  const record = await requireClientRecord(dorian, seed.clientIds!.dorian, { db: t.db });
  await saveUpload(t.db, store, dorian, record, uploadFieldsSchema.parse({ clientId: record.id, uploadUid: randomUUID(), kind: "clip", motion: "wrist.flexion", side: "right" }), { name: "a.webm", bytes: webmBytes(3000) });
  await saveUpload(t.db, store, dorian, record, uploadFieldsSchema.parse({ clientId: record.id, uploadUid: randomUUID(), kind: "document" }), { name: "letter.pdf", bytes: await pdfBytes() });
});
afterAll(() => {
  t?.close();
  rmSync(root, { recursive: true, force: true });
});

describe("per-client export", () => {
  it("finds every table that names a client from the schema itself", () => {
    const names = tablesWithClientId().map((tbl) => getTableName(tbl));
    for (const expected of ["visits", "attempts", "grade_entries", "uploads", "payments", "audit_events", "consents"]) expect(names).toContain(expected);
  });

  it("is a zip (read back with fflate's unzip) of JSON for every such table and the files, byte-identical by SHA-256", async () => {
    const clientId = seed.clientIds!.dorian;
    const { zip } = await buildClientExport(t.db, store, clientId, new Date("2026-12-02T00:00:00Z"));
    const files = unzipSync(zip);
    const client = JSON.parse(strFromU8(files["kinarc-export/data/client.json"]));
    expect(client[0].familyName).toBe("Vale");
    const account = JSON.parse(strFromU8(files["kinarc-export/data/account.json"]));
    expect(account[0].email).toBe("client@kinarc.test");
    expect(JSON.stringify(account)).not.toMatch(/password/i);
    const exportedUploads = JSON.parse(strFromU8(files["kinarc-export/data/uploads.json"])) as { id: string; extension: string; sha256: string }[];
    expect(exportedUploads).toHaveLength(2);
    for (const u of exportedUploads) {
      const bytes = files[`kinarc-export/files/${u.id}.${u.extension}`];
      expect(createHash("sha256").update(bytes).digest("hex")).toBe(u.sha256);
    }
    const dbAttempts = await t.db.select({ n: count() }).from(attempts).where(eq(attempts.clientId, clientId));
    expect(JSON.parse(strFromU8(files["kinarc-export/data/attempts.json"]))).toHaveLength(dbAttempts[0].n);
    const dbVisits = await t.db.select({ n: count() }).from(visits).where(eq(visits.clientId, clientId));
    expect(JSON.parse(strFromU8(files["kinarc-export/data/visits.json"]))).toHaveLength(dbVisits[0].n);
    // Nothing about another client leaks into the export.
    expect(strFromU8(files["kinarc-export/data/audit_events.json"])).not.toContain(seed.clientIds!.wren);
  });
});

describe("erasure on request", () => {
  it("deletes files, unkept attempts, unsigned drafts and the account; keeps the signed record and the trail without the name", async () => {
    const clientId = seed.clientIds!.dorian;
    const before = {
      signed: (await t.db.select({ n: count() }).from(gradeEntries).where(and(eq(gradeEntries.clientId, clientId), eq(gradeEntries.status, "signed"))))[0].n,
      kept: (await t.db.select({ n: count() }).from(attempts).where(and(eq(attempts.clientId, clientId), isNotNull(attempts.keptAt))))[0].n,
      audit: (await t.db.select({ n: count() }).from(auditEvents).where(eq(auditEvents.clientId, clientId)))[0].n,
      keys: (await t.db.select().from(uploads).where(eq(uploads.clientId, clientId))).map((u) => u.storageKey),
    };
    expect(before.keys).toHaveLength(2);
    const summary = await eraseClient(t.db, store, admin, clientId, { requestedAt: new Date("2026-12-01T00:00:00Z") });
    expect(summary.deleted.uploads).toBe(2);
    expect(summary.deleted.signInAccount).toBe(1);
    expect(summary.kept.grade_entries).toBeGreaterThanOrEqual(before.signed);
    for (const key of before.keys) expect(await store.exists(key)).toBe(false);
    const [row] = await t.db.select().from(clients).where(eq(clients.id, clientId));
    expect(row.givenName).toBe("Erased");
    expect(row.email).toBeNull();
    expect(row.dateOfBirth).toBe("1979-01-01");
    expect(row.diagnosisNote).toBe("");
    expect(await t.db.select().from(users).where(eq(users.email, "client@kinarc.test"))).toHaveLength(0);
    expect((await t.db.select({ n: count() }).from(gradeEntries).where(and(eq(gradeEntries.clientId, clientId), eq(gradeEntries.status, "signed"))))[0].n).toBe(before.signed);
    expect((await t.db.select({ n: count() }).from(gradeEntries).where(and(eq(gradeEntries.clientId, clientId), eq(gradeEntries.status, "awaiting_cosign"))))[0].n).toBe(0);
    expect((await t.db.select({ n: count() }).from(attempts).where(eq(attempts.clientId, clientId)))[0].n).toBe(before.kept);
    // The trail keeps every earlier event and gains the erasure itself.
    expect((await t.db.select({ n: count() }).from(auditEvents).where(eq(auditEvents.clientId, clientId)))[0].n).toBe(before.audit + 1);
    for (const c of await t.db.select().from(consents).where(eq(consents.clientId, clientId))) expect(c.signedName).toBe("(erased on request)");
    const [record] = await t.db.select().from(clientErasures).where(eq(clientErasures.clientId, clientId));
    expect(record.erasedByUserId).toBe(admin.userId);
    await expect(eraseClient(t.db, store, admin, clientId, { requestedAt: new Date() })).rejects.toBeInstanceOf(ErasureRefused);
  });

  it("refuses a client of another clinic as missing", async () => {
    const [other] = await t.db.select().from(clients).where(eq(clients.id, seed.clientIds!.wren));
    const stranger = { ...admin, clinicId: randomUUID() };
    await expect(eraseClient(t.db, store, stranger, other.id, { requestedAt: new Date() })).rejects.toThrow(/No such client/);
  });
});
