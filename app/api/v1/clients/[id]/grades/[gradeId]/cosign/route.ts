import { NextResponse } from "next/server";
import { chartContext } from "@/lib/chart/access";
import { cosignGrade } from "@/lib/chart/record";
import { route } from "@/lib/http";

type Params = { id: string; gradeId: string };

/** A therapist co-signs an assistant's entry; a signed entry is never changed (400). */
export const POST = route<Params>(["therapist"], async ({ actor, request, params }) => {
  const { db, ctx } = await chartContext(actor, params.id, request, "api.grades.cosign");
  return NextResponse.json(await cosignGrade(db, ctx, params.gradeId));
});
