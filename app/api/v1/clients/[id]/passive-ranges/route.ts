import { NextResponse } from "next/server";
import { listPassiveRanges } from "@/db/queries/passive-ranges";
import { chartContext, CHART_STAFF } from "@/lib/chart/access";
import { recordPassiveRange } from "@/lib/chart/record";
import { passiveRangeSchema } from "@/lib/chart/schemas";
import { readJson, route } from "@/lib/http";

type Params = { id: string };

export const GET = route<Params>(CHART_STAFF, async ({ actor, request, params }) => {
  const { db, client } = await chartContext(actor, params.id, request, "api.passive_ranges");
  return NextResponse.json({ passiveRanges: await listPassiveRanges(db, actor.clinicId, client.id) });
});

/** The therapist's goniometer reading, which becomes the reference for "full range" of that motion. */
export const POST = route<Params>(CHART_STAFF, async ({ actor, request, params }) => {
  const { db, ctx } = await chartContext(actor, params.id, request, "api.passive_ranges.record");
  const input = passiveRangeSchema.parse(await readJson(request));
  return NextResponse.json(await recordPassiveRange(db, ctx, input), { status: 201 });
});
