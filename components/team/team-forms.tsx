"use client";

import { useActionState } from "react";
import { changeRoleAction, inviteStaffAction, setActiveAction } from "@/app/(signed-in)/team/actions";
import { Button } from "@/components/ui/button";
import { FormMessage, SelectField, TextField } from "@/components/ui/field";
import { formKey, type FormState } from "@/lib/form-state";

const ROLE_OPTIONS = [
  { value: "therapist", label: "Therapist" },
  { value: "assistant", label: "Therapy assistant" },
  { value: "admin", label: "Clinic admin" },
];

export function InviteForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(inviteStaffAction, {});
  const v = (state.values ?? {}) as Record<string, string>;
  return (
    <form key={formKey(state)} action={action} className="grid gap-4 md:grid-cols-[1fr_1fr_12rem_auto] md:items-end" aria-label="Invite a colleague" noValidate>
      <TextField label="Name" name="name" required defaultValue={v.name} error={state.fields?.name} />
      <TextField label="Work e-mail" name="email" type="email" required defaultValue={v.email} error={state.fields?.email} />
      <SelectField label="Role" name="role" defaultValue={v.role ?? "therapist"} options={ROLE_OPTIONS} error={state.fields?.role} />
      <Button type="submit" disabled={pending}>
        {pending ? "Sending…" : "Send invitation"}
      </Button>
      <div className="md:col-span-4">
        <FormMessage state={state} />
      </div>
    </form>
  );
}

export function StaffRowControls({ userId, name, role, active, self }: { userId: string; name: string; role: string; active: boolean; self: boolean }) {
  const [roleState, roleAction, rolePending] = useActionState<FormState, FormData>(changeRoleAction, {});
  const [activeState, activeAction, activePending] = useActionState<FormState, FormData>(setActiveAction, {});
  return (
    <div className="flex flex-wrap items-center gap-2">
      <form action={roleAction} className="flex items-center gap-2" aria-label={`Role of ${name}`}>
        <input type="hidden" name="userId" value={userId} />
        <select name="role" defaultValue={role} aria-label={`Role for ${name}`} className="rounded-lg border border-sand-200 bg-white px-2 py-1 text-sm" disabled={self}>
          {ROLE_OPTIONS.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
        <Button type="submit" variant="quiet" className="px-3 py-1" disabled={self || rolePending}>
          Change role
        </Button>
      </form>
      {self ? null : (
        <form action={activeAction}>
          <input type="hidden" name="userId" value={userId} />
          <input type="hidden" name="active" value={active ? "false" : "true"} />
          <Button type="submit" variant={active ? "danger" : "quiet"} className="px-3 py-1" disabled={activePending}>
            {active ? "Deactivate" : "Reactivate"}
          </Button>
        </form>
      )}
      <FormMessage state={roleState.message ? roleState : activeState} />
    </div>
  );
}
