import { NextResponse } from "next/server";
import { getDb } from "@/db";
import type { Visit } from "@/db/schema";
import { AccessError } from "@/lib/auth/guard";
import { readJson, route } from "@/lib/http";
import { changeVisitStatus, requireVisit } from "@/lib/visits/service";
import { buildVisitSummary } from "@/lib/visits/summary";
import { visitStatusChangeSchema } from "@/lib/validation/visit";

type Params = { id: string };

const visitJson = (v: Visit) => ({
  id: v.id,
  clientId: v.clientId,
  therapistId: v.therapistId,
  kind: v.kind,
  status: v.status,
  startsAt: v.startsAt.toISOString(),
  durationMin: v.durationMin,
  reason: v.reason,
  location: v.location,
});

export const GET = route<Params>(["admin", "therapist", "assistant", "client"], async ({ actor, params }) => {
  const visit = await requireVisit(getDb(), actor, params.id, "staff");
  return NextResponse.json(visitJson(visit));
});

/** Cancel (therapists and admins), or finish with notes (the visit's therapist). */
export const PATCH = route<Params>(["admin", "therapist"], async ({ actor, request, params }) => {
  const db = getDb();
  const input = visitStatusChangeSchema.parse(await readJson(request));
  const visit = await requireVisit(db, actor, params.id, input.status === "cancelled" ? "staff" : "participant");
  if (input.status !== "cancelled" && actor.role !== "therapist") throw new AccessError(403, "Only the visit's therapist can change that.");
  const extra: Partial<Visit> = input.notes !== undefined ? { notes: input.notes } : {};
  // Ending a visit freezes its summary: the attempts kept and the grades they support at that moment.
  if (input.status === "finished") extra.summary = { ...(await buildVisitSummary(db, { ...visit, ...extra })) };
  const updated = await changeVisitStatus(db, actor, visit, input.status, extra);
  return NextResponse.json(visitJson(updated));
});
