import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { listUpcomingInPerson } from "@/db/queries/follow-ups";
import { requestAddress, requireClientRecord } from "@/lib/auth/guard";
import { CHART_STAFF } from "@/lib/chart/access";
import { clinicToday } from "@/lib/chart/chart";
import { scheduleInPersonTest } from "@/lib/chart/follow-ups";
import { rowLabel } from "@/lib/chart/model";
import { appointmentSchema } from "@/lib/chart/schemas";
import { readJson, route } from "@/lib/http";

/** Upcoming in-person tests: a client sees their own, staff see the clinic's. */
export const GET = route([...CHART_STAFF, "client"], async ({ actor }) => {
  const db = getDb();
  const rows = await listUpcomingInPerson(db, { clinicId: actor.clinicId, clientId: actor.role === "client" ? actor.clientId! : undefined, from: new Date(Date.now() - 2 * 3600_000) });
  return NextResponse.json({
    appointments: rows.map((v) => ({
      id: v.id,
      clientId: v.clientId,
      startsAt: v.startsAt.toISOString(),
      durationMin: v.durationMin,
      location: v.location,
      status: v.status,
      plannedTests: (v.plannedTests ?? []).map((t) => ({ ...t, label: rowLabel(t) })),
    })),
  });
});

/** Schedules an in-person test from the follow-up queue; the client is e-mailed an invitation with a calendar file. */
export const POST = route(CHART_STAFF, async ({ actor, request }) => {
  const db = getDb();
  const input = appointmentSchema.parse(await readJson(request));
  await requireClientRecord(actor, input.clientId, { db, address: requestAddress(request.headers), purpose: "api.appointments.schedule" });
  const result = await scheduleInPersonTest(db, actor, input, await clinicToday(db, actor.clinicId));
  return NextResponse.json({ id: result.visit.id, startsAt: result.visit.startsAt, invited: result.invited, inviteProblem: result.inviteProblem ?? null }, { status: 201 });
});
