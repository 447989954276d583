import type { z } from "zod";
import { captureSchema, type CaptureFile } from "./schema";

/** A capture that can't be used, with where: the file, the frame index (when the problem is in a frame) and the field. */
export class CaptureFormatError extends Error {
  readonly file: string;
  readonly frame: number | null;
  readonly field: string;

  constructor(file: string, frame: number | null, field: string, detail: string) {
    super(`${file}: ${field ? `${field}: ` : ""}${detail}`);
    this.name = "CaptureFormatError";
    this.file = file;
    this.frame = frame;
    this.field = field;
  }
}

const NON_FINITE = "__kinarc_non_finite__";

/** `frames[12].hand[3][1]` from a zod path. */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = "";
  for (const key of path) out += typeof key === "number" ? `[${key}]` : `${out ? "." : ""}${String(key)}`;
  return out;
}

function valueAt(root: unknown, path: readonly PropertyKey[]): unknown {
  let v = root;
  for (const key of path) {
    if (v === null || typeof v !== "object") return undefined;
    v = (v as Record<PropertyKey, unknown>)[key];
  }
  return v;
}

function describe(value: unknown): string {
  if (value === NON_FINITE) return "NaN or Infinity";
  if (value === undefined) return "nothing";
  if (value === null) return "null";
  if (Array.isArray(value)) return `an array of ${value.length}`;
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "NaN or Infinity";
  if (typeof value === "string") return JSON.stringify(value.length > 40 ? `${value.slice(0, 40)}…` : value);
  return typeof value;
}

function fromIssue(file: string, issue: z.core.$ZodIssue, root: unknown): CaptureFormatError {
  const frame = issue.path[0] === "frames" && typeof issue.path[1] === "number" ? issue.path[1] : null;
  const got = issue.code === "custom" ? "" : `, got ${describe(valueAt(root, issue.path))}`;
  return new CaptureFormatError(file, frame, formatPath(issue.path), `${issue.message}${got}`);
}

/**
 * JSON has no NaN or Infinity, so a writer that lets one through makes the whole file unparseable. Reading them as a
 * marker lets the schema say which frame and field held it instead of only a character offset.
 */
function parseJsonMarkingNonFinite(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch (first) {
    const marked = text.replace(/([[,:]\s*)-?(?:NaN|Infinity)(?=\s*[,\]}])/g, `$1"${NON_FINITE}"`);
    if (marked === text) throw first;
    return JSON.parse(marked);
  }
}

/** Parses and validates one capture file's text; throws CaptureFormatError naming file, frame and field. */
export function parseCaptureText(text: string, file: string): CaptureFile {
  let raw: unknown;
  try {
    raw = parseJsonMarkingNonFinite(text);
  } catch (error) {
    throw new CaptureFormatError(file, null, "", `not valid JSON (${(error as Error).message})`);
  }
  return parseCapture(raw, file);
}

/** Validates an already-parsed value as a capture file (format v1). */
export function parseCapture(raw: unknown, file: string): CaptureFile {
  const result = captureSchema.safeParse(raw);
  if (!result.success) throw fromIssue(file, result.error.issues[0], raw);
  return result.data;
}
