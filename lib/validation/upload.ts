import { z } from "zod";
import { DIGIT_NAMES, SIDES, UPLOAD_KINDS } from "@/db/schema";
import { isMotionId } from "@/lib/motions/catalog";

/** The form fields sent with an uploaded file (multipart), as the browser sends them: strings, empty when unset. */
export const uploadFieldsSchema = z
  .object({
    clientId: z.uuid({ error: "expected the client's id (a UUID)" }),
    uploadUid: z.uuid({ error: "expected an upload id (a UUID) chosen by the sending browser" }),
    kind: z.enum(UPLOAD_KINDS, { error: 'expected "clip" or "document"' }),
    note: z.string().trim().max(500, { error: "expected at most 500 characters" }).default(""),
    motion: z
      .string()
      .trim()
      .optional()
      .transform((v) => v || undefined)
      .refine((v) => v === undefined || isMotionId(v), { error: "expected a motion from Kinarc's catalogue" }),
    side: z.preprocess((v) => v || undefined, z.enum(SIDES, { error: 'expected "left" or "right"' }).optional()),
    digit: z.preprocess((v) => v || undefined, z.enum(DIGIT_NAMES, { error: "expected thumb, index, middle, ring or little" }).optional()),
  })
  .refine((v) => v.kind !== "clip" || v.motion, { error: "expected the motion shown in the clip", path: ["motion"] })
  .refine((v) => v.kind !== "clip" || v.side, { error: "expected the side shown in the clip", path: ["side"] });

export type UploadFields = z.infer<typeof uploadFieldsSchema>;

export const uploadListQuerySchema = z.object({
  clientId: z.uuid({ error: "expected the client's id (a UUID)" }).optional(),
  kind: z.enum(UPLOAD_KINDS, { error: 'expected "clip" or "document"' }).optional(),
});

/**
 * A therapist's review of an upload: reviewed, and for an analyzed clip whether its attempt counts towards the grade
 * (kept) or not. `counts` only with a clip that has an attempt (checked by the route).
 */
export const uploadReviewSchema = z.object({
  reviewed: z.literal(true, { error: "expected true" }),
  counts: z.boolean({ error: "expected true (the clip's attempt counts towards the grade) or false" }).optional(),
});
