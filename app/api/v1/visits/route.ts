import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { listVisits } from "@/db/queries/visits";
import { readJson, route } from "@/lib/http";
import { scheduleVisit } from "@/lib/visits/service";
import { scheduleVisitSchema, visitListQuerySchema } from "@/lib/validation/visit";

export const GET = route(["admin", "therapist", "assistant", "client"], async ({ actor, request }) => {
  const q = visitListQuerySchema.parse(Object.fromEntries(new URL(request.url).searchParams));
  const rows = await listVisits(getDb(), {
    clinicId: actor.clinicId,
    // A client sees only their own visits, whatever they ask for.
    clientId: actor.role === "client" ? actor.clientId! : q.clientId,
    from: q.from ? new Date(q.from) : undefined,
    to: q.to ? new Date(q.to) : undefined,
    statuses: q.status ? [q.status] : undefined,
  });
  return NextResponse.json({ visits: rows.map((v) => ({ ...v, startsAt: v.startsAt.toISOString() })) });
});

export const POST = route(["admin", "therapist"], async ({ actor, request }) => {
  const input = scheduleVisitSchema.parse(await readJson(request));
  const { visit, invited, inviteProblem } = await scheduleVisit(getDb(), actor, input);
  return NextResponse.json({ id: visit.id, status: visit.status, startsAt: visit.startsAt.toISOString(), invited, inviteProblem: inviteProblem ?? null }, { status: 201 });
});
