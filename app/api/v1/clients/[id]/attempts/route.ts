import { NextResponse } from "next/server";
import { attemptSeries, listAttempts } from "@/db/queries/attempts";
import { chartContext, CHART_STAFF } from "@/lib/chart/access";
import { attemptListQuerySchema } from "@/lib/chart/schemas";
import { BadRequest, route } from "@/lib/http";

type Params = { id: string };

/** A page of attempts (sort, filter), or with `series=1` one motion row's peak and arc over time for the chart. */
export const GET = route<Params>(CHART_STAFF, async ({ actor, request, params }) => {
  const { db, client } = await chartContext(actor, params.id, request, "api.attempts");
  const q = attemptListQuerySchema.parse(Object.fromEntries(new URL(request.url).searchParams));
  if (q.series) {
    if (!q.motion || !q.side || q.digit === undefined) {
      throw new BadRequest("A series needs one motion row.", { motion: "expected motion, side and digit (none for the wrist) with series=1" });
    }
    const points = await attemptSeries(db, { clinicId: actor.clinicId, clientId: client.id }, { motion: q.motion, side: q.side, digit: q.digit });
    return NextResponse.json({ points });
  }
  return NextResponse.json(await listAttempts(db, actor.clinicId, client.id, q));
});
