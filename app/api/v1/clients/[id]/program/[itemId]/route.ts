import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { requestAddress } from "@/lib/auth/guard";
import { readJson, route } from "@/lib/http";
import { changeProgramItem, endProgramItemFor, PROGRAM_EDITORS } from "@/lib/practice/manage";
import { programItemJson } from "@/lib/practice/read";

type Params = { id: string; itemId: string };

/** Replaces an item's prescription (the whole item, as when assigning); an ended item cannot be changed. */
export const PATCH = route<Params>(PROGRAM_EDITORS, async ({ actor, request, params }) => {
  const item = await changeProgramItem(getDb(), actor, params.id, params.itemId, await readJson(request), { address: requestAddress(request.headers) });
  return NextResponse.json({ item: programItemJson(item) });
});

/** Ends an item from today; it is kept, with its sessions, so past adherence still reads against what was asked. */
export const DELETE = route<Params>(PROGRAM_EDITORS, async ({ actor, request, params }) => {
  const item = await endProgramItemFor(getDb(), actor, params.id, params.itemId, { address: requestAddress(request.headers) });
  return NextResponse.json({ item: programItemJson(item) });
});
