import { NextResponse } from "next/server";
import { chartContext, CHART_STAFF } from "@/lib/chart/access";
import { buildChart } from "@/lib/chart/chart";
import { chartBundle } from "@/lib/fhir/export";
import { route } from "@/lib/http";

type Params = { id: string };

/** Grades and angles as an HL7 FHIR R4 Bundle (type collection) of Observations, for record systems that import FHIR. */
export const GET = route<Params>(CHART_STAFF, async ({ actor, request, params }) => {
  const { db, client, today } = await chartContext(actor, params.id, request, "api.fhir.export");
  const bundle = chartBundle(client, await buildChart(db, client, { today }));
  return NextResponse.json(bundle, {
    headers: { "content-type": "application/fhir+json; fhirVersion=4.0", "content-disposition": `attachment; filename="kinarc-${client.id}.fhir.json"` },
  });
});
