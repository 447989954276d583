import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { currentTelehealthConsent, signTelehealthConsent } from "@/lib/consent/store";
import { TELEHEALTH_CONSENT } from "@/lib/consent/telehealth";
import { requestAddress } from "@/lib/auth/guard";
import { BadRequest, readJson, route } from "@/lib/http";
import { consentSchema } from "@/lib/validation/visit";

/** The client's own telehealth consent: its text, and whether the current version is signed. */
export const GET = route(["client"], async ({ actor }) => {
  const signed = await currentTelehealthConsent(getDb(), actor.clientId!);
  return NextResponse.json({ consent: TELEHEALTH_CONSENT, signedAt: signed?.signedAt.toISOString() ?? null });
});

export const POST = route(["client"], async ({ actor, request }) => {
  const input = consentSchema.parse(await readJson(request));
  if (input.version !== TELEHEALTH_CONSENT.version) {
    throw new BadRequest("The consent text has changed; please read the new version.", { version: `expected ${TELEHEALTH_CONSENT.version}` });
  }
  const row = await signTelehealthConsent(getDb(), actor, input.signedName, requestAddress(request.headers));
  return NextResponse.json({ signedAt: row.signedAt.toISOString(), version: row.version }, { status: 201 });
});
