import { z } from "zod";
import { VISIT_KINDS } from "@/db/schema";

/** Currencies the clinic may charge in (ISO 4217), each with two minor digits so `amount × 100` is exact. */
export const CURRENCIES = ["gbp", "eur", "usd", "cad", "aud", "nzd", "chf", "sek", "nok", "dkk"] as const;

/** The admin's price for one kind of visit, as the form sends it: "65" or "65.50" in the main unit. */
export const visitPriceSchema = z.object({
  visitKind: z.enum(VISIT_KINDS, { error: "expected video or in_person" }),
  amount: z
    .string()
    .trim()
    .regex(/^\d{1,5}(\.\d{1,2})?$/, { error: "expected an amount such as 65 or 65.50" })
    .transform((s) => Math.round(Number(s) * 100))
    .refine((minor) => minor >= 100, { error: "expected at least 1.00" }),
  currency: z.enum(CURRENCIES, { error: `expected one of ${CURRENCIES.join(", ")}` }),
  label: z.string().trim().min(3, { error: "expected a name for the receipt, at least 3 characters" }).max(80, { error: "expected at most 80 characters" }),
});

export const checkoutRequestSchema = z.object({ visitId: z.uuid({ error: "expected the visit's id (a UUID)" }) });
export const paymentListQuerySchema = z.object({ clientId: z.uuid({ error: "expected the client's id (a UUID)" }).optional() });
