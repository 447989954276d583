import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { CHART_STAFF } from "@/lib/chart/access";
import { clinicToday } from "@/lib/chart/chart";
import { buildQueue } from "@/lib/chart/follow-ups";
import { route } from "@/lib/http";

/** Every open in-person need across the clinic, grouped by client, most urgent first. */
export const GET = route(CHART_STAFF, async ({ actor }) => {
  const db = getDb();
  const today = await clinicToday(db, actor.clinicId);
  return NextResponse.json({ today, groups: await buildQueue(db, actor.clinicId, today) });
});
