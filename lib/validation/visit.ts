import { z } from "zod";
import { VISIT_KINDS } from "@/db/schema";

/** Start times arrive from a datetime-local input (no zone: the clinic's zone is applied) or as ISO 8601 with a zone. */
export const scheduleVisitSchema = z.object({
  clientId: z.uuid("expected a client's id"),
  therapistId: z.uuid("expected a therapist's id"),
  kind: z.enum(VISIT_KINDS, "expected video or in_person").default("video"),
  startsAt: z
    .string()
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})?$/, "expected a date and time such as 2027-01-15T14:30"),
  durationMin: z.coerce
    .number("expected a number of minutes")
    .int("expected whole minutes")
    .min(10, "expected at least 10 minutes")
    .max(180, "expected at most 180 minutes")
    .default(45),
  reason: z.string().trim().max(500, "expected at most 500 characters").default(""),
  location: z.string().trim().max(200).optional(),
});
export type ScheduleVisitInput = z.infer<typeof scheduleVisitSchema>;

export const visitStatusChangeSchema = z.object({
  status: z.enum(["cancelled", "finished", "in_progress", "waiting", "missed"], "expected cancelled, waiting, in_progress, finished or missed"),
  notes: z.string().max(5000).optional(),
});

export const visitListQuerySchema = z.object({
  from: z.iso.datetime({ offset: true, error: "expected an ISO 8601 date-time" }).optional(),
  to: z.iso.datetime({ offset: true, error: "expected an ISO 8601 date-time" }).optional(),
  clientId: z.uuid("expected a client's id").optional(),
  status: z.enum(["scheduled", "waiting", "in_progress", "finished", "cancelled", "missed"]).optional(),
});

export const consentSchema = z.object({
  version: z.string().min(1, "required"),
  signedName: z.string().trim().min(2, "type your full name").max(120),
  agree: z.union([z.literal(true), z.literal("true")], "tick the box to agree").transform(() => true as const),
});
