import { NextResponse } from "next/server";
import { z } from "zod";
import type { Role } from "@/db/schema";
import { AccessError, requireActor, type Actor } from "@/lib/auth/guard";

/** Field path → message, e.g. `{ "dateOfBirth": "expected a date as YYYY-MM-DD" }`. */
export function fieldErrors(error: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "_";
    out[key] ??= issue.message;
  }
  return out;
}

export class BadRequest extends Error {
  constructor(
    message: string,
    public readonly fields: Record<string, string> = {},
  ) {
    super(message);
  }
}

export function errorResponse(error: unknown): NextResponse {
  if (error instanceof AccessError) return NextResponse.json({ error: error.message }, { status: error.status });
  if (error instanceof z.ZodError) {
    const fields = fieldErrors(error);
    const summary = Object.entries(fields)
      .map(([k, v]) => `${k}: ${v}`)
      .join("; ");
    return NextResponse.json({ error: `Invalid input (${summary})`, fields }, { status: 400 });
  }
  if (error instanceof BadRequest) return NextResponse.json({ error: error.message, fields: error.fields }, { status: 400 });
  console.error(error);
  return NextResponse.json({ error: "Something went wrong on the server; nothing was saved." }, { status: 500 });
}

/** Reads a JSON body; a body that is not JSON is a 400 that says so. */
export async function readJson(request: Request): Promise<unknown> {
  try {
    return await request.json();
  } catch {
    throw new BadRequest("The request body must be JSON.", { _: "expected a JSON object" });
  }
}

export interface RouteContext<P> {
  actor: Actor;
  request: Request;
  params: P;
}

/**
 * Every route handler goes through this: session and role first (401/403), then the handler, whose errors become
 * JSON answers with a message (400 names the fields).
 */
export function route<P = Record<string, never>>(
  roles: readonly Role[],
  handler: (ctx: RouteContext<P>) => Promise<Response>,
) {
  return async (request: Request, context: { params: Promise<P> }): Promise<Response> => {
    try {
      const actor = await requireActor(roles);
      return await handler({ actor, request, params: await context.params });
    } catch (error) {
      return errorResponse(error);
    }
  };
}
