import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { route } from "@/lib/http";
import { requireVisit } from "@/lib/visits/service";
import { buildVisitSummary } from "@/lib/visits/summary";

type Params = { id: string };

/** The visit's kept attempts and the range-based grade proposed from them (therapists and assistants of the clinic). */
export const GET = route<Params>(["therapist", "assistant"], async ({ actor, params }) => {
  const db = getDb();
  const visit = await requireVisit(db, actor, params.id, "staff");
  return NextResponse.json(await buildVisitSummary(db, visit));
});
