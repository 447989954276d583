/**
 * Home practice against a real database: saving practice attempts through the capture path (one session, nothing
 * stored twice, never a grade), adherence and trend from stored sessions, and who may assign and read a program. The
 * pure schedule and trend rules are tested beside their modules (lib/practice/*.test.ts).
 */
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
import { practiceTarget } from "@/lib/practice/start";
import { buildSyntheticCapture, type SyntheticCaptureSpec } from "@/vision/testing/synthetic-hand";
import { actorByEmail as actorByEmailIn, tempDatabase, type TempDb } from "./support";

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

  const actorByEmail = (email: string) => actorByEmailIn(t.db, email);

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
