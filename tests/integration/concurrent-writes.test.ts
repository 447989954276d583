import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { createClient } from "@libsql/client";
import { count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { serializeWrites } from "@/db/serialize";
import { auditEvents, clients, users } from "@/db/schema";
import { seedDemo } from "@/db/seed/demo";
import { recordAudit } from "@/lib/audit";
import { actorForUser, type Actor } from "@/lib/auth/guard";
import { createClientFor } from "@/lib/clients";
import { clientInputSchema } from "@/lib/validation/client";
import { tempDatabase, type TempDb } from "./support";

let t: TempDb;
let therapist: Actor;

beforeAll(async () => {
  t = await tempDatabase();
  await seedDemo(t.db);
  const [u] = await t.db.select().from(users).where(eq(users.email, "therapist@kinarc.test"));
  therapist = (await actorForUser(t.db, u.id))!;
});
afterAll(() => t?.close());

describe("concurrent writes in one process (local SQLite file)", () => {
  it("transactions and single writes issued at once all commit, none fails with 'database is locked'", async () => {
    const before = (await t.db.select({ n: count() }).from(clients))[0].n;
    const auditsBefore = (await t.db.select({ n: count() }).from(auditEvents))[0].n;
    const input = (i: number) =>
      clientInputSchema.parse({ givenName: `Nell${i}`, familyName: "Concurrent", dateOfBirth: "1980-01-01", dominantHand: "right", affectedSide: "right" });
    const work: Promise<unknown>[] = [];
    for (let i = 0; i < 8; i++) {
      work.push(createClientFor(t.db, therapist, input(i)));
      work.push(recordAudit(t.db, { action: "test.concurrent", clinicId: therapist.clinicId, detail: { i } }));
      work.push(t.db.select().from(clients).limit(3));
    }
    const results = await Promise.allSettled(work);
    const failures = results.filter((r) => r.status === "rejected").map((r) => String((r as PromiseRejectedResult).reason));
    expect(failures).toEqual([]);
    expect((await t.db.select({ n: count() }).from(clients))[0].n).toBe(before + 8);
    // Each created client writes one audit event in its transaction, plus the eight single writes.
    expect((await t.db.select({ n: count() }).from(auditEvents))[0].n).toBe(auditsBefore + 16);
  });

  it("a statement on the outer client inside a transaction fails with a clear message instead of hanging", async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), "kinarc-serial-"));
    const client = serializeWrites(createClient({ url: `file:${path.join(dir, "x.db")}` }), 300);
    try {
      await client.execute("CREATE TABLE t (x INTEGER)");
      const tx = await client.transaction("write");
      await tx.execute("INSERT INTO t VALUES (1)");
      await expect(client.execute("SELECT count(*) FROM t")).rejects.toThrow(/turn not granted/);
      await tx.commit();
      // The turn passes on after the commit: the outer client works again.
      expect((await client.execute("SELECT count(*) AS n FROM t")).rows[0].n).toBe(1);
    } finally {
      client.close();
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
