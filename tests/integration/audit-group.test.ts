import { count, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { auditEvents, users } from "@/db/schema";
import { seedDemo } from "@/db/seed/demo";
import { recordAuditGrouped } from "@/lib/audit";
import { actorForUser, requireClientRecord, type Actor } from "@/lib/auth/guard";
import { tempDatabase, type TempDb } from "./support";

let t: TempDb;
let therapist: Actor;
let seed: Awaited<ReturnType<typeof seedDemo>>;

beforeAll(async () => {
  t = await tempDatabase();
  seed = await seedDemo(t.db);
  const [u] = await t.db.select().from(users).where(eq(users.email, "therapist@kinarc.test"));
  therapist = (await actorForUser(t.db, u.id))!;
});
afterAll(() => t?.close());

const readsOf = async (clientId: string) =>
  (await t.db.select({ n: count() }).from(auditEvents).where(sql`${auditEvents.action} = 'client.read' and ${auditEvents.clientId} = ${clientId}`))[0].n;

describe("audit events of record reads, committed together", () => {
  it("every one of 40 concurrent reads is on record by the time its call returns", async () => {
    const clientId = seed.clientIds!.dorian;
    const before = await readsOf(clientId);
    const done: number[] = [];
    await Promise.all(
      Array.from({ length: 40 }, async (_, i) => {
        await requireClientRecord(therapist, clientId, { db: t.db, purpose: `group-${i}` });
        // Counted right after this call resolved: its own event must already be committed.
        const rows = await t.db.select({ purpose: sql<string>`json_extract(${auditEvents.detail}, '$.purpose')` }).from(auditEvents).where(sql`json_extract(${auditEvents.detail}, '$.purpose') = ${`group-${i}`}`);
        expect(rows).toHaveLength(1);
        done.push(i);
      }),
    );
    expect(done).toHaveLength(40);
    expect(await readsOf(clientId)).toBe(before + 40);
  });

  it("a failed group commit fails every caller in it (no read answers without its audit event)", async () => {
    const broken = await tempDatabase();
    broken.close();
    const calls = Array.from({ length: 3 }, (_, i) => recordAuditGrouped(broken.db, { action: "test.group", detail: { i } }));
    const results = await Promise.allSettled(calls);
    expect(results.map((r) => r.status)).toEqual(["rejected", "rejected", "rejected"]);
  });

  it("a single read is recorded on its own without waiting for company", async () => {
    const clientId = seed.clientIds!.kofi;
    const before = await readsOf(clientId);
    await requireClientRecord(therapist, clientId, { db: t.db, purpose: "alone" });
    expect(await readsOf(clientId)).toBe(before + 1);
  });
});
