/**
 * When home practice is due and how much of it was done. Pure; dates are clinic-local calendar days as YYYY-MM-DD,
 * weeks run Monday to Sunday (ISO 8601 weeks).
 */
import type { PracticePeriod } from "@/db/schema";

export interface ScheduledItem {
  id: string;
  sessionsPerPeriod: number;
  period: PracticePeriod;
  startDate: string;
  endDate: string;
  /** Clinic-local date on which the item was ended early, if it was. */
  endedOn: string | null;
}

export interface DoneSession {
  itemId: string;
  localDate: string;
}

const DAY_MS = 86_400_000;

/** The calendar date of an instant in an IANA time zone. */
export function localDateIn(instant: Date, timeZone: string): string {
  // en-CA formats as YYYY-MM-DD.
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(instant);
}

export function addDays(date: string, days: number): string {
  return new Date(Date.parse(`${date}T00:00:00Z`) + days * DAY_MS).toISOString().slice(0, 10);
}

/** The Monday of the ISO week holding `date`. */
export function weekStartOf(date: string): string {
  const weekday = new Date(`${date}T00:00:00Z`).getUTCDay(); // 0 = Sunday
  return addDays(date, -((weekday + 6) % 7));
}

/** The last day practice is asked for: the end date, or the day before the item was ended early. */
export function lastDueDate(item: ScheduledItem): string {
  if (item.endedOn && item.endedOn <= item.endDate) return addDays(item.endedOn, -1);
  return item.endDate;
}

export function isActiveOn(item: ScheduledItem, date: string): boolean {
  return item.startDate <= date && date <= lastDueDate(item);
}

/**
 * Sessions due for one item in the week starting `weekStart`. Daily items: the daily count on each active day. Weekly
 * items: the weekly count, pro-rated by the active days when the item starts or ends inside the week and rounded to
 * the nearest whole session (our own rule, so a program starting on a Sunday does not ask for a whole week's sessions
 * in one day).
 */
export function dueInWeek(item: ScheduledItem, weekStart: string): number {
  let activeDays = 0;
  for (let i = 0; i < 7; i++) if (isActiveOn(item, addDays(weekStart, i))) activeDays++;
  if (item.period === "day") return item.sessionsPerPeriod * activeDays;
  return Math.round((item.sessionsPerPeriod * activeDays) / 7);
}

export function dueOnDay(item: ScheduledItem, date: string): number {
  return item.period === "day" && isActiveOn(item, date) ? item.sessionsPerPeriod : 0;
}

export interface WeekAdherence {
  weekStart: string;
  due: number;
  done: number;
}

/**
 * Done against due for each week from the item's first week to the week holding `today` (later weeks are not yet
 * due). A session counts in the week of its clinic-local date; sessions beyond what was due still count as done.
 */
export function weeklyAdherence(item: ScheduledItem, sessions: readonly DoneSession[], today: string): WeekAdherence[] {
  const out: WeekAdherence[] = [];
  const last = weekStartOf(today < lastDueDate(item) ? today : lastDueDate(item));
  for (let week = weekStartOf(item.startDate); week <= last; week = addDays(week, 7)) {
    const end = addDays(week, 6);
    const done = sessions.filter((s) => s.itemId === item.id && s.localDate >= week && s.localDate <= end).length;
    out.push({ weekStart: week, due: dueInWeek(item, week), done });
  }
  return out;
}

/** Whether an item still asks for practice today: active, and fewer sessions done than due today (daily) or this week (weekly). */
export function stillDueToday(item: ScheduledItem, sessions: readonly DoneSession[], today: string): boolean {
  if (!isActiveOn(item, today)) return false;
  const mine = sessions.filter((s) => s.itemId === item.id);
  if (item.period === "day") return mine.filter((s) => s.localDate === today).length < item.sessionsPerPeriod;
  const week = weekStartOf(today);
  const end = addDays(week, 6);
  return mine.filter((s) => s.localDate >= week && s.localDate <= end).length < dueInWeek(item, week);
}

export interface CalendarDay {
  date: string;
  /** Sessions due that day from daily items. */
  dueDaily: number;
  done: number;
}

export interface CalendarWeek {
  weekStart: string;
  days: CalendarDay[];
  /** Weekly items: sessions due in this week and done in it. */
  dueWeekly: number;
  doneWeekly: number;
}

/** The current and following weeks, day by day, for the client's own calendar. */
export function practiceCalendar(items: readonly ScheduledItem[], sessions: readonly DoneSession[], today: string, weeks = 2): CalendarWeek[] {
  const byId = new Map(items.map((i) => [i.id, i]));
  const out: CalendarWeek[] = [];
  for (let w = 0; w < weeks; w++) {
    const weekStart = addDays(weekStartOf(today), 7 * w);
    const days: CalendarDay[] = [];
    for (let d = 0; d < 7; d++) {
      const date = addDays(weekStart, d);
      days.push({
        date,
        dueDaily: items.reduce((n, i) => n + dueOnDay(i, date), 0),
        done: sessions.filter((s) => s.localDate === date && byId.has(s.itemId)).length,
      });
    }
    const weekly = items.filter((i) => i.period === "week");
    const end = addDays(weekStart, 6);
    out.push({
      weekStart,
      days,
      dueWeekly: weekly.reduce((n, i) => n + dueInWeek(i, weekStart), 0),
      doneWeekly: sessions.filter((s) => s.localDate >= weekStart && s.localDate <= end && byId.get(s.itemId)?.period === "week").length,
    });
  }
  return out;
}
