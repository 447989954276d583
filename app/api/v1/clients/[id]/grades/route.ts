import { NextResponse } from "next/server";
import { listGradeEntries } from "@/db/queries/grades";
import { chartContext, CHART_STAFF } from "@/lib/chart/access";
import { recordGrade } from "@/lib/chart/record";
import { gradeInputSchema } from "@/lib/chart/schemas";
import { readJson, route } from "@/lib/http";

type Params = { id: string };

export const GET = route<Params>(CHART_STAFF, async ({ actor, request, params }) => {
  const { db, client } = await chartContext(actor, params.id, request, "api.grades");
  return NextResponse.json({ entries: await listGradeEntries(db, actor.clinicId, client.id) });
});

/**
 * Records a grade: `remote_range` signs the engine's grade from the row's attempts; in-person methods take the
 * therapist's value. With `replacesId` it is a correction (a new entry; the old one stays).
 */
export const POST = route<Params>(CHART_STAFF, async ({ actor, request, params }) => {
  const { db, ctx } = await chartContext(actor, params.id, request, "api.grades.record");
  const input = gradeInputSchema.parse(await readJson(request));
  const entry = await recordGrade(db, ctx, input);
  return NextResponse.json(entry, { status: 201 });
});
