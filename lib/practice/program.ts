/**
 * A client's home program as the therapist's page and the client's home show it: each item with its adherence week
 * by week, the trend of its readings and whether a precaution keeps it from being offered. Server-only (reads the db).
 */
import type { DbOrTx } from "@/db";
import { listPracticeAttempts, listPracticeSessions, listProgramItems } from "@/db/queries/practice";
import type { Client, HomeProgramItem, PracticeSession } from "@/db/schema";
import { getReferenceEndRange, MOTIONS, type Digit, type MotionId, type RangeTableId } from "@/lib/motions/catalog";
import { selfCheckPlan } from "@/lib/tracking/self-check-plan";
import { addDays, isActiveOn, lastDueDate, localDateIn, practiceCalendar, stillDueToday, weeklyAdherence, weekStartOf, type CalendarWeek, type ScheduledItem, type WeekAdherence } from "./schedule";
import { practiceTrend, type SessionReading, type TrendNote } from "./trend";

export function programItemLabel(item: Pick<HomeProgramItem, "motion" | "side" | "digit">): string {
  const def = MOTIONS[item.motion as MotionId];
  return `${def?.label ?? item.motion}, ${item.side}${item.digit ? ` ${item.digit}${item.digit === "thumb" ? "" : " finger"}` : ""}`;
}

export function toScheduled(item: HomeProgramItem, timeZone: string): ScheduledItem {
  return {
    id: item.id,
    sessionsPerPeriod: item.sessionsPerPeriod,
    period: item.period,
    startDate: item.startDate,
    endDate: item.endDate,
    endedOn: item.endedAt ? localDateIn(item.endedAt, timeZone) : null,
  };
}

export type ItemStatus = "upcoming" | "active" | "finished" | "ended";

export function itemStatus(item: HomeProgramItem, today: string): ItemStatus {
  if (item.endedAt) return "ended";
  if (today < item.startDate) return "upcoming";
  if (today > item.endDate) return "finished";
  return "active";
}

/** Why a precaution on the client's record keeps this motion out of unsupervised practice, or null. */
export function blockedReason(client: Pick<Client, "affectedSide" | "precautionFlags">, motion: string): string | null {
  return selfCheckPlan(client).withheld.find((w) => w.motion === motion)?.reason ?? null;
}

export interface ProgramItemOverview {
  item: HomeProgramItem;
  label: string;
  status: ItemStatus;
  blockedReason: string | null;
  adherence: WeekAdherence[];
  thisWeek: { due: number; done: number };
  readings: SessionReading[];
  trend: TrendNote;
  referenceEndRangeDeg: number | null;
}

/** Best reading per session: the largest peak (or arc, for motions graded on the arc) among its attempts. */
function sessionReadings(rows: Awaited<ReturnType<typeof listPracticeAttempts>>, itemId: string): SessionReading[] {
  const bySession = new Map<string, SessionReading>();
  for (const r of rows) {
    if (r.itemId !== itemId) continue;
    const def = MOTIONS[r.motion as MotionId];
    const deg = def?.gradedOn === "arc" ? r.arcDeg : r.peakDeg;
    if (deg === null || deg === undefined) continue;
    const seen = bySession.get(r.sessionId);
    if (!seen || deg > seen.bestDeg) bySession.set(r.sessionId, { sessionId: r.sessionId, startedAt: r.startedAt, bestDeg: deg, uncertaintyDeg: r.uncertaintyDeg });
  }
  return [...bySession.values()].sort((a, b) => a.startedAt.getTime() - b.startedAt.getTime());
}

export async function programOverview(
  db: DbOrTx,
  client: Client,
  opts: { now: Date; timeZone: string; rangeTable: RangeTableId },
): Promise<{ today: string; items: ProgramItemOverview[]; sessions: PracticeSession[] }> {
  const today = localDateIn(opts.now, opts.timeZone);
  const [items, sessions, rows] = await Promise.all([
    listProgramItems(db, client.clinicId, client.id),
    listPracticeSessions(db, client.clinicId, client.id),
    listPracticeAttempts(db, client.clinicId, client.id),
  ]);
  const week = weekStartOf(today);
  return {
    today,
    sessions,
    items: items.map((item) => {
      const scheduled = toScheduled(item, opts.timeZone);
      const adherence = weeklyAdherence(scheduled, sessions, today);
      const current = adherence.find((w) => w.weekStart === week);
      const readings = sessionReadings(rows, item.id);
      const reference = getReferenceEndRange(item.motion as MotionId, item.digit as Digit | null, opts.rangeTable);
      return {
        item,
        label: programItemLabel(item),
        status: itemStatus(item, today),
        blockedReason: blockedReason(client, item.motion),
        adherence,
        thisWeek: { due: current?.due ?? 0, done: current?.done ?? 0 },
        readings,
        trend: practiceTrend(readings, reference?.endRangeDeg ?? null),
        referenceEndRangeDeg: reference?.endRangeDeg ?? null,
      };
    }),
  };
}

export interface TodayItem {
  item: HomeProgramItem;
  label: string;
  /** Still asked for today (daily) or this week (weekly). */
  due: boolean;
  doneToday: number;
}

/**
 * What the client sees: items active today that no precaution withholds, whether each is still due, and the calendar
 * of the current and next weeks (withheld items count neither as due nor done there).
 */
export async function clientPractice(
  db: DbOrTx,
  client: Client,
  opts: { now: Date; timeZone: string },
): Promise<{ today: string; items: TodayItem[]; calendar: CalendarWeek[] }> {
  const today = localDateIn(opts.now, opts.timeZone);
  const [items, sessions] = await Promise.all([listProgramItems(db, client.clinicId, client.id), listPracticeSessions(db, client.clinicId, client.id)]);
  const offered = items.filter((i) => !blockedReason(client, i.motion));
  const scheduled = offered.map((i) => toScheduled(i, opts.timeZone));
  const horizonEnd = addDays(weekStartOf(today), 13);
  return {
    today,
    items: offered
      .map((item, k) => ({ item, s: scheduled[k] }))
      .filter(({ s }) => isActiveOn(s, today))
      .map(({ item, s }) => ({
        item,
        label: programItemLabel(item),
        due: stillDueToday(s, sessions, today),
        doneToday: sessions.filter((x) => x.itemId === item.id && x.localDate === today).length,
      })),
    calendar: practiceCalendar(
      scheduled.filter((s) => s.startDate <= horizonEnd && lastDueDate(s) >= weekStartOf(today)),
      sessions,
      today,
    ),
  };
}
