"use server";

import { redirect } from "next/navigation";
import { getDb } from "@/db";
import type { FormState } from "@/lib/actions";
import { fieldErrors } from "@/lib/http";
import { redeemPasswordToken } from "@/lib/staff";
import { setPasswordSchema } from "@/lib/validation/staff";

/** Public by design: the one-time token in the link is the credential. It is checked and spent in one transaction. */
export async function setPasswordAction(token: string, _prev: FormState, formData: FormData): Promise<FormState> {
  const parsed = setPasswordSchema.safeParse({ password: formData.get("password"), confirm: formData.get("confirm") });
  if (!parsed.success) return { ok: false, message: "Check the highlighted fields.", fields: fieldErrors(parsed.error) };
  const done = await redeemPasswordToken(getDb(), token, parsed.data.password);
  if (!done) return { ok: false, message: "This link has expired or was already used. Ask your clinic admin for a new invitation." };
  redirect("/sign-in?welcome=1");
}
