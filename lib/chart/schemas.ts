import { z } from "zod";
import { STRENGTH_TESTS } from "@/db/schema";
import { DIGITS, digitAllowed, MOTION_IDS, SIDES, type Digit, type MotionId } from "@/lib/motions/catalog";
import { isoDate } from "@/lib/validation/common";

const emptyToNull = (v: unknown) => (v === "" || v === undefined ? null : v);

/** A chart row: motion, side and digit, with the digit checked against the motion catalog. */
export const rowFields = {
  motion: z.enum(MOTION_IDS, `expected one of ${MOTION_IDS.join(", ")}`),
  side: z.enum(SIDES, "expected left or right"),
  digit: z.preprocess(emptyToNull, z.enum(DIGITS, `expected one of ${DIGITS.join(", ")} or empty for the wrist`).nullable()),
};

function checkDigit(v: { motion: MotionId; digit: Digit | null }, ctx: z.RefinementCtx) {
  if (!digitAllowed(v.motion, v.digit)) {
    ctx.addIssue({ code: "custom", path: ["digit"], message: v.digit ? `${v.motion} is not measured on the ${v.digit}` : `${v.motion} needs a digit` });
  }
}

const note = z.string().trim().max(2000, "expected at most 2000 characters").default("");
const optionalUuid = (what: string) => z.preprocess(emptyToNull, z.uuid(`expected ${what} id`).nullable()).default(null);

export const remoteGradeSchema = z
  .object({ method: z.literal("remote_range"), ...rowFields, note, replacesId: optionalUuid("a grade entry's") })
  .superRefine(checkDigit);

const inPersonGradeFields = z.object({
  method: z.enum(["in_person_resisted", "in_person_palpation"], "expected in_person_resisted or in_person_palpation"),
  ...rowFields,
  value: z.string().trim().min(1, "expected a grade"),
  note,
  visitId: optionalUuid("a visit's"),
  replacesId: optionalUuid("a grade entry's"),
});
export const inPersonGradeSchema = inPersonGradeFields.superRefine(checkDigit);

export const gradeInputSchema = z.union([remoteGradeSchema, inPersonGradeSchema], "expected a grade entry");
export type GradeInput = z.infer<typeof gradeInputSchema>;
export type InPersonGradeInput = z.infer<typeof inPersonGradeSchema>;

export const passiveRangeSchema = z
  .object({
    ...rowFields,
    valueDeg: z.coerce.number("expected degrees as a number").min(1, "expected at least 1 degree").max(180, "expected at most 180 degrees"),
    measuredOn: isoDate.optional(),
    note,
  })
  .superRefine(checkDigit);
export type PassiveRangeInput = z.infer<typeof passiveRangeSchema>;

export const strengthSchema = z.object({
  test: z.enum(STRENGTH_TESTS, `expected one of ${STRENGTH_TESTS.join(", ")}`),
  side: z.enum(SIDES, "expected left or right"),
  unit: z.enum(["kg", "lb"], "expected kg or lb").default("kg"),
  // A hand dynamometer reads up to 90 kg (200 lb) [common practice]; three trials is the norms' protocol.
  trials: z
    .array(z.coerce.number("expected a number").positive("expected more than 0").max(200, "expected at most 200"), "expected a list of trial readings")
    .min(1, "expected at least one trial")
    .max(5, "expected at most five trials"),
  handlePosition: z.preprocess(emptyToNull, z.coerce.number().int().min(1, "expected 1-5").max(5, "expected 1-5").nullable()).default(null),
  note,
});
export type StrengthInput = z.infer<typeof strengthSchema>;

/** One in-person session's results at once: grades and readings commit together or not at all. */
export const inPersonResultSchema = z
  .object({
    visitId: optionalUuid("a visit's"),
    grades: z.array(inPersonGradeFields.omit({ visitId: true }).superRefine(checkDigit)).max(80).default([]),
    strength: z.array(strengthSchema).max(20).default([]),
  })
  .refine((v) => v.grades.length + v.strength.length > 0, { message: "expected at least one grade or reading", path: ["grades"] });
export type InPersonResultInput = z.infer<typeof inPersonResultSchema>;

export const attemptListQuerySchema = z.object({
  motion: z.enum(MOTION_IDS, `expected one of ${MOTION_IDS.join(", ")}`).optional(),
  side: z.enum(SIDES, "expected left or right").optional(),
  digit: z
    .enum([...DIGITS, "none"], `expected one of ${DIGITS.join(", ")} or none`)
    .optional()
    .transform((d) => (d === "none" ? null : d)),
  planeVerified: z.enum(["true", "false"], "expected true or false").optional().transform((v) => (v === undefined ? undefined : v === "true")),
  sort: z.enum(["recordedAt", "peakDeg", "arcDeg"], "expected recordedAt, peakDeg or arcDeg").default("recordedAt"),
  dir: z.enum(["asc", "desc"], "expected asc or desc").default("desc"),
  page: z.coerce.number().int("expected a whole number").min(1, "expected 1 or more").default(1),
  pageSize: z.coerce.number().int("expected a whole number").min(1, "expected 1 or more").max(100, "expected at most 100").default(20),
  series: z.enum(["1"]).optional(),
});

const plannedTest = z.object(rowFields).superRefine(checkDigit);

export const appointmentSchema = z.object({
  clientId: z.uuid("expected a client id"),
  /** The therapist who will test; defaults to the client's primary therapist (or the therapist scheduling). */
  therapistId: optionalUuid("a therapist's"),
  /** Local date and time in the clinic's time zone, as a datetime-local input sends it. */
  startsAtLocal: z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/, "expected a date and time as YYYY-MM-DDTHH:MM"),
  durationMin: z.coerce.number().int("expected whole minutes").min(10, "expected at least 10 minutes").max(240, "expected at most 240 minutes").default(45),
  location: z.string().trim().min(1, "expected where the test takes place").max(200, "expected at most 200 characters"),
  plannedTests: z.array(plannedTest, "expected a list of motions").min(1, "expected at least one motion to test").max(80),
  note: z.string().trim().max(1000, "expected at most 1000 characters").default(""),
});
export type AppointmentInput = z.infer<typeof appointmentSchema>;
