"use client";

import { useActionState } from "react";
import { eraseClientAction } from "@/app/(signed-in)/records/actions";
import { Button } from "@/components/ui/button";
import { FormMessage, SelectField, TextField } from "@/components/ui/field";
import type { FormState } from "@/lib/actions";

export function ErasureForm({ clients, today }: { clients: { value: string; label: string }[]; today: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(eraseClientAction, {});
  const v = (state.values ?? {}) as Record<string, string>;
  const e = state.fields ?? {};
  return (
    <form action={action} aria-label="Erase a client on request" className="grid max-w-xl gap-4" noValidate>
      <SelectField id="erase-client" label="Client" name="clientId" options={clients} defaultValue={v.clientId} error={e.clientId} />
      <TextField id="erase-requested" label="Request received on" name="requestedOn" type="date" defaultValue={v.requestedOn ?? today} error={e.requestedOn} />
      <TextField id="erase-confirm" label="Type the client's full name to confirm" name="confirmName" autoComplete="off" defaultValue={v.confirmName} error={e.confirmName} />
      <FormMessage state={state} />
      <div>
        <Button variant="danger" type="submit" disabled={pending}>
          Erase
        </Button>
      </div>
    </form>
  );
}
