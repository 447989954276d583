/** The home program as JSON for `GET /api/v1/clients/:id/program`: the full view for clinicians, the client's own for a client. */
import type { Database } from "@/db";
import { getClinic } from "@/db/queries/clinics";
import type { HomeProgramItem } from "@/db/schema";
import { assertRole, requireClientRecord, type Actor } from "@/lib/auth/guard";
import { RANGE_TABLE_IDS, type RangeTableId } from "@/lib/motions/catalog";
import { PROGRAM_READERS } from "./manage";
import { clientPractice, programOverview } from "./program";

export function programItemJson(item: HomeProgramItem) {
  return {
    id: item.id,
    motion: item.motion,
    side: item.side,
    digit: item.digit,
    condition: item.condition,
    repetitions: item.repetitions,
    sessionsPerPeriod: item.sessionsPerPeriod,
    period: item.period,
    startDate: item.startDate,
    endDate: item.endDate,
    notes: item.notes,
    endedAt: item.endedAt?.toISOString() ?? null,
  };
}

export async function readProgramFor(db: Database, actor: Actor, clientId: string, opts: { now?: Date; address?: string | null } = {}) {
  assertRole(actor, PROGRAM_READERS);
  const client = await requireClientRecord(actor, clientId, { db, address: opts.address, purpose: "program.read" });
  const clinic = await getClinic(db, client.clinicId);
  const timeZone = clinic?.timezone ?? "UTC";
  const now = opts.now ?? new Date();
  if (actor.role === "client") {
    // The client's own view: what is offered today and the calendar; no trend notes or staff fields.
    const mine = await clientPractice(db, client, { now, timeZone });
    return { view: "client" as const, today: mine.today, items: mine.items.map((t) => ({ ...programItemJson(t.item), label: t.label, due: t.due, doneToday: t.doneToday })), calendar: mine.calendar };
  }
  const rangeTable = (RANGE_TABLE_IDS as readonly string[]).includes(clinic?.normTable ?? "") ? (clinic!.normTable as RangeTableId) : "aaos1965";
  const overview = await programOverview(db, client, { now, timeZone, rangeTable });
  return {
    view: "staff" as const,
    today: overview.today,
    items: overview.items.map((v) => ({
      ...programItemJson(v.item),
      label: v.label,
      status: v.status,
      blockedReason: v.blockedReason,
      adherence: v.adherence,
      thisWeek: v.thisWeek,
      sessions: v.readings.map((r) => ({ sessionId: r.sessionId, startedAt: r.startedAt.toISOString(), bestDeg: r.bestDeg, uncertaintyDeg: r.uncertaintyDeg })),
      trend: v.trend,
    })),
  };
}
