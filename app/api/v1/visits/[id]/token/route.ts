import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { AccessError } from "@/lib/auth/guard";
import { currentTelehealthConsent } from "@/lib/consent/store";
import { route } from "@/lib/http";
import { joinRefusal } from "@/lib/visits/lifecycle";
import { changeVisitStatus, requireVisit } from "@/lib/visits/service";
import { visitToken } from "@/lib/visits/token";

type Params = { id: string };

/**
 * A short-lived video token for the visit's own room. Only the visit's client (with the current telehealth consent
 * signed) and its therapist get one, and only while the visit can be joined. Joining moves the visit along: the
 * client to the waiting room, the therapist into the visit.
 */
export const POST = route<Params>(["therapist", "client"], async ({ actor, params }) => {
  const db = getDb();
  const visit = await requireVisit(db, actor, params.id, "participant");
  if (visit.kind !== "video") throw new AccessError(403, "This is an in-person visit; there is no video room.");
  const refusal = joinRefusal(visit, new Date());
  if (refusal) throw new AccessError(403, refusal);
  if (actor.role === "client" && !(await currentTelehealthConsent(db, actor.clientId!))) {
    throw new AccessError(403, "Please read and agree to the telehealth consent before your first video visit.");
  }
  const next = actor.role === "client" ? (visit.status === "scheduled" ? "waiting" : visit.status) : "in_progress";
  await changeVisitStatus(db, actor, visit, next);
  return NextResponse.json(await visitToken(actor, visit));
});
