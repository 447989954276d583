import { z } from "zod";
import { AFFECTED_SIDES, PRECAUTION_FLAGS, SEXES, SIDES, type PrecautionFlag } from "@/db/schema";
import { isoDate, todayIso } from "./common";

/** Plain-language labels for the precaution flags, shown to staff on the form and the record. */
export const PRECAUTION_LABELS: Record<PrecautionFlag, string> = {
  no_resisted_testing: "No resisted testing (see date)",
  unhealed_fracture: "Fracture not yet healed",
  tendon_repair: "Tendon repair: follow the surgeon's protocol",
  ligament_or_capsule_repair: "Ligament or capsule repair",
  joint_instability: "Joint instability",
  osteoporosis: "Osteoporosis",
  acute_inflammation_or_infection: "Acute inflammation or infection",
  cardiovascular: "Heart disease or uncontrolled blood pressure (avoid breath-holding)",
  bleeding_disorder: "Bleeding disorder",
  reduced_sensation: "Reduced sensation in the hand",
};

/** Flags under which resisted (grade 3+ to 5) testing is not offered. Common practice; the surgeon's protocol rules. */
export const FLAGS_BLOCKING_RESISTANCE: readonly PrecautionFlag[] = [
  "no_resisted_testing",
  "unhealed_fracture",
  "tendon_repair",
  "ligament_or_capsule_repair",
];

const text = (max: number) => z.string().trim().max(max, `expected at most ${max} characters`);

/** Every field as the form and the API send it, with no defaults (so a PATCH touches only what it names). */
const clientFields = z.object({
  givenName: z.string().trim().min(1, "required").max(80, "expected at most 80 characters"),
  familyName: z.string().trim().min(1, "required").max(80, "expected at most 80 characters"),
  email: z
    .union([z.literal(""), z.email("expected an e-mail address").max(200)])
    .nullable()
    .transform((s) => (s ? s.toLowerCase() : null)),
  dateOfBirth: isoDate.refine((s) => s >= "1900-01-01" && s <= todayIso(), "expected a date between 1900 and today"),
  sex: z.enum(SEXES, "expected one of female, male, other, unknown"),
  dominantHand: z.enum(SIDES, "expected left or right"),
  affectedSide: z.enum(AFFECTED_SIDES, "expected left, right or both"),
  diagnosisNote: text(2000),
  referringPhysician: text(200),
  precautionFlags: z
    .array(z.enum(PRECAUTION_FLAGS, `expected one of ${PRECAUTION_FLAGS.join(", ")}`))
    .transform((flags) => [...new Set(flags)]),
  precautionNote: text(2000),
  noResistedUntil: z
    .union([z.literal(""), isoDate])
    .nullable()
    .transform((s) => s || null),
  primaryTherapistId: z
    .union([z.literal(""), z.uuid("expected a staff member's id")])
    .nullable()
    .transform((s) => s || null),
  selfPay: z.union([z.boolean(), z.enum(["true", "false", "on"])]).transform((v) => v === true || v === "true" || v === "on"),
});

/** A date for "no resisted testing" only makes sense with that flag ticked. */
export function precautionDateProblem(c: { noResistedUntil?: string | null; precautionFlags?: PrecautionFlag[] }) {
  return c.noResistedUntil && !(c.precautionFlags ?? []).includes("no_resisted_testing")
    ? "tick “No resisted testing” when you give a date for it"
    : null;
}

export const clientInputSchema = clientFields
  .extend({
    email: clientFields.shape.email.optional().transform((s) => s ?? null),
    sex: clientFields.shape.sex.default("unknown"),
    diagnosisNote: clientFields.shape.diagnosisNote.default(""),
    referringPhysician: clientFields.shape.referringPhysician.default(""),
    precautionFlags: clientFields.shape.precautionFlags.default([]),
    precautionNote: clientFields.shape.precautionNote.default(""),
    noResistedUntil: clientFields.shape.noResistedUntil.optional().transform((s) => s ?? null),
    primaryTherapistId: clientFields.shape.primaryTherapistId.optional().transform((s) => s ?? null),
    selfPay: clientFields.shape.selfPay.default(false),
  })
  .superRefine((c, ctx) => {
    const problem = precautionDateProblem(c);
    if (problem) ctx.addIssue({ code: "custom", path: ["precautionFlags"], message: problem });
  });

export type ClientInput = z.infer<typeof clientInputSchema>;

/** PATCH: any subset of the fields. The cross-field rule is checked again on the merged record. */
export const clientPatchSchema = clientFields.partial().strict();
export type ClientPatch = z.infer<typeof clientPatchSchema>;

export const clientListQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  therapistId: z.uuid("expected a staff member's id").optional(),
  flagged: z.enum(["true", "false"]).optional(),
  sort: z.enum(["name", "dateOfBirth", "updatedAt", "createdAt"], "expected name, dateOfBirth, updatedAt or createdAt").default("name"),
  dir: z.enum(["asc", "desc"], "expected asc or desc").default("asc"),
  page: z.coerce.number().int("expected a whole number").min(1, "expected 1 or more").default(1),
  pageSize: z.coerce.number().int("expected a whole number").min(1).max(100, "expected at most 100").default(20),
});
export type ClientListQuery = z.infer<typeof clientListQuerySchema>;
