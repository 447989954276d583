"use client";

import { use, useActionState } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage, TextField } from "@/components/ui/field";
import type { FormState } from "@/lib/actions";
import { setPasswordAction } from "./actions";

export default function WelcomePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = use(params);
  const [state, action, pending] = useActionState<FormState, FormData>(setPasswordAction.bind(null, token), {});
  return (
    <main className="mx-auto max-w-md px-5 py-16">
      <h1 className="text-2xl font-semibold">Choose your Kinarc password</h1>
      <p className="mt-2 text-sm text-ink-soft">At least 10 characters. A short sentence is easy to remember and hard to guess.</p>
      <form action={action} className="mt-6 space-y-4">
        <TextField label="New password" name="password" type="password" autoComplete="new-password" required error={state.fields?.password} />
        <TextField label="The same again" name="confirm" type="password" autoComplete="new-password" required error={state.fields?.confirm} />
        <FormMessage state={state} />
        <Button type="submit" disabled={pending} className="w-full">
          Save password
        </Button>
      </form>
    </main>
  );
}
