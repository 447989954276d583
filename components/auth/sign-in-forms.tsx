"use client";

import { useActionState } from "react";
import { sendClientLink, signInWithPassword, type SignInState } from "@/app/sign-in/actions";
import { Button } from "@/components/ui/button";
import { FormMessage, TextField } from "@/components/ui/field";

export function StaffSignInForm({ notice }: { notice?: SignInState }) {
  const [state, action, pending] = useActionState<SignInState, FormData>(signInWithPassword, notice ?? {});
  return (
    <form action={action} className="space-y-4" aria-label="Sign in with password">
      <TextField label="E-mail" name="email" type="email" autoComplete="username" required defaultValue={state.email} error={state.fields?.email} />
      <TextField label="Password" name="password" type="password" autoComplete="current-password" required error={state.fields?.password} />
      <FormMessage state={state} />
      <Button type="submit" disabled={pending} className="w-full">
        {pending ? "Checking…" : "Sign in"}
      </Button>
    </form>
  );
}

export function ClientLinkForm() {
  const [state, action, pending] = useActionState<SignInState, FormData>(sendClientLink, {});
  return (
    <form action={action} className="space-y-4" aria-label="E-mail me a sign-in link">
      <TextField label="Your e-mail" name="email" id="link-email" type="email" autoComplete="email" required defaultValue={state.email} error={state.fields?.email} />
      <FormMessage state={state} />
      <Button type="submit" variant="quiet" disabled={pending} className="w-full">
        {pending ? "Sending…" : "E-mail me a link"}
      </Button>
    </form>
  );
}
