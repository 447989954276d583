import { z } from "zod";

/** A calendar date as YYYY-MM-DD that really exists (2026-02-30 is refused). */
export const isoDate = z
  .string()
  .trim()
  // abort: a malformed string gets only the format message, not the later checks' messages too.
  .regex(/^\d{4}-\d{2}-\d{2}$/, { error: "expected a date as YYYY-MM-DD", abort: true })
  .refine(
    (s) => {
      const d = new Date(`${s}T00:00:00Z`);
      return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
    },
    { error: "expected a real calendar date", abort: true },
  );

export const todayIso = (now = new Date()) => now.toISOString().slice(0, 10);

/**
 * Turns FormData into a plain object for zod: repeated keys (checkbox groups named `x[]`) become arrays, and a
 * checkbox `x` sent as "on" becomes true.
 */
export function formDataToObject(formData: FormData): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [key, value] of formData.entries()) {
    if (key.startsWith("$ACTION")) continue;
    if (typeof value !== "string") continue;
    if (key.endsWith("[]")) {
      const k = key.slice(0, -2);
      out[k] = [...((out[k] as string[] | undefined) ?? []), value];
    } else {
      out[key] = value === "on" ? true : value;
    }
  }
  return out;
}
