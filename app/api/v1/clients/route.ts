import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { listClients } from "@/db/queries/clients";
import { auditActorEvent } from "@/lib/audit";
import { CLIENT_EDITORS, clientJson, createClientFor, STAFF } from "@/lib/clients";
import { readJson, route } from "@/lib/http";
import { clientInputSchema, clientListQuerySchema } from "@/lib/validation/client";

export const GET = route(STAFF, async ({ actor, request }) => {
  const params = Object.fromEntries(new URL(request.url).searchParams);
  const query = clientListQuerySchema.parse(params);
  const db = getDb();
  const page = await listClients(db, actor.clinicId, query);
  await auditActorEvent(db, actor, {
    action: "client.list",
    detail: { q: query.q ?? null, page: query.page, count: page.rows.length },
  });
  return NextResponse.json(page);
});

export const POST = route(CLIENT_EDITORS, async ({ actor, request }) => {
  const input = clientInputSchema.parse(await readJson(request));
  const created = await createClientFor(getDb(), actor, input);
  return NextResponse.json(clientJson(created), { status: 201 });
});
