import { NextResponse } from "next/server";
import { chartContext, CHART_STAFF } from "@/lib/chart/access";
import { recordInPersonResult } from "@/lib/chart/record";
import { inPersonResultSchema } from "@/lib/chart/schemas";
import { readJson, route } from "@/lib/http";

type Params = { id: string };

/** Resisted and palpation grades and grip/pinch readings from one in-person session, in one transaction. */
export const POST = route<Params>(CHART_STAFF, async ({ actor, request, params }) => {
  const { db, ctx } = await chartContext(actor, params.id, request, "api.in_person.record");
  const input = inPersonResultSchema.parse(await readJson(request));
  return NextResponse.json(await recordInPersonResult(db, ctx, input), { status: 201 });
});
