// The practice schedule against date-fns (an outside reference for ISO weeks and calendar days) and Intl's zone data.
import { addDays as dfAddDays, eachDayOfInterval, formatISO, max as dfMax, min as dfMin, parseISO, startOfISOWeek } from "date-fns";
import { describe, expect, it } from "vitest";
import { dueInWeek, localDateIn, practiceCalendar, stillDueToday, weeklyAdherence, weekStartOf, type ScheduledItem } from "./schedule";

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
