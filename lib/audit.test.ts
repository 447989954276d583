import { desc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { auditEvents, clinics } from "@/db/schema";
import { seedDemo } from "@/db/seed/demo";
import { actorByEmail, tempDatabase, type TempDb } from "@/tests/integration/support";
import type { Actor } from "./auth/guard";
import { auditActorEvent, recordAudit } from "./audit";

// The helper only gathers fields every call site used to spell out, so its reference is the explicit event those
// call sites wrote before: the same row, column for column, in a real migrated libSQL database.

let t: TempDb;
let therapist: Actor;
let assistant: Actor;
let clientId: string;

beforeAll(async () => {
  t = await tempDatabase();
  const seed = await seedDemo(t.db);
  therapist = await actorByEmail(t.db, "therapist@kinarc.test");
  assistant = await actorByEmail(t.db, "assistant@kinarc.test");
  clientId = seed.clientIds!.dorian;
});
afterAll(() => t?.close());

async function eventBySubject(subjectId: string) {
  const rows = await t.db.select().from(auditEvents).where(eq(auditEvents.subjectId, subjectId)).orderBy(desc(auditEvents.at));
  expect(rows).toHaveLength(1);
  const { id, at, ...columns } = rows[0];
  expect(id).toBeTruthy();
  expect(at).toBeInstanceOf(Date);
  return columns;
}

describe("auditActorEvent", () => {
  it("writes the actor's user, role and clinic with the event's own fields", async () => {
    await auditActorEvent(t.db, therapist, {
      action: "client.update",
      subjectType: "client",
      subjectId: "helper-fields",
      clientId,
      address: "203.0.113.7",
      detail: { fields: ["phone", "precautionFlags"] },
    });
    expect(await eventBySubject("helper-fields")).toEqual({
      action: "client.update",
      clinicId: therapist.clinicId,
      actorUserId: therapist.userId,
      actorRole: "therapist",
      subjectType: "client",
      subjectId: "helper-fields",
      clientId,
      address: "203.0.113.7",
      detail: { fields: ["phone", "precautionFlags"] },
    });
  });

  it("writes the same row as the explicit recordAudit call it replaces, unset fields included", async () => {
    await recordAudit(t.db, { action: "upload.list", clinicId: assistant.clinicId, actorUserId: assistant.userId, actorRole: assistant.role, subjectId: "explicit" });
    await auditActorEvent(t.db, assistant, { action: "upload.list", subjectId: "helper" });
    const explicit = await eventBySubject("explicit");
    const helper = await eventBySubject("helper");
    expect({ ...helper, subjectId: "explicit" }).toEqual(explicit);
    expect(helper).toMatchObject({ actorRole: "assistant", clientId: null, address: null, detail: null, subjectType: null });
  });

  it("keeps the record's clinic when the call site names one", async () => {
    const [other] = await t.db.insert(clinics).values({ name: "Second test clinic" }).returning();
    await auditActorEvent(t.db, therapist, { action: "visit.cancelled", clinicId: other.id, subjectType: "visit", subjectId: "record-clinic" });
    const row = await eventBySubject("record-clinic");
    expect(row.clinicId).toBe(other.id);
    expect(row.clinicId).not.toBe(therapist.clinicId);
    expect(row.actorUserId).toBe(therapist.userId);
  });

  it("writes inside the caller's transaction: a rolled-back change leaves no event", async () => {
    const rollback = new Error("change refused");
    await expect(
      t.db.transaction(async (tx) => {
        await auditActorEvent(tx, therapist, { action: "client.update", subjectType: "client", subjectId: "rolled-back", clientId });
        throw rollback;
      }),
    ).rejects.toBe(rollback);
    expect(await t.db.select().from(auditEvents).where(eq(auditEvents.subjectId, "rolled-back"))).toHaveLength(0);
  });
});
