import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { requestAddress, requireClientRecord } from "@/lib/auth/guard";
import { CLIENT_EDITORS, clientJson, STAFF, updateClientFor } from "@/lib/clients";
import { readJson, route } from "@/lib/http";
import { clientPatchSchema } from "@/lib/validation/client";

type Params = { id: string };

export const GET = route<Params>([...STAFF, "client"], async ({ actor, request, params }) => {
  const record = await requireClientRecord(actor, params.id, { address: requestAddress(request.headers), purpose: "api" });
  return NextResponse.json(clientJson(record));
});

export const PATCH = route<Params>(CLIENT_EDITORS, async ({ actor, request, params }) => {
  await requireClientRecord(actor, params.id, { address: requestAddress(request.headers), purpose: "api.update" });
  const patch = clientPatchSchema.parse(await readJson(request));
  const updated = await updateClientFor(getDb(), actor, params.id, patch);
  return NextResponse.json(clientJson(updated));
});
