"use server";

import { AuthError, CredentialsSignin } from "next-auth";
import { headers } from "next/headers";
import { z } from "zod";
import { getDb } from "@/db";
import { getUserByEmail } from "@/db/queries/users";
import { signIn } from "@/lib/auth";
import { SIGN_IN_MESSAGES } from "@/lib/auth/errors";
import { recordAudit } from "@/lib/audit";
import { requestAddress } from "@/lib/auth";

export interface SignInState {
  ok?: boolean;
  message?: string;
  fields?: Record<string, string>;
  email?: string;
}

const staffForm = z.object({
  email: z.email("expected an e-mail address"),
  password: z.string().min(1, "required"),
});

export async function signInWithPassword(_prev: SignInState, formData: FormData): Promise<SignInState> {
  const parsed = staffForm.safeParse({ email: formData.get("email"), password: formData.get("password") });
  const email = String(formData.get("email") ?? "");
  if (!parsed.success) {
    const fields = Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message]));
    return { fields, email, message: "Check the highlighted fields." };
  }
  try {
    await signIn("credentials", { ...parsed.data, redirectTo: "/home" });
    return {};
  } catch (error) {
    // signIn ends a successful sign-in by throwing Next's redirect: let it through.
    if (!(error instanceof AuthError)) throw error;
    const code = error instanceof CredentialsSignin ? error.code : "invalid";
    return { email, message: SIGN_IN_MESSAGES[code] ?? SIGN_IN_MESSAGES.invalid };
  }
}

const linkForm = z.object({ email: z.email("expected an e-mail address") });

const LINK_SENT =
  "If that address belongs to a Kinarc client, a sign-in link is on its way. It works once, for 15 minutes. Check your spam folder if it does not arrive.";

export async function sendClientLink(_prev: SignInState, formData: FormData): Promise<SignInState> {
  const parsed = linkForm.safeParse({ email: String(formData.get("email") ?? "").trim().toLowerCase() });
  if (!parsed.success) return { fields: { email: parsed.error.issues[0].message }, email: String(formData.get("email") ?? "") };
  const db = getDb();
  const user = await getUserByEmail(db, parsed.data.email);
  // The same answer whether or not the address is known, so the form cannot be used to find out who is a client.
  if (user?.active && user.role === "client") {
    await signIn("nodemailer", { email: parsed.data.email, redirect: false, redirectTo: "/home" });
  } else {
    await recordAudit(db, {
      action: "auth.link_refused",
      address: requestAddress(await headers()),
      detail: { email: parsed.data.email },
    });
  }
  return { ok: true, message: LINK_SENT };
}
