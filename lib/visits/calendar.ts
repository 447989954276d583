import { createEvent, type EventAttributes } from "ics";

export interface VisitCalendarInput {
  visitId: string;
  kind: "video" | "in_person";
  startsAt: Date;
  durationMin: number;
  clinicName: string;
  clinicEmail: string;
  therapistName: string;
  clientName: string;
  clientEmail: string;
  joinUrl: string;
  location?: string | null;
  /** REQUEST for a new or moved visit, CANCEL when it is called off. */
  method?: "REQUEST" | "CANCEL";
  sequence?: number;
}

/** An RFC 5545 calendar event for a visit, as an e-mail attachment (`text/calendar; method=…`). */
export function visitIcs(v: VisitCalendarInput): string {
  const title = v.kind === "video" ? `Video hand therapy visit with ${v.therapistName}` : `Hand therapy appointment with ${v.therapistName}`;
  const event: EventAttributes = {
    productId: "kinarc/visits",
    uid: `${v.visitId}@kinarc`,
    method: v.method ?? "REQUEST",
    sequence: v.sequence ?? 0,
    status: v.method === "CANCEL" ? "CANCELLED" : "CONFIRMED",
    start: v.startsAt.getTime(),
    startInputType: "utc",
    startOutputType: "utc",
    duration: { minutes: v.durationMin },
    title,
    description:
      v.kind === "video"
        ? `Join from your phone or computer: ${v.joinUrl}\nHave your hand, wrist and forearm in good light. Stop if pain, swelling or numbness comes on.`
        : `At ${v.location ?? v.clinicName}. Details: ${v.joinUrl}`,
    location: v.kind === "video" ? v.joinUrl : (v.location ?? v.clinicName),
    url: v.joinUrl,
    organizer: { name: v.clinicName, email: v.clinicEmail },
    attendees: [{ name: v.clientName, email: v.clientEmail, rsvp: true, role: "REQ-PARTICIPANT", partstat: "NEEDS-ACTION" }],
    alarms: [{ action: "display", description: title, trigger: { minutes: 30, before: true } }],
  };
  const { error, value } = createEvent(event);
  if (error || !value) throw error ?? new Error("calendar event could not be written");
  return value;
}
