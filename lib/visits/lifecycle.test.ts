import { describe, expect, it } from "vitest";
import { canMove, joinRefusal, roomNameFor } from "./lifecycle";

describe("visit lifecycle", () => {
  it("allows the normal path and refuses going back", () => {
    expect(canMove("scheduled", "waiting")).toBe(true);
    expect(canMove("waiting", "in_progress")).toBe(true);
    expect(canMove("in_progress", "finished")).toBe(true);
    expect(canMove("finished", "in_progress")).toBe(false);
    expect(canMove("in_progress", "cancelled")).toBe(false);
    expect(canMove("cancelled", "scheduled")).toBe(false);
  });

  it("opens joining 15 minutes early and closes 30 minutes after the planned end", () => {
    const v = { status: "scheduled" as const, startsAt: new Date("2026-12-03T14:00:00Z"), durationMin: 45 };
    expect(joinRefusal(v, new Date("2026-12-03T13:44:00Z"))).toMatch(/opens 15 minutes before/);
    expect(joinRefusal(v, new Date("2026-12-03T13:46:00Z"))).toBeNull();
    expect(joinRefusal(v, new Date("2026-12-03T15:14:00Z"))).toBeNull();
    expect(joinRefusal(v, new Date("2026-12-03T15:16:00Z"))).toMatch(/passed/);
    expect(joinRefusal({ ...v, status: "in_progress" }, new Date("2026-12-03T18:00:00Z"))).toBeNull();
    expect(joinRefusal({ ...v, status: "finished" }, new Date("2026-12-03T14:10:00Z"))).toMatch(/ended/);
  });

  it("names the room after the visit", () => {
    expect(roomNameFor("abc")).toBe("visit-abc");
  });
});
