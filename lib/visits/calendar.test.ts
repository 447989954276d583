import ICAL from "ical.js";
import { describe, expect, it } from "vitest";
import { visitIcs } from "./calendar";

// Parsed with ical.js, a general-purpose RFC 5545 parser from the registry, not with our own code.
describe("visitIcs", () => {
  const base = {
    visitId: "7d1c6f1e-5b7a-4e55-9a55-0d3c2b1a0f00",
    kind: "video" as const,
    startsAt: new Date("2026-12-03T14:00:00Z"),
    durationMin: 45,
    clinicName: "Saltmarsh Hand Therapy",
    clinicEmail: "desk@saltmarsh.kinarc.test",
    therapistName: "Tomasz Reyes",
    clientName: "Dorian Vale",
    clientEmail: "client@kinarc.test",
    joinUrl: "http://localhost:3000/visits/7d1c6f1e-5b7a-4e55-9a55-0d3c2b1a0f00",
  };

  it("is a valid RFC 5545 event with the visit's time, length, attendee and a reminder", () => {
    const cal = new ICAL.Component(ICAL.parse(visitIcs(base)));
    expect(cal.getFirstPropertyValue("method")).toBe("REQUEST");
    const vevent = cal.getFirstSubcomponent("vevent")!;
    const event = new ICAL.Event(vevent);
    expect(event.uid).toBe(`${base.visitId}@kinarc`);
    expect(event.startDate.toJSDate().toISOString()).toBe("2026-12-03T14:00:00.000Z");
    expect(event.endDate.toJSDate().toISOString()).toBe("2026-12-03T14:45:00.000Z");
    expect(event.summary).toMatch(/Tomasz Reyes/);
    expect(String(vevent.getFirstPropertyValue("attendee")).toLowerCase()).toBe("mailto:client@kinarc.test");
    expect(vevent.getFirstSubcomponent("valarm")?.getFirstPropertyValue("trigger")?.toString()).toBe("-PT30M");
  });

  it("cancels with the same UID so calendars remove the event", () => {
    const cal = new ICAL.Component(ICAL.parse(visitIcs({ ...base, method: "CANCEL", sequence: 1 })));
    expect(cal.getFirstPropertyValue("method")).toBe("CANCEL");
    const vevent = cal.getFirstSubcomponent("vevent")!;
    expect(vevent.getFirstPropertyValue("status")).toBe("CANCELLED");
    expect(vevent.getFirstPropertyValue("uid")).toBe(`${base.visitId}@kinarc`);
  });
});
