import { and, eq, inArray, lt } from "drizzle-orm";
import type { Database } from "@/db";
import { getClient } from "@/db/queries/clients";
import { getVisit, getVisitDetail, listRemindersDue, updateVisit, type VisitDetail } from "@/db/queries/visits";
import { clinics, users, visits, type Visit, type VisitStatus } from "@/db/schema";
import { auditActorEvent, recordAudit } from "@/lib/audit";
import { AccessError, NOT_FOUND, type Actor } from "@/lib/auth/guard";
import { env } from "@/lib/env";
import { BadRequest } from "@/lib/http";
import { renderMessage, sendMail } from "@/lib/mail";
import type { ScheduleVisitInput } from "@/lib/validation/visit";
import { visitIcs } from "./calendar";
import { canMove, JOIN_LATE_MS } from "./lifecycle";
import { formatInZone, zonedToUtc } from "./time";

export const visitUrl = (visitId: string) => `${env().APP_URL}/visits/${visitId}`;

/** Schedules a visit (one transaction with its audit event), then e-mails the invitation. */
export async function scheduleVisit(db: Database, actor: Actor, input: ScheduleVisitInput, now = new Date()): Promise<{ visit: Visit; invited: boolean; inviteProblem?: string }> {
  const [clinic] = await db.select().from(clinics).where(eq(clinics.id, actor.clinicId));
  const startsAt = zonedToUtc(input.startsAt, clinic.timezone);
  if (Number.isNaN(startsAt.getTime())) throw new BadRequest("Invalid input", { startsAt: "expected a real date and time" });
  if (startsAt.getTime() < now.getTime() - 5 * 60_000) throw new BadRequest("Invalid input", { startsAt: "expected a time in the future" });
  const client = await getClient(db, actor.clinicId, input.clientId);
  if (!client || client.archivedAt) throw new BadRequest("Invalid input", { clientId: "expected a current client of this clinic" });
  const [therapist] = await db
    .select()
    .from(users)
    .where(and(eq(users.id, input.therapistId), eq(users.clinicId, actor.clinicId), eq(users.role, "therapist"), eq(users.active, true)));
  if (!therapist) throw new BadRequest("Invalid input", { therapistId: "expected an active therapist of this clinic" });
  if (input.kind === "in_person" && !input.location) throw new BadRequest("Invalid input", { location: "required for an in-person visit" });

  const visit = await db.transaction(async (tx) => {
    // A therapist cannot be in two open visits at once.
    const endsAt = new Date(startsAt.getTime() + input.durationMin * 60_000);
    const overlapping = await tx
      .select({ id: visits.id, startsAt: visits.startsAt, durationMin: visits.durationMin })
      .from(visits)
      .where(and(eq(visits.therapistId, therapist.id), inArray(visits.status, ["scheduled", "waiting", "in_progress"]), lt(visits.startsAt, endsAt)));
    if (overlapping.some((v) => v.startsAt.getTime() + v.durationMin * 60_000 > startsAt.getTime())) {
      throw new BadRequest("Invalid input", { startsAt: `${therapist.name ?? "The therapist"} already has a visit at that time` });
    }
    const [row] = await tx
      .insert(visits)
      .values({
        clinicId: actor.clinicId,
        clientId: client.id,
        therapistId: therapist.id,
        kind: input.kind,
        startsAt,
        durationMin: input.durationMin,
        reason: input.reason,
        location: input.location ?? null,
        createdByUserId: actor.userId,
      })
      .returning();
    await auditActorEvent(tx, actor, {
      action: "visit.schedule",
      subjectType: "visit",
      subjectId: row.id,
      clientId: client.id,
      detail: { kind: input.kind, startsAt: startsAt.toISOString() },
    });
    return row;
  });
  const sent = await sendVisitMail(db, visit.id, "invitation");
  return { visit, invited: sent.ok, inviteProblem: sent.problem };
}

type MailKind = "invitation" | "reminder" | "cancellation";

function visitMessage(kind: MailKind, d: VisitDetail) {
  const when = formatInZone(d.visit.startsAt, d.clinicTimezone);
  const video = d.visit.kind === "video";
  const what = video ? `a video visit with ${d.therapistName}` : `an appointment with ${d.therapistName}${d.visit.location ? ` at ${d.visit.location}` : ""}`;
  const url = visitUrl(d.visit.id);
  if (kind === "cancellation") {
    return {
      subject: `Cancelled: your visit on ${when}`,
      ...renderMessage({ heading: "Your visit is cancelled", paragraphs: [`${d.clinicName} has cancelled ${what} on ${when}.`, "The clinic will contact you about a new time."] }),
    };
  }
  const prepare = video
    ? "Use a phone on a stand or a laptop, in a quiet, well-lit place, with your hand, wrist and forearm free. You will be asked to read and agree to a short consent before your first video visit."
    : "Wear clothing that leaves your forearm free. Bring your splint if you have one.";
  return {
    subject: kind === "invitation" ? `Your hand therapy visit on ${when}` : `Reminder: hand therapy visit ${when}`,
    ...renderMessage({
      heading: kind === "invitation" ? "You have a visit booked" : "Your visit is coming up",
      paragraphs: [
        `${d.clinicName} has booked ${what} on ${when}, for ${d.visit.durationMin} minutes.`,
        ...(d.visit.reason ? [`What it is for: ${d.visit.reason}`] : []),
        prepare,
        "Move only within comfort; stop if pain, swelling or numbness comes on.",
      ],
      action: { label: video ? "Open the visit" : "See the details", url },
    }),
  };
}

/** Sends one visit e-mail with its calendar attachment; records when invitations and reminders went out. */
export async function sendVisitMail(db: Database, visitId: string, kind: MailKind): Promise<{ ok: boolean; problem?: string }> {
  const d = await getVisitDetail(db, visitId);
  if (!d) return { ok: false, problem: "no such visit" };
  if (!d.clientEmail) return { ok: false, problem: "the client has no e-mail address on file" };
  const ics = visitIcs({
    visitId: d.visit.id,
    kind: d.visit.kind,
    startsAt: d.visit.startsAt,
    durationMin: d.visit.durationMin,
    clinicName: d.clinicName,
    clinicEmail: d.clinicEmail ?? "no-reply@kinarc.test",
    therapistName: d.therapistName ?? "your therapist",
    clientName: `${d.clientGiven} ${d.clientFamily}`,
    clientEmail: d.clientEmail,
    joinUrl: visitUrl(d.visit.id),
    location: d.visit.location,
    method: kind === "cancellation" ? "CANCEL" : "REQUEST",
    sequence: kind === "cancellation" ? 1 : 0,
  });
  const message = visitMessage(kind, d);
  try {
    await sendMail({
      to: d.clientEmail,
      ...message,
      icalEvent: { method: kind === "cancellation" ? "CANCEL" : "REQUEST", filename: "visit.ics", content: ics },
    });
  } catch (error) {
    return { ok: false, problem: `the mail server refused the message (${error instanceof Error ? error.message : String(error)})` };
  }
  if (kind === "invitation") await updateVisit(db, visitId, { invitationSentAt: new Date() });
  if (kind === "reminder") await updateVisit(db, visitId, { reminderSentAt: new Date() });
  return { ok: true };
}

/** Moves a visit along its life cycle, audited; refuses moves the life cycle does not allow. */
export async function changeVisitStatus(db: Database, actor: Actor, visit: Visit, to: VisitStatus, extra: Partial<Visit> = {}): Promise<Visit> {
  if (!canMove(visit.status, to)) throw new AccessError(403, `A ${visit.status.replace("_", " ")} visit cannot become ${to.replace("_", " ")}.`);
  if (visit.status === to && Object.keys(extra).length === 0) return visit;
  const now = new Date();
  const patch: Partial<Visit> = { ...extra, status: to };
  if (to === "in_progress" && !visit.startedAt) patch.startedAt = now;
  if (to === "finished") patch.endedAt = now;
  await db.transaction(async (tx) => {
    await updateVisit(tx, visit.id, patch);
    await auditActorEvent(tx, actor, {
      action: `visit.${to}`,
      clinicId: visit.clinicId,
      subjectType: "visit",
      subjectId: visit.id,
      clientId: visit.clientId,
    });
  });
  if (to === "cancelled") await sendVisitMail(db, visit.id, "cancellation");
  return { ...visit, ...patch };
}

export const REMINDER_LEAD_MS = 24 * 60 * 60_000;

/**
 * The periodic job: e-mails reminders for visits starting within the next 24 hours (the day before), and marks
 * open visits that were never started as missed once their join window has closed. Safe to run as often as wanted.
 */
export async function runVisitJobs(db: Database, now = new Date()): Promise<{ reminded: number; missed: number }> {
  let reminded = 0;
  for (const { id } of await listRemindersDue(db, now, new Date(now.getTime() + REMINDER_LEAD_MS))) {
    if ((await sendVisitMail(db, id, "reminder")).ok) reminded++;
  }
  const stale = await db
    .select()
    .from(visits)
    .where(and(inArray(visits.status, ["scheduled", "waiting"]), lt(visits.startsAt, new Date(now.getTime() - JOIN_LATE_MS))));
  let missed = 0;
  for (const v of stale) {
    if (v.startsAt.getTime() + v.durationMin * 60_000 + JOIN_LATE_MS < now.getTime()) {
      await db.transaction(async (tx) => {
        await updateVisit(tx, v.id, { status: "missed" });
        await recordAudit(tx, { action: "visit.missed", clinicId: v.clinicId, subjectType: "visit", subjectId: v.id, clientId: v.clientId });
      });
      missed++;
    }
  }
  return { reminded, missed };
}

/** Loads a visit the actor takes part in: the client of the visit, its therapist, or (for staff views) clinic staff. */
export async function requireVisit(db: Database, actor: Actor, visitId: string, mode: "participant" | "staff"): Promise<Visit> {
  const visit = await getVisit(db, actor.clinicId, visitId);
  if (!visit) throw new AccessError(404, NOT_FOUND);
  if (actor.role === "client") {
    if (visit.clientId !== actor.clientId) throw new AccessError(404, NOT_FOUND);
    return visit;
  }
  if (mode === "participant" && visit.therapistId !== actor.userId) {
    throw new AccessError(403, "Only the visit's therapist and client can join it.");
  }
  return visit;
}
