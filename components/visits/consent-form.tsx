"use client";

import { useActionState } from "react";
import { signConsentAction } from "@/app/(signed-in)/visits/actions";
import { Button } from "@/components/ui/button";
import { FormMessage, TextField } from "@/components/ui/field";
import type { FormState } from "@/lib/actions";

export function ConsentForm({ version, next, fullName }: { version: string; next: string; fullName: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(signConsentAction.bind(null, next), {});
  return (
    <form action={action} className="space-y-4" aria-label="Agree to video visits">
      <input type="hidden" name="version" value={version} />
      <label className="flex items-start gap-3 text-base">
        <input type="checkbox" name="agree" value="true" className="mt-1 h-5 w-5" required />
        <span>I have read this and I agree to video visits measured by Kinarc.</span>
      </label>
      {state.fields?.agree ? (
        <p role="alert" className="text-sm text-flag-rose">
          {state.fields.agree}
        </p>
      ) : null}
      <TextField label="Type your full name to sign" name="signedName" autoComplete="name" defaultValue={fullName} error={state.fields?.signedName} />
      <FormMessage state={state.ok ? null : state} />
      <Button type="submit" disabled={pending} className="w-full py-3 text-base">
        Agree and continue
      </Button>
    </form>
  );
}
