import ICAL from "ical.js";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { clients, users, visits } from "@/db/schema";
import { seedDemo, type SeedResult } from "@/db/seed/demo";
import { actorForUser, type Actor } from "@/lib/auth/guard";
import { buildChart } from "@/lib/chart/chart";
import { buildQueue, scheduleInPersonTest } from "@/lib/chart/follow-ups";
import { recordInPersonResult } from "@/lib/chart/record";
import { appointmentSchema, inPersonResultSchema } from "@/lib/chart/schemas";
import { BadRequest } from "@/lib/http";
import { runVisitJobs } from "@/lib/visits/service";
import { startMailCatcher, type MailCatcher } from "../../scripts/mail-catcher";
import { tempDatabase, type TempDb } from "./support";

// Mail goes to a catcher of this file's own; env() is read on first use, after this line.
process.env.SMTP_URL = "smtp://127.0.0.1:2636";

const NOW = new Date("2026-12-01T09:00:00Z");
const TODAY = "2026-12-01";
let t: TempDb;
let mail: MailCatcher;
let seed: SeedResult;
let therapist: Actor;

beforeAll(async () => {
  mail = await startMailCatcher({ smtpPort: 2636, httpPort: 2637, quiet: true });
  t = await tempDatabase();
  seed = await seedDemo(t.db, NOW);
  const [u] = await t.db.select().from(users).where(eq(users.email, "therapist@kinarc.test"));
  therapist = (await actorForUser(t.db, u.id))!;
}, 120_000);
afterAll(async () => {
  t?.close();
  await mail?.close();
});

const leftExtension = { motion: "wrist.extension", side: "left", digit: null };

describe("scheduling an in-person test from the queue", () => {
  it("refuses a resisted test before the date the precaution allows, naming the field", async () => {
    const input = appointmentSchema.parse({ clientId: seed.clientIds!.dorian, startsAtLocal: "2026-12-10T10:00", location: "Room 2", plannedTests: [leftExtension] });
    const error = await scheduleInPersonTest(t.db, therapist, input, TODAY, NOW).catch((e) => e);
    expect(error).toBeInstanceOf(BadRequest);
    expect((error as BadRequest).fields.startsAtLocal).toMatch(/2026-12-22 or later/);
  });

  it("books the visit with its planned tests and e-mails an invitation whose calendar file has the time and place", async () => {
    const input = appointmentSchema.parse({ clientId: seed.clientIds!.dorian, startsAtLocal: "2026-12-22T10:30", location: "Saltmarsh clinic, room 2", plannedTests: [leftExtension] });
    const { visit, invited } = await scheduleInPersonTest(t.db, therapist, input, TODAY, NOW);
    expect(invited).toBe(true);
    const [stored] = await t.db.select().from(visits).where(eq(visits.id, visit.id));
    expect(stored.kind).toBe("in_person");
    expect(stored.plannedTests).toEqual([leftExtension]);
    const message = mail.messages.find((m) => m.to.includes("client@kinarc.test"))!;
    expect(message.text).toMatch(/Wrist extension \(left\)/);
    const ics = message.attachments.find((a) => /calendar/.test(a.contentType))!;
    // ical.js: a general-purpose RFC 5545 parser from the registry. Europe/London is UTC+0 in December [common practice].
    const event = new ICAL.Event(new ICAL.Component(ICAL.parse(ics.content.toString("utf8"))).getFirstSubcomponent("vevent")!);
    expect(event.startDate.toJSDate().toISOString()).toBe("2026-12-22T10:30:00.000Z");
    expect(event.location).toBe("Saltmarsh clinic, room 2");
    // The queue shows the motion as scheduled and the visit as upcoming.
    const group = (await buildQueue(t.db, therapist.clinicId, TODAY, NOW)).find((g) => g.clientId === seed.clientIds!.dorian)!;
    expect(group.items.find((i) => i.key === "wrist.extension|left|-")?.scheduledVisitId).toBe(visit.id);
    expect(group.upcoming.map((u) => u.id)).toContain(visit.id);
  });

  it("sends the reminder the day before, once, when the job runs with that day's clock", async () => {
    const reminders = () => mail.messages.filter((m) => m.to.includes("client@kinarc.test") && /Reminder/.test(m.subject)).length;
    await runVisitJobs(t.db, new Date("2026-12-20T10:30:00Z"));
    expect(reminders()).toBe(0);
    await runVisitJobs(t.db, new Date("2026-12-21T12:00:00Z"));
    expect(reminders()).toBe(1);
    await runVisitJobs(t.db, new Date("2026-12-21T18:00:00Z"));
    expect(reminders()).toBe(1);
  });

  it("filing the in-person result under the visit closes the flag and finishes the visit once every planned test is graded", async () => {
    const dorianId = seed.clientIds!.dorian;
    // The surgeon has cleared resisted testing: the record's precautions are lifted.
    await t.db.update(clients).set({ precautionFlags: [], noResistedUntil: null, updatedAt: new Date() }).where(eq(clients.id, dorianId));
    const [record] = await t.db.select().from(clients).where(eq(clients.id, dorianId));
    const chart = await buildChart(t.db, record, { today: TODAY });
    const visit = chart.visits.find((v) => v.plannedKeys.includes("wrist.extension|left|-"))!;
    expect(visit).toBeDefined();
    await recordInPersonResult(
      t.db,
      { actor: therapist, client: record, today: TODAY },
      inPersonResultSchema.parse({ visitId: visit.id, grades: [{ method: "in_person_resisted", motion: "wrist.extension", side: "left", digit: null, value: "4" }] }),
    );
    const [finished] = await t.db.select().from(visits).where(eq(visits.id, visit.id));
    expect(finished.status).toBe("finished");
    const after = await buildChart(t.db, record, { today: TODAY });
    expect(after.rows.find((r) => r.key === "wrist.extension|left|-")?.needs).toEqual([]);
    expect(after.rows.find((r) => r.key === "wrist.extension|left|-")?.grade).toMatchObject({ value: "4", method: "in_person_resisted", visitId: visit.id });
  });
});
