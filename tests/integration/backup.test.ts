import { existsSync, mkdtempSync, rmSync, truncateSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { count, getTableName, is, sql } from "drizzle-orm";
import { SQLiteTable } from "drizzle-orm/sqlite-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openDatabase, type Database } from "@/db";
import { listAuditEvents } from "@/db/queries/audit";
import { listClients } from "@/db/queries/clients";
import * as schema from "@/db/schema";
import { seedDemo, type SeedResult } from "@/db/seed/demo";
import { backupDatabase, BackupError, restoreDatabase } from "@/lib/backup";
import { recordAudit } from "@/lib/audit";
import { tempDatabase, type TempDb } from "./support";

let t: TempDb;
let seed: SeedResult;
let dir: string;

const TABLES = (Object.values(schema) as unknown[]).filter((v): v is SQLiteTable => is(v, SQLiteTable));

/** The same questions asked of two databases: row counts of every table, a client list, an audit page, the schema. */
async function answers(db: Database) {
  const counts: Record<string, number> = {};
  for (const table of TABLES) counts[getTableName(table)] = (await db.select({ n: count() }).from(table))[0].n;
  return {
    counts,
    clients: await listClients(db, seed.clinicId!, { sort: "name", dir: "asc", page: 1, pageSize: 100 }),
    audit: await listAuditEvents(db, seed.clinicId!, { page: 1, pageSize: 50 }),
    schema: await db.all(sql`select type, name, sql from sqlite_master where name not like 'sqlite_%' order by name`),
  };
}

beforeAll(async () => {
  t = await tempDatabase();
  seed = await seedDemo(t.db, new Date("2026-12-01T09:00:00Z"));
  dir = mkdtempSync(path.join(os.tmpdir(), "kinarc-backup-"));
});
afterAll(() => {
  t?.close();
  rmSync(dir, { recursive: true, force: true });
});

describe("db:backup and restore", () => {
  it("backs up a database in use and restores one that answers the same queries", async () => {
    // Writes go on while the backup runs (online backup): the copy is a consistent snapshot either way.
    const writer = (async () => {
      for (let i = 0; i < 20; i++) await recordAudit(t.db, { action: "test.concurrent_write", clinicId: seed.clinicId, detail: { i } });
    })();
    const backup = await backupDatabase(t.url, path.join(dir, "kinarc-1.db"));
    await writer;
    expect(backup.sha256).toMatch(/^[0-9a-f]{64}$/);
    // A consistent snapshot holds a prefix of the writes made in order: events 0..n-1, none missing in between.
    const snap = openDatabase(`file:${backup.file}`);
    const seen = (await snap.db.select({ detail: schema.auditEvents.detail }).from(schema.auditEvents).where(sql`action = 'test.concurrent_write'`))
      .map((r) => (r.detail as { i: number }).i)
      .sort((a, b) => a - b);
    snap.client.close();
    expect(seen).toEqual(Array.from({ length: seen.length }, (_, i) => i));

    // A second, quiet backup is compared with the live database after restoring it elsewhere.
    const quiet = await backupDatabase(t.url, path.join(dir, "kinarc-2.db"));
    const target = `file:${path.join(dir, "restored", "kinarc.db")}`;
    await restoreDatabase(quiet.file, target, { expectSha256: quiet.sha256 });
    const restored = openDatabase(target);
    try {
      const live = await answers(t.db);
      const back = await answers(restored.db);
      expect(back).toEqual(live);
      expect(live.counts.clients).toBe(10);
      expect(live.counts.audit_events).toBeGreaterThanOrEqual(20);
    } finally {
      restored.client.close();
    }
  });

  it("refuses to overwrite without --force, a damaged backup, a changed checksum and a file that is not Kinarc's", async () => {
    const good = await backupDatabase(t.url, path.join(dir, "kinarc-3.db"));
    const target = `file:${path.join(dir, "restored-2", "kinarc.db")}`;
    await restoreDatabase(good.file, target);
    await expect(restoreDatabase(good.file, target)).rejects.toThrow(/pass --force/);
    await expect(restoreDatabase(good.file, target, { force: true, expectSha256: "0".repeat(64) })).rejects.toThrow(/changed since it was made/);
    await restoreDatabase(good.file, target, { force: true });

    const damaged = path.join(dir, "damaged.db");
    await backupDatabase(t.url, damaged);
    truncateSync(damaged, 8192);
    await expect(restoreDatabase(damaged, `file:${path.join(dir, "x", "k.db")}`)).rejects.toBeInstanceOf(BackupError);
    expect(existsSync(path.join(dir, "x", "k.db"))).toBe(false);

    const stranger = path.join(dir, "stranger.db");
    const { client } = openDatabase(`file:${stranger}`);
    await client.execute("create table notes (t text)");
    client.close();
    await expect(restoreDatabase(stranger, `file:${path.join(dir, "y", "k.db")}`)).rejects.toThrow(/not a Kinarc database/);
    await expect(backupDatabase(t.url, good.file)).rejects.toThrow(/already exists/);
  });
});
