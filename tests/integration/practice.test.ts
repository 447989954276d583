/**
 * Home practice: the schedule and adherence rules against date-fns (an outside reference for ISO weeks and calendar
 * days), the trend rule on worked examples, saving practice attempts through the capture path (one session, nothing
 * stored twice), and who may assign and read a program.
 */
import { addDays as dfAddDays, eachDayOfInterval, formatISO, max as dfMax, min as dfMin, parseISO, startOfISOWeek } from "date-fns";
import { and, count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ZodError } from "zod";
import { attempts, auditEvents, clinics, practiceSessions, users } from "@/db/schema";
import { recentAttempts } from "@/db/queries/attempts";
import { seedDemo, type SeedResult } from "@/db/seed/demo";
import { AccessError, actorForUser, requireClientRecord, type Actor } from "@/lib/auth/guard";
import { saveCapture } from "@/lib/captures/save";
import { BadRequest } from "@/lib/http";
import { assignProgramItem, changeProgramItem, endProgramItemFor } from "@/lib/practice/manage";
import { clientPractice, programOverview } from "@/lib/practice/program";
import { readProgramFor } from "@/lib/practice/read";
import { dueInWeek, localDateIn, practiceCalendar, stillDueToday, weeklyAdherence, weekStartOf, type ScheduledItem } from "@/lib/practice/schedule";
import { practiceTrend, TYPICAL_ERROR_FLOOR_DEG, type SessionReading } from "@/lib/practice/trend";
import { practiceTarget } from "@/lib/practice/start";
import { buildSyntheticCapture, type SyntheticCaptureSpec } from "@/vision/testing/synthetic-hand";
import { tempDatabase, type TempDb } from "./support";

const iso = (d: Date) => formatISO(d, { representation: "date" });

/** date-fns's count of an item's active days in an ISO week: the reference for dueInWeek's day arithmetic. */
function referenceActiveDays(item: ScheduledItem, weekStart: string): number {
  const from = dfMax([parseISO(weekStart), parseISO(item.startDate)]);
  const last = item.endedOn && item.endedOn <= item.endDate ? dfAddDays(parseISO(item.endedOn), -1) : parseISO(item.endDate);
  const to = dfMin([dfAddDays(parseISO(weekStart), 6), last]);
  return from > to ? 0 : eachDayOfInterval({ start: from, end: to }).length;
}

describe("schedule", () => {
  it("starts weeks on Monday (ISO 8601) for every day of a year, as date-fns does", () => {
    for (let d = parseISO("2026-01-01"); d < parseISO("2027-01-01"); d = dfAddDays(d, 1)) expect(weekStartOf(iso(d))).toBe(iso(startOfISOWeek(d)));
  });

  it("dates a session in the clinic's time zone (Intl as the reference zone data)", () => {
    // 23:30 UTC on 31 March 2026 is already 1 April in London (BST, UTC+1) and still 31 March in New York.
    const instant = new Date("2026-03-31T23:30:00Z");
    expect(localDateIn(instant, "Europe/London")).toBe("2026-04-01");
    expect(localDateIn(instant, "America/New_York")).toBe("2026-03-31");
  });

  it("counts due sessions per week from the active days, daily and pro-rated weekly", () => {
    const items: ScheduledItem[] = [
      { id: "a", sessionsPerPeriod: 2, period: "day", startDate: "2026-12-02", endDate: "2026-12-20", endedOn: null },
      { id: "b", sessionsPerPeriod: 3, period: "week", startDate: "2026-12-06", endDate: "2027-01-10", endedOn: null },
      { id: "c", sessionsPerPeriod: 1, period: "day", startDate: "2026-11-20", endDate: "2027-02-01", endedOn: "2026-12-10" },
    ];
    for (const item of items) {
      for (let w = parseISO("2026-11-16"); w < parseISO("2027-01-18"); w = dfAddDays(w, 7)) {
        const week = iso(w);
        const days = referenceActiveDays(item, week);
        // Our rule: daily = count × active days; weekly = count × active days / 7, to the nearest session.
        const expected = item.period === "day" ? item.sessionsPerPeriod * days : Math.round((item.sessionsPerPeriod * days) / 7);
        expect(dueInWeek(item, week), `${item.id} in week of ${week}`).toBe(expected);
      }
    }
    // Worked values: item a starts on a Wednesday (5 active days × 2), item b on a Sunday (1 day of a 3-a-week item
    // rounds to 0), item c ended on Thursday 10 December (due through Wednesday: 3 days × 1).
    expect(dueInWeek(items[0], "2026-11-30")).toBe(10);
    expect(dueInWeek(items[1], "2026-11-30")).toBe(0);
    expect(dueInWeek(items[2], "2026-12-07")).toBe(3);
  });

  it("reports done vs due per week up to today and what is still due today", () => {
    const daily: ScheduledItem = { id: "d", sessionsPerPeriod: 1, period: "day", startDate: "2026-11-30", endDate: "2026-12-27", endedOn: null };
    const weekly: ScheduledItem = { id: "w", sessionsPerPeriod: 2, period: "week", startDate: "2026-11-30", endDate: "2026-12-27", endedOn: null };
    const sessions = [
      { itemId: "d", localDate: "2026-11-30" },
      { itemId: "d", localDate: "2026-12-02" },
      { itemId: "d", localDate: "2026-12-08" },
      { itemId: "w", localDate: "2026-12-01" },
      { itemId: "w", localDate: "2026-12-08" },
      { itemId: "w", localDate: "2026-12-09" },
    ];
    expect(weeklyAdherence(daily, sessions, "2026-12-09")).toEqual([
      { weekStart: "2026-11-30", due: 7, done: 2 },
      { weekStart: "2026-12-07", due: 7, done: 1 },
    ]);
    expect(weeklyAdherence(weekly, sessions, "2026-12-09")).toEqual([
      { weekStart: "2026-11-30", due: 2, done: 1 },
      { weekStart: "2026-12-07", due: 2, done: 2 },
    ]);
    expect(stillDueToday(daily, sessions, "2026-12-08")).toBe(false);
    expect(stillDueToday(daily, sessions, "2026-12-09")).toBe(true);
    expect(stillDueToday(weekly, sessions, "2026-12-09")).toBe(false);
    expect(stillDueToday(daily, sessions, "2026-12-28")).toBe(false);

    const calendar = practiceCalendar([daily, weekly], sessions, "2026-12-09");
    expect(calendar.map((w) => w.weekStart)).toEqual(["2026-12-07", "2026-12-14"]);
    expect(calendar[0].days.map((d) => d.dueDaily)).toEqual([1, 1, 1, 1, 1, 1, 1]);
    // 8 December: one daily and one weekly session; 9 December: one weekly.
    expect(calendar[0].days.map((d) => d.done)).toEqual([0, 2, 1, 0, 0, 0, 0]);
    expect([calendar[0].dueWeekly, calendar[0].doneWeekly]).toEqual([2, 2]);
  });
});

describe("trend rule (Kinarc's own: best of the last three sessions against the best before them)", () => {
  const readings = (degs: number[], uncertaintyDeg: number | null = null): SessionReading[] =>
    degs.map((bestDeg, i) => ({ sessionId: `s${i}`, startedAt: new Date(Date.UTC(2026, 11, 1 + i)), bestDeg, uncertaintyDeg }));

  it("needs at least four sessions", () => {
    expect(practiceTrend(readings([40, 50, 60]), null).verdict).toBe("too_few");
  });

  it("reads falling, stalled and improving against the typical error", () => {
    // Earlier best 62; recent best 54 is 8° below, more than the 5° floor.
    expect(practiceTrend(readings([40, 60, 62, 50, 52, 54]), 100)).toMatchObject({ verdict: "falling", earlierBestDeg: 62, recentBestDeg: 54 });
    // Earlier best 55; recent best 57 is within 5° above.
    expect(practiceTrend(readings([40, 50, 55, 56, 57, 55]), 100)).toMatchObject({ verdict: "stalled", earlierBestDeg: 55, recentBestDeg: 57 });
    // Earlier best 60; recent best 72 is 12° above.
    expect(practiceTrend(readings([40, 50, 60, 66, 70, 72]), 100)).toMatchObject({ verdict: "improving" });
    // Exactly the typical error above the earlier best is not yet more than it: stalled.
    expect(practiceTrend(readings([40, 50, 60, 62, 65, 61]), 100).verdict).toBe("stalled");
  });

  it("widens the typical error to the engine's stated ± when that is larger than the floor", () => {
    // 67 vs 60: above the 5° floor (improving) but within an engine ± of 8° (stalled).
    expect(practiceTrend(readings([40, 50, 60, 66, 67, 67]), 100).verdict).toBe("improving");
    const wide = practiceTrend(readings([40, 50, 60, 66, 67, 67], 8), 100);
    expect(wide).toMatchObject({ verdict: "stalled", typicalErrorDeg: 8 });
    expect(practiceTrend(readings([40, 50, 60, 66, 67, 67], 3), 100).typicalErrorDeg).toBe(TYPICAL_ERROR_FLOOR_DEG);
  });

  it("does not call a range at the reference end-range stalled", () => {
    // PIP flexion reference 100° (AAOS 1965, via the catalog); a client holding 101-103° has nothing left to gain.
    expect(practiceTrend(readings([95, 101, 102, 103, 101, 102]), 100).verdict).toBe("at_reference");
  });

  it("orders sessions by time, not by arrival", () => {
    const shuffled = readings([40, 60, 62, 50, 52, 54]).reverse();
    expect(practiceTrend(shuffled, 100).verdict).toBe("falling");
  });
});

describe("assigning, practising and reading a home program", () => {
  let t: TempDb;
  let seed: SeedResult;
  let therapist: Actor, assistant: Actor, admin: Actor, dorian: Actor, stranger: Actor;
  // Monday 7 December 2026, 10:00 in London (UTC in winter).
  const NOW = new Date("2026-12-07T10:00:00Z");
  const ITEM = { motion: "pip.flexion", side: "right", digit: "middle", condition: "against_gravity", repetitions: "10", sessionsPerPeriod: "1", period: "day", startDate: "2026-12-07", endDate: "2026-12-20", notes: "Slow and within comfort." };
  const SPEC: SyntheticCaptureSpec = {
    motion: "pip.flexion",
    side: "right",
    digit: "middle",
    condition: "against_gravity",
    placement: { forearmDistal: [0, -1, 0], forearmRadial: [1, 0, 0], wrist: [0, 0.1, 0.45] },
    reps: [{ peakDeg: 70 }, { peakDeg: 70 }, { peakDeg: 70 }],
    noiseMm: 1,
    seed: 11,
  };
  let uid = 0;
  const captureUid = () => `practice-capture-${String(++uid).padStart(6, "0")}`;

  async function actorByEmail(email: string): Promise<Actor> {
    const [u] = await t.db.select().from(users).where(eq(users.email, email));
    return (await actorForUser(t.db, u.id))!;
  }

  beforeAll(async () => {
    t = await tempDatabase();
    seed = await seedDemo(t.db, NOW);
    therapist = await actorByEmail("therapist@kinarc.test");
    assistant = await actorByEmail("assistant@kinarc.test");
    admin = await actorByEmail("admin@kinarc.test");
    dorian = await actorByEmail("client@kinarc.test");
    // A therapist of another clinic.
    const [other] = await t.db.insert(clinics).values({ name: "Elsewhere Hand Clinic" }).returning();
    const [u] = await t.db.insert(users).values({ clinicId: other.id, email: "stranger@elsewhere.test", role: "therapist", name: "Other Therapist" }).returning();
    stranger = (await actorForUser(t.db, u.id))!;
  });
  afterAll(() => t?.close());

  it("lets therapists and assistants assign, and refuses admins and clients (403) and other clinics (404)", async () => {
    const dorianId = seed.clientIds!.dorian;
    const item = await assignProgramItem(t.db, therapist, dorianId, ITEM);
    expect(item).toMatchObject({ motion: "pip.flexion", digit: "middle", repetitions: 10, sessionsPerPeriod: 1, period: "day", assignedByUserId: therapist.userId });
    const byAssistant = await assignProgramItem(t.db, assistant, dorianId, { ...ITEM, motion: "wrist.extension", digit: "", period: "week", sessionsPerPeriod: "3" });
    expect(byAssistant.digit).toBeNull();
    const [{ n }] = await t.db.select({ n: count() }).from(auditEvents).where(eq(auditEvents.action, "program.assign"));
    expect(n).toBe(2);

    await expect(assignProgramItem(t.db, admin, dorianId, ITEM)).rejects.toMatchObject({ status: 403 });
    await expect(assignProgramItem(t.db, dorian, dorianId, ITEM)).rejects.toMatchObject({ status: 403 });
    await expect(assignProgramItem(t.db, stranger, dorianId, ITEM)).rejects.toMatchObject({ status: 404 });
    await expect(endProgramItemFor(t.db, admin, dorianId, item.id)).rejects.toBeInstanceOf(AccessError);
  });

  it("names the field and what was expected for bad input, and refuses a motion a precaution withholds", async () => {
    const dorianId = seed.clientIds!.dorian;
    const fields = async (raw: unknown) => {
      const error = await assignProgramItem(t.db, therapist, dorianId, raw).catch((e) => e);
      expect(error).toBeInstanceOf(ZodError);
      return Object.fromEntries((error as ZodError).issues.map((i) => [i.path.join("."), i.message]));
    };
    expect(await fields({ ...ITEM, digit: "" })).toMatchObject({ digit: expect.stringMatching(/^expected one of .*middle/) });
    expect(await fields({ ...ITEM, endDate: "2026-12-01" })).toMatchObject({ endDate: "expected a date on or after the start date" });
    expect(await fields({ ...ITEM, repetitions: "0", period: "month", startDate: "2026-02-30" })).toMatchObject({
      repetitions: "expected at least 1",
      period: "expected day or week",
      startDate: "expected a real calendar date",
    });
    // Wren's record carries a tendon repair: finger motions stay with the therapist (lib/tracking/self-check-plan).
    const error = await assignProgramItem(t.db, therapist, seed.clientIds!.wren, { ...ITEM, side: "left" }).catch((e) => e);
    expect(error).toBeInstanceOf(BadRequest);
    expect((error as BadRequest).fields.motion).toMatch(/tendon repair/);
  });

  it("saves practice attempts into one session, exactly once, and counts them in adherence and the calendar", async () => {
    const dorianId = seed.clientIds!.dorian;
    const client = await requireClientRecord(dorian, dorianId, { db: t.db });
    const [item] = (await programOverview(t.db, client, { now: NOW, timeZone: "Europe/London", rangeTable: "aaos1965" })).items.filter((v) => v.item.motion === "pip.flexion");
    const target = await practiceTarget(t.db, client, item.item.id, NOW);
    expect(target).toMatchObject({ itemId: item.item.id, motion: "pip.flexion", side: "right", digit: "middle" });

    const body = (over: Record<string, unknown> = {}) => ({
      captureUid: captureUid(),
      source: "practice",
      clientId: dorianId,
      practiceItemId: target!.itemId,
      practiceSessionId: target!.sessionId,
      recordedAt: NOW.getTime(),
      capture: buildSyntheticCapture(SPEC),
      ...over,
    });
    const first = body();
    const saved = await saveCapture(t.db, dorian, client, first);
    expect(saved.created).toBe(true);
    expect(saved.attempt).toMatchObject({ source: "practice", practiceSessionId: target!.sessionId });
    // A retry of the same capture (after a dropped connection) and a second attempt of the same sitting.
    expect((await saveCapture(t.db, dorian, client, first)).created).toBe(false);
    expect((await saveCapture(t.db, dorian, client, body({ recordedAt: NOW.getTime() + 60_000 }))).created).toBe(true);
    const sessions = await t.db.select().from(practiceSessions).where(eq(practiceSessions.id, target!.sessionId));
    expect(sessions).toHaveLength(1);
    expect(sessions[0]).toMatchObject({ itemId: item.item.id, localDate: "2026-12-07" });
    expect((await t.db.select({ n: count() }).from(attempts).where(eq(attempts.practiceSessionId, target!.sessionId)))[0].n).toBe(2);

    // Wrong motion for the item, missing session id, another client's item: refused with the field named.
    const wrong = await saveCapture(t.db, dorian, client, body({ capture: buildSyntheticCapture({ ...SPEC, digit: "ring" }) })).catch((e) => e);
    expect(wrong).toBeInstanceOf(BadRequest);
    expect((wrong as BadRequest).fields.practiceItemId).toMatch(/pip\.flexion, right middle/);
    const missing = await saveCapture(t.db, dorian, client, body({ practiceSessionId: undefined })).catch((e) => e);
    expect(missing).toBeInstanceOf(ZodError);
    expect((missing as ZodError).issues[0].path).toEqual(["practiceSessionId"]);
    await expect(saveCapture(t.db, dorian, client, body({ practiceItemId: crypto.randomUUID() }))).rejects.toMatchObject({ status: 404 });

    // Practice never becomes a grade: the attempts a grade proposal rests on leave it out.
    const gradeBasis = await recentAttempts(t.db, client.clinicId, dorianId);
    const practiceIds = new Set((await t.db.select({ id: attempts.id }).from(attempts).where(and(eq(attempts.source, "practice"), eq(attempts.clientId, dorianId)))).map((a) => a.id));
    expect(practiceIds.size).toBe(2);
    expect(gradeBasis.filter((a) => practiceIds.has(a.id))).toEqual([]);

    const after = await programOverview(t.db, client, { now: NOW, timeZone: "Europe/London", rangeTable: "aaos1965" });
    const pip = after.items.find((v) => v.item.id === item.item.id)!;
    expect(pip.thisWeek).toEqual({ due: 7, done: 1 });
    expect(pip.readings).toHaveLength(1);
    // The session's best reading is the engine's own peak for the synthetic 70° bend, within its stated 5° target.
    expect(Math.abs(pip.readings[0].bestDeg - 70)).toBeLessThanOrEqual(5);
    expect(pip.trend.verdict).toBe("too_few");

    const mine = await clientPractice(t.db, client, { now: NOW, timeZone: "Europe/London" });
    expect(mine.items.find((i) => i.item.id === item.item.id)).toMatchObject({ due: false, doneToday: 1 });
    expect(mine.calendar[0].days[0]).toMatchObject({ date: "2026-12-07", done: 1, dueDaily: 1 });
  });

  it("shows a client only their own program, clinicians the full view, and admins nothing", async () => {
    const own = await readProgramFor(t.db, dorian, seed.clientIds!.dorian, { now: NOW });
    expect(own.view).toBe("client");
    expect(own.items.length).toBeGreaterThan(0);
    expect(JSON.stringify(own)).not.toMatch(/trend|blockedReason/);
    await expect(readProgramFor(t.db, dorian, seed.clientIds!.wren, { now: NOW })).rejects.toMatchObject({ status: 404 });
    await expect(readProgramFor(t.db, admin, seed.clientIds!.dorian, { now: NOW })).rejects.toMatchObject({ status: 403 });
    await expect(readProgramFor(t.db, stranger, seed.clientIds!.dorian, { now: NOW })).rejects.toMatchObject({ status: 404 });
    const staff = await readProgramFor(t.db, assistant, seed.clientIds!.dorian, { now: NOW });
    expect(staff.view).toBe("staff");
  });

  it("seeds a demo program whose readings the engine made: Anselm's wrist extension reads stalled", async () => {
    const client = await requireClientRecord(therapist, seed.clientIds!.anselm, { db: t.db });
    const { items } = await programOverview(t.db, client, { now: NOW, timeZone: "Europe/London", rangeTable: "aaos1965" });
    const [ext] = items.filter((v) => v.item.motion === "wrist.extension");
    expect(ext.readings).toHaveLength(6);
    // Synthetic peaks 28, 35, 40 then 41, 39, 42: within the 5° floor of the earlier best.
    expect(ext.trend.verdict).toBe("stalled");
    expect(ext.adherence.reduce((n, w) => n + w.done, 0)).toBe(6);
    // Started Saturday 28 November: 2 days of that week, all 7 of the next, and the whole current week (a week's due
    // count is the week's, even on its Monday).
    expect(ext.adherence.map((w) => w.due)).toEqual([2, 7, 7]);
  });

  it("keeps an ended item's history and stops offering it", async () => {
    const dorianId = seed.clientIds!.dorian;
    const client = await requireClientRecord(therapist, dorianId, { db: t.db });
    const item = await assignProgramItem(t.db, therapist, dorianId, { ...ITEM, motion: "mcp.flexion", digit: "index" });
    const changed = await changeProgramItem(t.db, therapist, dorianId, item.id, { ...ITEM, motion: "mcp.flexion", digit: "index", repetitions: "15" });
    expect(changed.repetitions).toBe(15);
    await endProgramItemFor(t.db, therapist, dorianId, item.id, { now: NOW });
    expect(await practiceTarget(t.db, client, item.id, NOW)).toBeNull();
    await expect(changeProgramItem(t.db, therapist, dorianId, item.id, ITEM)).rejects.toBeInstanceOf(BadRequest);
    const overview = await programOverview(t.db, client, { now: NOW, timeZone: "Europe/London", rangeTable: "aaos1965" });
    expect(overview.items.find((v) => v.item.id === item.id)?.status).toBe("ended");
  });
});
