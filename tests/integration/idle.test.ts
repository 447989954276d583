import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { auditEvents, staffActivity, users } from "@/db/schema";
import { seedDemo } from "@/db/seed/demo";
import type { Actor } from "@/lib/auth/guard";
import { staffSessionActive } from "@/lib/auth/idle";
import { actorByEmail as actorByEmailIn, tempDatabase, type TempDb } from "./support";

let t: TempDb;
let therapist: Actor;
let client: Actor;
const T0 = new Date("2026-12-01T09:00:00Z").getTime();
const at = (minutes: number) => new Date(T0 + minutes * 60_000);
const IDLE_MIN = 30;

const actorByEmail = (email: string) => actorByEmailIn(t.db, email);

beforeAll(async () => {
  t = await tempDatabase();
  await seedDemo(t.db, at(0));
  therapist = await actorByEmail("therapist@kinarc.test");
  client = await actorByEmail("client@kinarc.test");
  await t.db.update(users).set({ lastSignInAt: at(0) }).where(eq(users.id, therapist.userId));
});
afterAll(() => t?.close());

describe("staff sign-out after inactivity", () => {
  it("keeps a session alive while requests come, lapses it after the limit, and revives it only with a new sign-in", async () => {
    expect(await staffSessionActive(t.db, therapist, IDLE_MIN, at(10))).toBe(true);
    expect(await staffSessionActive(t.db, therapist, IDLE_MIN, at(35))).toBe(true); // 25 min after the last request
    const [row] = await t.db.select().from(staffActivity).where(eq(staffActivity.userId, therapist.userId));
    expect(row.lastActiveAt.getTime()).toBe(at(35).getTime());
    expect(await staffSessionActive(t.db, therapist, IDLE_MIN, at(65.5))).toBe(false); // 30.5 min idle
    expect(await staffSessionActive(t.db, therapist, IDLE_MIN, at(66))).toBe(false);
    const noted = await t.db.select().from(auditEvents).where(and(eq(auditEvents.action, "auth.idle_sign_out"), eq(auditEvents.actorUserId, therapist.userId)));
    expect(noted).toHaveLength(1);
    await t.db.update(users).set({ lastSignInAt: at(70) }).where(eq(users.id, therapist.userId));
    expect(await staffSessionActive(t.db, therapist, IDLE_MIN, at(71))).toBe(true);
  });

  it("decides the same from times the caller already read with the user", async () => {
    const known = (signIn: number, active: number | null) => ({ lastSignInAt: at(signIn), lastActiveAt: active === null ? null : at(active) });
    expect(await staffSessionActive(t.db, therapist, IDLE_MIN, at(200), known(190, null))).toBe(true);
    expect(await staffSessionActive(t.db, therapist, IDLE_MIN, at(300), known(190, 280))).toBe(true); // 20 min idle
    expect(await staffSessionActive(t.db, therapist, IDLE_MIN, at(300), known(190, 228))).toBe(false); // 72 min idle
  });

  it("does not time out a client's session", async () => {
    expect(await staffSessionActive(t.db, client, IDLE_MIN, at(10_000))).toBe(true);
  });
});
