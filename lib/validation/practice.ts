import { z } from "zod";
import { CONDITIONS, DIGIT_NAMES, PRACTICE_PERIODS, SIDES } from "@/db/schema";
import { digitAllowed, MOTION_IDS, MOTIONS, type Digit, type MotionId } from "@/lib/motions/catalog";
import { isoDate } from "./common";

/** Longest a program item may run before the therapist reviews it: 26 weeks (our own limit, about one rehab course). */
export const PROGRAM_MAX_DAYS = 182;

/** One home program item as a therapist or assistant assigns or edits it (form or JSON). */
export const programItemSchema = z
  .object({
    motion: z.enum(MOTION_IDS, `expected one of ${MOTION_IDS.join(", ")}`),
    side: z.enum(SIDES, "expected left or right"),
    // A wrist motion has no digit; the form sends "" for none.
    digit: z.preprocess((v) => (v === "" || v === undefined ? null : v), z.enum(DIGIT_NAMES, `expected one of ${DIGIT_NAMES.join(", ")}`).nullable()),
    condition: z.enum(CONDITIONS, "expected against_gravity or gravity_minimized"),
    repetitions: z.coerce.number("expected a number of repetitions").int("expected a whole number").min(1, "expected at least 1").max(50, "expected at most 50"),
    sessionsPerPeriod: z.coerce.number("expected a number of sessions").int("expected a whole number").min(1, "expected at least 1").max(6, "expected at most 6"),
    period: z.enum(PRACTICE_PERIODS, "expected day or week"),
    startDate: isoDate,
    endDate: isoDate,
    notes: z.string().trim().max(1000, "expected at most 1000 characters").default(""),
  })
  .superRefine((v, ctx) => {
    if (!digitAllowed(v.motion as MotionId, v.digit as Digit | null)) {
      const digits = MOTIONS[v.motion as MotionId].digits;
      ctx.addIssue({ code: "custom", path: ["digit"], message: digits.length ? `expected one of ${digits.join(", ")} for this motion` : "expected no finger for a wrist motion" });
    }
    if (v.endDate < v.startDate) ctx.addIssue({ code: "custom", path: ["endDate"], message: "expected a date on or after the start date" });
    else if ((Date.parse(v.endDate) - Date.parse(v.startDate)) / 86_400_000 > PROGRAM_MAX_DAYS) {
      ctx.addIssue({ code: "custom", path: ["endDate"], message: `expected at most ${PROGRAM_MAX_DAYS} days after the start date; review and assign again after that` });
    }
  });
export type ProgramItemInput = z.infer<typeof programItemSchema>;
