import { describe, expect, it } from "vitest";
import { formatInZone, toLocalInput, zonedToUtc } from "./time";

// Offsets from the IANA tz database [common practice]: London is UTC+0 in winter and UTC+1 in summer (BST, from the
// last Sunday of March); New York is UTC-5 in winter; Tokyo is UTC+9 all year.
describe("zonedToUtc", () => {
  it("applies the zone's offset, including summer time", () => {
    expect(zonedToUtc("2026-12-03T14:00", "Europe/London").toISOString()).toBe("2026-12-03T14:00:00.000Z");
    expect(zonedToUtc("2026-07-03T14:00", "Europe/London").toISOString()).toBe("2026-07-03T13:00:00.000Z");
    expect(zonedToUtc("2026-12-03T09:30", "America/New_York").toISOString()).toBe("2026-12-03T14:30:00.000Z");
    expect(zonedToUtc("2026-12-03T23:00", "Asia/Tokyo").toISOString()).toBe("2026-12-03T14:00:00.000Z");
  });
  it("takes explicit offsets as given", () => {
    expect(zonedToUtc("2026-12-03T14:00+02:00", "Europe/London").toISOString()).toBe("2026-12-03T12:00:00.000Z");
  });
  it("round-trips through the form value", () => {
    const instant = zonedToUtc("2027-03-28T10:15", "Europe/London");
    expect(toLocalInput(instant, "Europe/London")).toBe("2027-03-28T10:15");
    expect(formatInZone(instant, "Europe/London")).toMatch(/Sunday,? 28 March 2027.*10:15.*Europe\/London/);
  });
});
