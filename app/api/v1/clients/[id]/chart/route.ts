import { NextResponse } from "next/server";
import { chartContext, CHART_STAFF } from "@/lib/chart/access";
import { cachedChart, clientProgress } from "@/lib/chart/chart";
import { route } from "@/lib/http";

type Params = { id: string };

/** Staff get the whole chart; a client gets the simplified view of their own progress. */
export const GET = route<Params>([...CHART_STAFF, "client"], async ({ actor, request, params }) => {
  const { db, client, today } = await chartContext(actor, params.id, request, "api.chart");
  const empty = new URL(request.url).searchParams.get("rows") === "all";
  const chart = await cachedChart(db, client, { today, emptyRows: empty });
  return NextResponse.json(actor.role === "client" ? clientProgress(chart) : chart);
});
