import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { requestAddress } from "@/lib/auth/guard";
import { readJson, route } from "@/lib/http";
import { assignProgramItem, PROGRAM_EDITORS, PROGRAM_READERS } from "@/lib/practice/manage";
import { programItemJson, readProgramFor } from "@/lib/practice/read";

/** The client's home program: adherence and trend for clinicians; today's items and the calendar for the client. */
export const GET = route<{ id: string }>(PROGRAM_READERS, async ({ actor, request, params }) => {
  return NextResponse.json(await readProgramFor(getDb(), actor, params.id, { address: requestAddress(request.headers) }));
});

/** Assigns one item (body as the assign form: motion, side, digit, condition, repetitions, sessionsPerPeriod, period, startDate, endDate, notes). */
export const POST = route<{ id: string }>(PROGRAM_EDITORS, async ({ actor, request, params }) => {
  const item = await assignProgramItem(getDb(), actor, params.id, await readJson(request), { address: requestAddress(request.headers) });
  return NextResponse.json({ item: programItemJson(item) }, { status: 201 });
});
