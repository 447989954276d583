import { z } from "zod";
import type { Role } from "@/db/schema";
import { AccessError, requireActor, type Actor } from "@/lib/auth/guard";
import { BadRequest, fieldErrors } from "@/lib/http";

/** What every form's server action returns: a message and per-field errors to show inline. */
export interface FormState {
  ok?: boolean;
  message?: string;
  fields?: Record<string, string>;
  values?: Record<string, unknown>;
}

/**
 * Every server action goes through this: session and role are checked before the input is read; validation and
 * access errors become a form state instead of an exception. Next's redirect and notFound signals pass through.
 */
export async function guardedAction(roles: readonly Role[], body: (actor: Actor) => Promise<FormState>): Promise<FormState> {
  let actor: Actor;
  try {
    actor = await requireActor(roles);
  } catch (error) {
    if (error instanceof AccessError) return { ok: false, message: error.message };
    throw error;
  }
  try {
    return await body(actor);
  } catch (error) {
    if (error instanceof z.ZodError) return { ok: false, message: "Check the highlighted fields.", fields: fieldErrors(error) };
    if (error instanceof BadRequest) return { ok: false, message: "Check the highlighted fields.", fields: error.fields };
    if (error instanceof AccessError) return { ok: false, message: error.message };
    throw error;
  }
}
