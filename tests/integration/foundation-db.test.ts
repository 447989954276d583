import { count, eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { listClients } from "@/db/queries/clients";
import { auditEvents, clients, clinics, users } from "@/db/schema";
import { seedDemo, type SeedResult } from "@/db/seed/demo";
import { actorForUser, requireClientRecord, type Actor } from "@/lib/auth/guard";
import { verifyPassword } from "@/lib/auth/password";
import { checkThrottle, clearAccount, recordFailure, THROTTLE_POLICY } from "@/lib/auth/throttle";
import { createClientFor, updateClientFor } from "@/lib/clients";
import { clientInputSchema } from "@/lib/validation/client";
import { tempDatabase, type TempDb } from "./support";

let t: TempDb;
let seed: SeedResult;
let therapist: Actor;

beforeAll(async () => {
  t = await tempDatabase();
  seed = await seedDemo(t.db, new Date("2026-12-01T09:00:00Z"));
  const [u] = await t.db.select().from(users).where(eq(users.email, "therapist@kinarc.test"));
  therapist = (await actorForUser(t.db, u.id))!;
});
afterAll(() => t?.close());

describe("demo seed", () => {
  it("creates the clinic, the four demo sign-ins and at least eight clients, once", async () => {
    expect(seed.seeded).toBe(true);
    expect((await seedDemo(t.db)).seeded).toBe(false);
    expect((await t.db.select({ n: count() }).from(clinics))[0].n).toBe(1);
    expect((await t.db.select({ n: count() }).from(clients))[0].n).toBeGreaterThanOrEqual(8);
    const [client] = await t.db.select().from(users).where(eq(users.email, "client@kinarc.test"));
    expect(await verifyPassword(client.passwordHash, "kinarc-demo")).toBe(true);
    expect(await verifyPassword(client.passwordHash, "kinarc-dem0")).toBe(false);
  });
});

describe("client queries", () => {
  const base = { sort: "name", dir: "asc", page: 1, pageSize: 4 } as const;
  it("pages, sorts and counts", async () => {
    const first = await listClients(t.db, therapist.clinicId, base);
    const second = await listClients(t.db, therapist.clinicId, { ...base, page: 2 });
    expect(first.total).toBe(10);
    expect(first.rows).toHaveLength(4);
    expect(first.rows.map((r) => r.id)).not.toContain(second.rows[0].id);
    const desc = await listClients(t.db, therapist.clinicId, { ...base, dir: "desc", pageSize: 10 });
    expect(desc.rows[0].familyName).toBe("Vale");
  });
  it("filters by text (case-insensitive, % and _ taken literally) and by precautions", async () => {
    expect((await listClients(t.db, therapist.clinicId, { ...base, q: "TENDON" })).rows.map((r) => r.familyName)).toEqual(["Castellanos"]);
    expect((await listClients(t.db, therapist.clinicId, { ...base, q: "%" })).total).toBe(0);
    const flagged = await listClients(t.db, therapist.clinicId, { ...base, flagged: "false", pageSize: 20 });
    expect(flagged.rows.every((r) => r.precautionFlags.length === 0)).toBe(true);
    expect(flagged.total).toBe(2);
  });
  it("never returns another clinic's clients", async () => {
    const [other] = await t.db.insert(clinics).values({ name: "Another clinic" }).returning();
    expect((await listClients(t.db, other.id, base)).total).toBe(0);
  });
});

describe("writes are transactional", () => {
  const input = clientInputSchema.parse({ givenName: "Ilka", familyName: "Stroud", dateOfBirth: "1990-05-05", dominantHand: "left", affectedSide: "left" });

  it("creating a client writes the record and its audit event together", async () => {
    const created = await createClientFor(t.db, therapist, input);
    const events = await t.db.select().from(auditEvents).where(eq(auditEvents.subjectId, created.id));
    expect(events.map((e) => e.action)).toEqual(["client.create"]);
  });

  it("when the audit write fails, no client is left half-created", async () => {
    const before = (await t.db.select({ n: count() }).from(clients))[0].n;
    await t.db.run(sql`CREATE TRIGGER fail_audit BEFORE INSERT ON audit_events BEGIN SELECT RAISE(ABORT, 'audit store unavailable'); END`);
    try {
      await expect(createClientFor(t.db, therapist, { ...input, givenName: "Orla" })).rejects.toThrow(/insert into "audit_events"/);
      await expect(updateClientFor(t.db, therapist, seed.clientIds!.kofi, { diagnosisNote: "lost?" })).rejects.toThrow();
    } finally {
      await t.db.run(sql`DROP TRIGGER fail_audit`);
    }
    expect((await t.db.select({ n: count() }).from(clients))[0].n).toBe(before);
    const [kofi] = await t.db.select().from(clients).where(eq(clients.id, seed.clientIds!.kofi));
    expect(kofi.diagnosisNote).not.toBe("lost?");
  });

  it("a patch that breaks the precaution rule is refused and changes nothing", async () => {
    await expect(updateClientFor(t.db, therapist, seed.clientIds!.kofi, { noResistedUntil: "2027-01-01" })).rejects.toThrow(/precautionFlags/);
    const [kofi] = await t.db.select().from(clients).where(eq(clients.id, seed.clientIds!.kofi));
    expect(kofi.noResistedUntil).toBeNull();
  });

  it("a primary therapist must be an active therapist of the same clinic", async () => {
    const [assistant] = await t.db.select().from(users).where(eq(users.email, "assistant@kinarc.test"));
    await expect(createClientFor(t.db, therapist, { ...input, primaryTherapistId: assistant.id })).rejects.toThrow(/primaryTherapistId/);
  });
});

describe("record access", () => {
  it("staff of another clinic and other clients get 404; each read is audited", async () => {
    const [other] = await t.db.insert(clinics).values({ name: "Elsewhere" }).returning();
    const stranger: Actor = { ...therapist, clinicId: other.id };
    await expect(requireClientRecord(stranger, seed.clientIds!.wren, { db: t.db })).rejects.toMatchObject({ status: 404 });
    const [dorianUser] = await t.db.select().from(users).where(eq(users.email, "client@kinarc.test"));
    const dorian = (await actorForUser(t.db, dorianUser.id))!;
    expect(dorian.clientId).toBe(seed.clientIds!.dorian);
    await expect(requireClientRecord(dorian, seed.clientIds!.wren, { db: t.db })).rejects.toMatchObject({ status: 404 });
    await expect(requireClientRecord(dorian, "not-a-uuid", { db: t.db })).rejects.toMatchObject({ status: 404 });
    const own = await requireClientRecord(dorian, seed.clientIds!.dorian, { db: t.db, address: "203.0.113.9" });
    expect(own.familyName).toBe("Vale");
    const [event] = await t.db.select().from(auditEvents).where(eq(auditEvents.actorUserId, dorianUser.id));
    expect(event).toMatchObject({ action: "client.read", clientId: own.id, address: "203.0.113.9" });
  });

  it("a deactivated account resolves to no actor at once", async () => {
    const [u] = await t.db.select().from(users).where(eq(users.email, "assistant@kinarc.test"));
    await t.db.update(users).set({ active: false }).where(eq(users.id, u.id));
    expect(await actorForUser(t.db, u.id)).toBeNull();
    await t.db.update(users).set({ active: true }).where(eq(users.id, u.id));
    expect((await actorForUser(t.db, u.id))?.role).toBe("assistant");
  });
});

describe("sign-in throttling", () => {
  it("locks an account after the allowed failures and clears on success", async () => {
    const keys = [{ kind: "account" as const, value: "someone@kinarc.test" }];
    const t0 = new Date("2026-12-01T10:00:00Z");
    for (let i = 0; i < THROTTLE_POLICY.account.maxFailures - 1; i++) await recordFailure(t.db, keys, t0);
    expect((await checkThrottle(t.db, keys, t0)).locked).toBe(false);
    await recordFailure(t.db, keys, t0);
    const locked = await checkThrottle(t.db, keys, new Date(t0.getTime() + 60_000));
    expect(locked).toMatchObject({ locked: true, kind: "account" });
    expect(locked.retryAfterMs).toBe(THROTTLE_POLICY.account.lockMs - 60_000);
    expect((await checkThrottle(t.db, keys, new Date(t0.getTime() + THROTTLE_POLICY.account.lockMs + 1))).locked).toBe(false);
    await clearAccount(t.db, "SOMEONE@kinarc.test");
    expect((await checkThrottle(t.db, keys, t0)).locked).toBe(false);
  });

  it("failures spread beyond the window do not add up", async () => {
    const keys = [{ kind: "account" as const, value: "slow@kinarc.test" }];
    let now = new Date("2026-12-01T10:00:00Z").getTime();
    for (let i = 0; i < 10; i++) {
      await recordFailure(t.db, keys, new Date(now));
      now += THROTTLE_POLICY.account.windowMs / 2 + 1;
      if (i % 2 === 1) now += THROTTLE_POLICY.account.windowMs;
    }
    expect((await checkThrottle(t.db, keys, new Date(now))).locked).toBe(false);
  });
});
