import { z } from "zod";
import { MIN_PASSWORD_LENGTH } from "@/lib/auth/password";

export const STAFF_ROLE_OPTIONS = ["therapist", "assistant", "admin"] as const;

export const inviteStaffSchema = z.object({
  name: z.string().trim().min(1, "required").max(120, "expected at most 120 characters"),
  email: z.email("expected an e-mail address").transform((e) => e.toLowerCase()),
  role: z.enum(STAFF_ROLE_OPTIONS, "expected therapist, assistant or admin"),
});

export const changeRoleSchema = z.object({
  userId: z.uuid("expected a staff member's id"),
  role: z.enum(STAFF_ROLE_OPTIONS, "expected therapist, assistant or admin"),
});

export const setActiveSchema = z.object({
  userId: z.uuid("expected a staff member's id"),
  active: z.enum(["true", "false"], "expected true or false").transform((v) => v === "true"),
});

export const setPasswordSchema = z
  .object({
    password: z.string().min(MIN_PASSWORD_LENGTH, `expected at least ${MIN_PASSWORD_LENGTH} characters`).max(200),
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "the two passwords differ" });

export const clinicSettingsSchema = z.object({
  name: z.string().trim().min(1, "required").max(120),
  timezone: z.string().refine((tz) => {
    try {
      new Intl.DateTimeFormat("en", { timeZone: tz });
      return true;
    } catch {
      return false;
    }
  }, "expected an IANA time zone such as Europe/London"),
  normTable: z.string().min(1, "required"),
  gradeScale: z.enum(["daniels", "mrc", "intrinsic"], "expected daniels, mrc or intrinsic"),
  fullRangePercent: z.coerce.number().int("expected a whole number").min(50, "expected 50 to 100").max(100, "expected 50 to 100"),
  contactEmail: z.union([z.literal(""), z.email("expected an e-mail address")]).transform((s) => s || null),
});
