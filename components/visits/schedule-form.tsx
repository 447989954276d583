"use client";

import { useActionState } from "react";
import { scheduleVisitAction } from "@/app/(signed-in)/visits/actions";
import { Button } from "@/components/ui/button";
import { FormMessage, SelectField, TextField } from "@/components/ui/field";
import { formKey, type FormState } from "@/lib/form-state";

export function ScheduleVisitForm({
  clients,
  therapists,
  defaultTherapistId,
  defaultStart,
  timezone,
}: {
  clients: { id: string; name: string }[];
  therapists: { id: string; name: string | null }[];
  defaultTherapistId?: string;
  defaultStart: string;
  timezone: string;
}) {
  const [state, action, pending] = useActionState<FormState, FormData>(scheduleVisitAction, {});
  const v = (state.values ?? {}) as Record<string, string>;
  const e = state.fields ?? {};
  return (
    <form key={formKey(state)} action={action} className="grid gap-4 md:grid-cols-3" aria-label="Book a visit" noValidate>
      <SelectField label="Client" name="clientId" defaultValue={v.clientId ?? ""} options={[{ value: "", label: "Choose a client" }, ...clients.map((c) => ({ value: c.id, label: c.name }))]} error={e.clientId} />
      <SelectField label="Therapist" name="therapistId" defaultValue={v.therapistId ?? defaultTherapistId ?? ""} options={therapists.map((t) => ({ value: t.id, label: t.name ?? t.id }))} error={e.therapistId} />
      <SelectField
        label="Kind"
        name="kind"
        defaultValue={v.kind ?? "video"}
        options={[
          { value: "video", label: "Video visit" },
          { value: "in_person", label: "In the clinic" },
        ]}
        error={e.kind}
      />
      <TextField label={`Starts (${timezone})`} name="startsAt" type="datetime-local" defaultValue={v.startsAt ?? defaultStart} error={e.startsAt} />
      <TextField label="Length (minutes)" name="durationMin" type="number" min={10} max={180} defaultValue={v.durationMin ?? "45"} error={e.durationMin} />
      <TextField label="Place (in the clinic only)" name="location" defaultValue={v.location} error={e.location} />
      <div className="md:col-span-3">
        <TextField label="What it is for" name="reason" defaultValue={v.reason} error={e.reason} placeholder="e.g. Review of wrist range after the cast came off" />
      </div>
      <div className="flex items-center gap-3 md:col-span-3">
        <Button type="submit" disabled={pending}>
          {pending ? "Booking…" : "Book visit"}
        </Button>
        <FormMessage state={state} />
      </div>
    </form>
  );
}
