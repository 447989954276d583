import ICAL from "ical.js";
import { eq } from "drizzle-orm";
import { TokenVerifier } from "livekit-server-sdk";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { clients, visits } from "@/db/schema";
import { seedDemo, type SeedResult } from "@/db/seed/demo";
import type { Actor } from "@/lib/auth/guard";
import { LOCAL_DEFAULTS } from "@/lib/env";
import { changeVisitStatus, requireVisit, runVisitJobs, scheduleVisit } from "@/lib/visits/service";
import { visitToken } from "@/lib/visits/token";
import { startMailCatcher, type MailCatcher } from "../../scripts/mail-catcher";
import { actorByEmail as actorByEmailIn, tempDatabase, type TempDb } from "./support";

// Mail goes to a catcher of this file's own; env() is read on first use, after this line.
process.env.SMTP_URL = "smtp://127.0.0.1:2626";

let t: TempDb;
let mail: MailCatcher;
let seed: SeedResult;
let therapist: Actor;
let dorian: Actor;

const actor = (email: string) => actorByEmailIn(t.db, email);

const NOW = new Date("2026-12-02T09:00:00Z");

beforeAll(async () => {
  mail = await startMailCatcher({ smtpPort: 2626, httpPort: 2627, quiet: true });
  t = await tempDatabase();
  seed = await seedDemo(t.db, NOW);
  therapist = await actor("therapist@kinarc.test");
  dorian = await actor("client@kinarc.test");
});
afterAll(async () => {
  t?.close();
  await mail?.close();
});

describe("booking a visit", () => {
  let visitId: string;

  it("stores the visit in the clinic's zone and e-mails an invitation with a calendar event", async () => {
    const { visit, invited } = await scheduleVisit(
      t.db,
      therapist,
      { clientId: seed.clientIds!.dorian, therapistId: therapist.userId, kind: "video", startsAt: "2026-12-04T14:30", durationMin: 45, reason: "Wrist range review" },
      NOW,
    );
    visitId = visit.id;
    expect(invited).toBe(true);
    // Europe/London is UTC+0 in December [common practice: IANA tz database].
    expect(visit.startsAt.toISOString()).toBe("2026-12-04T14:30:00.000Z");
    const message = mail.messages.find((m) => m.to.includes("client@kinarc.test"))!;
    expect(message.subject).toMatch(/Your hand therapy visit/);
    expect(message.text).toContain(`/visits/${visit.id}`);
    const ics = message.attachments.find((a) => a.contentType.startsWith("text/calendar"))!;
    // ical.js: a general-purpose RFC 5545 parser from the registry.
    const event = new ICAL.Event(new ICAL.Component(ICAL.parse(ics.content.toString("utf8"))).getFirstSubcomponent("vevent")!);
    expect(event.startDate.toJSDate().toISOString()).toBe("2026-12-04T14:30:00.000Z");
    expect(event.duration.toSeconds()).toBe(45 * 60);
    const [row] = await t.db.select().from(visits).where(eq(visits.id, visit.id));
    expect(row.invitationSentAt).not.toBeNull();
  });

  it("refuses a second visit that overlaps the therapist's first, and a time in the past", async () => {
    const base = { clientId: seed.clientIds!.wren, therapistId: therapist.userId, kind: "video" as const, durationMin: 30, reason: "" };
    await expect(scheduleVisit(t.db, therapist, { ...base, startsAt: "2026-12-04T15:00" }, NOW)).rejects.toMatchObject({ fields: { startsAt: expect.stringMatching(/already has a visit/) } });
    await expect(scheduleVisit(t.db, therapist, { ...base, startsAt: "2026-12-01T15:00" }, NOW)).rejects.toMatchObject({ fields: { startsAt: expect.stringMatching(/future/) } });
    const ok = await scheduleVisit(t.db, therapist, { ...base, startsAt: "2026-12-04T15:15" }, NOW);
    expect(ok.visit.status).toBe("scheduled");
  });

  it("books a client without an e-mail address but says the invitation could not go", async () => {
    const [ismael] = await t.db.select().from(clients).where(eq(clients.id, seed.clientIds!.ismael));
    expect(ismael.email).toBeNull();
    const r = await scheduleVisit(t.db, therapist, { clientId: ismael.id, therapistId: therapist.userId, kind: "video", startsAt: "2026-12-05T10:00", durationMin: 30, reason: "" }, NOW);
    expect(r.invited).toBe(false);
    expect(r.inviteProblem).toMatch(/no e-mail address/);
  });

  it("sends one reminder the day before, and marks a never-started visit missed", async () => {
    const dayBefore = new Date("2026-12-03T15:00:00Z");
    const first = await runVisitJobs(t.db, dayBefore);
    expect(first.reminded).toBeGreaterThanOrEqual(1);
    expect(mail.messages.filter((m) => m.subject.startsWith("Reminder")).length).toBe(first.reminded);
    const again = await runVisitJobs(t.db, dayBefore);
    expect(again.reminded).toBe(0);
    const later = await runVisitJobs(t.db, new Date("2026-12-04T16:00:00Z"));
    expect(later.missed).toBeGreaterThanOrEqual(1);
    const [row] = await t.db.select().from(visits).where(eq(visits.id, visitId));
    expect(row.status).toBe("missed");
  });
});

describe("who may join", () => {
  it("the visit's client and therapist get a token for that visit's room only; others do not", async () => {
    const { visit } = await scheduleVisit(t.db, therapist, { clientId: seed.clientIds!.dorian, therapistId: therapist.userId, kind: "video", startsAt: "2026-12-10T10:00", durationMin: 30, reason: "" }, NOW);
    const forClient = await requireVisit(t.db, dorian, visit.id, "participant");
    const { token, room, identity } = await visitToken(dorian, forClient);
    // Verified with livekit-server-sdk's own TokenVerifier, as the media server does.
    const claims = await new TokenVerifier(LOCAL_DEFAULTS.DEV_LIVEKIT_KEY, LOCAL_DEFAULTS.DEV_LIVEKIT_SECRET).verify(token);
    expect(claims.video?.room).toBe(`visit-${visit.id}`);
    expect(room).toBe(`visit-${visit.id}`);
    expect(claims.sub).toBe(identity);
    expect(identity).toBe(`client:${dorian.userId}`);
    expect(claims.exp! - claims.nbf!).toBeLessThanOrEqual(600);

    const wren = await actor("wren.castellanos@clients.kinarc.test");
    await expect(requireVisit(t.db, wren, visit.id, "participant")).rejects.toMatchObject({ status: 404 });
    const other = await actor("therapist2@kinarc.test");
    await expect(requireVisit(t.db, other, visit.id, "participant")).rejects.toMatchObject({ status: 403 });
  });

  it("a finished visit cannot be reopened", async () => {
    const { visit } = await scheduleVisit(t.db, therapist, { clientId: seed.clientIds!.kofi, therapistId: therapist.userId, kind: "video", startsAt: "2026-12-11T10:00", durationMin: 30, reason: "" }, NOW);
    const started = await changeVisitStatus(t.db, therapist, visit, "in_progress");
    const finished = await changeVisitStatus(t.db, therapist, started, "finished");
    expect(finished.endedAt).toBeInstanceOf(Date);
    await expect(changeVisitStatus(t.db, therapist, finished, "in_progress")).rejects.toMatchObject({ status: 403 });
  });
});
