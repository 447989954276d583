// The clinic's follow-up queue (every open in-person need, grouped by client) and scheduling an in-person test.
import { and, eq } from "drizzle-orm";
import type { Database } from "@/db";
import { listQueueClients, listUpcomingInPerson, setPlannedTests } from "@/db/queries/follow-ups";
import { clients, clinics, users, type Visit } from "@/db/schema";
import type { Actor } from "@/lib/auth/guard";
import { auditActorEvent } from "@/lib/audit";
import { BadRequest } from "@/lib/http";
import { scheduleVisit } from "@/lib/visits/service";
import { formatInZone, zonedToUtc } from "@/lib/visits/time";
import { cachedChart } from "./chart";
import { REASON_LABELS, REASON_URGENCY, resistancePrecaution, rowKey, rowLabel, type OpenNeed } from "./model";
import type { AppointmentInput } from "./schemas";

export interface QueueNeed {
  key: string;
  motion: string;
  side: "left" | "right";
  digit: string | null;
  label: string;
  needs: OpenNeed[];
  /** Already planned in an upcoming in-person visit. */
  scheduledVisitId: string | null;
}

export interface QueueGroup {
  clientId: string;
  clientName: string;
  affectedSide: string;
  /** The earliest date all of this client's resisted needs may be tested (precaution), or today. */
  earliestDate: string;
  /** Resisted testing waits for the surgeon's clearance, with no date on file. */
  awaitingClearance: boolean;
  urgency: number;
  oldestSince: number | null;
  items: QueueNeed[];
  upcoming: { id: string; startsAt: string; when: string; location: string | null; plannedTests: number }[];
}

/**
 * Groups sort by urgency (palpation before resistance before checks of the camera reading), then by the earliest
 * date a precaution allows, then by how long the need has waited.
 */
export function sortQueue(groups: QueueGroup[]): QueueGroup[] {
  return [...groups].sort(
    (a, b) =>
      b.urgency - a.urgency ||
      Number(a.awaitingClearance) - Number(b.awaitingClearance) ||
      a.earliestDate.localeCompare(b.earliestDate) ||
      (a.oldestSince ?? Infinity) - (b.oldestSince ?? Infinity) ||
      a.clientName.localeCompare(b.clientName),
  );
}

export async function buildQueue(db: Database, clinicId: string, today: string, now = new Date()): Promise<QueueGroup[]> {
  const [clinic] = await db.select().from(clinics).where(eq(clinics.id, clinicId));
  const [people, upcoming] = await Promise.all([listQueueClients(db, clinicId), listUpcomingInPerson(db, { clinicId, from: new Date(now.getTime() - 2 * 3600_000) })]);
  const groups: QueueGroup[] = [];
  for (const client of people) {
    const chart = await cachedChart(db, client, { today });
    const open = chart.rows.filter((r) => r.needs.length > 0);
    if (open.length === 0) continue;
    const visitsOfClient = upcoming.filter((v) => v.clientId === client.id);
    const planned = new Map<string, string>();
    for (const v of visitsOfClient) for (const t of v.plannedTests ?? []) if (!planned.has(rowKey(t))) planned.set(rowKey(t), v.id);
    const precaution = resistancePrecaution(client, today);
    const needsResistance = open.some((r) => r.needs.some((n) => n.reason === "resistance"));
    const sinces = open.flatMap((r) => r.needs.map((n) => n.since)).filter((s): s is number => s !== null);
    groups.push({
      clientId: client.id,
      clientName: `${client.givenName} ${client.familyName}`,
      affectedSide: client.affectedSide,
      earliestDate: needsResistance && precaution.notBefore ? precaution.notBefore : today,
      awaitingClearance: needsResistance && precaution.active && !precaution.notBefore,
      urgency: Math.max(...open.flatMap((r) => r.needs.map((n) => REASON_URGENCY[n.reason]))),
      oldestSince: sinces.length ? Math.min(...sinces) : null,
      items: open.map((r) => ({ key: r.key, motion: r.motion, side: r.side, digit: r.digit, label: r.label, needs: r.needs, scheduledVisitId: planned.get(r.key) ?? null })),
      upcoming: visitsOfClient.map((v) => ({
        id: v.id,
        startsAt: v.startsAt.toISOString(),
        when: formatInZone(v.startsAt, clinic.timezone),
        location: v.location,
        plannedTests: v.plannedTests?.length ?? 0,
      })),
    });
  }
  return sortQueue(groups);
}

export function describePlannedTests(tests: AppointmentInput["plannedTests"]): string {
  return `In-person tests: ${tests.map((t) => `${rowLabel(t)} (${t.side})`).join("; ")}`;
}

/**
 * Books an in-person test through the visit service (which checks the therapist's calendar and e-mails the
 * invitation with its calendar file), then records which motions it is for. Resisted tests are never booked before
 * the date a precaution allows.
 */
export async function scheduleInPersonTest(db: Database, actor: Actor, input: AppointmentInput, today: string, now = new Date()): Promise<{ visit: Visit; invited: boolean; inviteProblem?: string }> {
  const [clinic] = await db.select().from(clinics).where(eq(clinics.id, actor.clinicId));
  const queue = await buildQueue(db, actor.clinicId, today, now);
  const group = queue.find((g) => g.clientId === input.clientId);
  const startsAt = zonedToUtc(input.startsAtLocal, clinic.timezone);
  if (group) {
    const wanted = new Set(input.plannedTests.map(rowKey));
    const resisted = group.items.some((i) => wanted.has(i.key) && i.needs.some((n) => n.reason === "resistance"));
    const startDay = input.startsAtLocal.slice(0, 10);
    if (resisted && startDay < group.earliestDate) {
      throw new BadRequest("A precaution forbids resisted testing before that date.", {
        startsAtLocal: `expected ${group.earliestDate} or later: ${REASON_LABELS.precaution.toLowerCase()} on the record`,
      });
    }
  }
  let therapistId = input.therapistId;
  if (!therapistId) {
    const [client] = await db.select({ primaryTherapistId: clients.primaryTherapistId }).from(clients).where(and(eq(clients.id, input.clientId), eq(clients.clinicId, actor.clinicId)));
    therapistId = actor.role === "therapist" ? actor.userId : (client?.primaryTherapistId ?? null);
  }
  if (!therapistId) throw new BadRequest("Choose the therapist who will test.", { therapistId: "expected a therapist's id" });
  const [therapist] = await db.select({ id: users.id }).from(users).where(and(eq(users.id, therapistId), eq(users.clinicId, actor.clinicId)));
  if (!therapist) throw new BadRequest("Choose the therapist who will test.", { therapistId: "expected a therapist of this clinic" });

  const result = await scheduleVisit(
    db,
    actor,
    {
      clientId: input.clientId,
      therapistId,
      kind: "in_person",
      startsAt: input.startsAtLocal,
      durationMin: input.durationMin,
      reason: describePlannedTests(input.plannedTests),
      location: input.location,
    },
    now,
  );
  await db.transaction(async (tx) => {
    await setPlannedTests(tx, result.visit.id, input.plannedTests);
    await auditActorEvent(tx, actor, {
      action: "follow_up.schedule",
      subjectType: "visit",
      subjectId: result.visit.id,
      clientId: input.clientId,
      detail: { plannedTests: input.plannedTests, startsAt: startsAt.toISOString() },
    });
  });
  return { ...result, visit: { ...result.visit, plannedTests: input.plannedTests } };
}
