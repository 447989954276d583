"use client";

import { useActionState } from "react";
import { AFFECTED_SIDES, PRECAUTION_FLAGS, SEXES, SIDES } from "@/db/schema";
import { Button, ButtonLink } from "@/components/ui/button";
import { FormMessage, SelectField, TextArea, TextField } from "@/components/ui/field";
import { formKey, type FormState } from "@/lib/form-state";
import { PRECAUTION_LABELS } from "@/lib/validation/client";

export interface ClientFormValues {
  givenName?: string;
  familyName?: string;
  email?: string | null;
  dateOfBirth?: string;
  sex?: string;
  dominantHand?: string;
  affectedSide?: string;
  diagnosisNote?: string;
  referringPhysician?: string;
  precautionFlags?: string[];
  precautionNote?: string;
  noResistedUntil?: string | null;
  primaryTherapistId?: string | null;
  selfPay?: boolean;
}

const opts = (values: readonly string[]) => values.map((v) => ({ value: v, label: v[0].toUpperCase() + v.slice(1) }));

/** Create and edit form for a client record; validated in the browser (HTML constraints) and on the server (zod). */
export function ClientForm({
  action,
  initial,
  therapists,
  cancelHref,
  submitLabel,
}: {
  action: (prev: FormState, formData: FormData) => Promise<FormState>;
  initial: ClientFormValues;
  therapists: { id: string; name: string | null }[];
  cancelHref: string;
  submitLabel: string;
}) {
  const [state, formAction, pending] = useActionState(action, {});
  // After a refused submit, show what the person typed, not the stored record.
  const v = { ...initial, ...(state.values as ClientFormValues | undefined) };
  const e = state.fields ?? {};
  const flags = new Set(v.precautionFlags ?? []);
  return (
    <form key={formKey(state)} action={formAction} className="space-y-8" noValidate>
      <FormMessage state={state} />
      <fieldset className="grid gap-4 md:grid-cols-2">
        <legend className="mb-2 text-lg font-semibold">Person</legend>
        <TextField label="Given name" name="givenName" required defaultValue={v.givenName} error={e.givenName} />
        <TextField label="Family name" name="familyName" required defaultValue={v.familyName} error={e.familyName} />
        <TextField label="Date of birth" name="dateOfBirth" type="date" required defaultValue={v.dateOfBirth} error={e.dateOfBirth} />
        <SelectField label="Sex (for grip and pinch norms)" name="sex" defaultValue={v.sex ?? "unknown"} options={opts(SEXES)} error={e.sex} />
        <TextField label="E-mail (for invitations and sign-in links)" name="email" type="email" defaultValue={v.email ?? ""} error={e.email} />
        <SelectField
          label="Primary therapist"
          name="primaryTherapistId"
          defaultValue={v.primaryTherapistId ?? ""}
          options={[{ value: "", label: "Not assigned" }, ...therapists.map((t) => ({ value: t.id, label: t.name ?? t.id }))]}
          error={e.primaryTherapistId}
        />
      </fieldset>
      <fieldset className="grid gap-4 md:grid-cols-2">
        <legend className="mb-2 text-lg font-semibold">Hand</legend>
        <SelectField label="Dominant hand" name="dominantHand" defaultValue={v.dominantHand ?? "right"} options={opts(SIDES)} error={e.dominantHand} />
        <SelectField label="Affected side" name="affectedSide" defaultValue={v.affectedSide ?? "right"} options={opts(AFFECTED_SIDES)} error={e.affectedSide} />
        <div className="md:col-span-2">
          <TextArea label="Reason for referral" name="diagnosisNote" defaultValue={v.diagnosisNote} error={e.diagnosisNote} />
        </div>
        <TextField label="Referring physician" name="referringPhysician" defaultValue={v.referringPhysician} error={e.referringPhysician} />
        <label className="flex items-center gap-2 self-end pb-2 text-sm">
          <input type="checkbox" name="selfPay" defaultChecked={v.selfPay} className="h-4 w-4" /> Pays for visits themselves
        </label>
      </fieldset>
      <fieldset className="space-y-4">
        <legend className="mb-2 text-lg font-semibold">Precautions</legend>
        <p className="text-sm text-ink-soft">
          Ticked precautions shape what Kinarc offers: no resisted testing is proposed while one of the first four applies.
          The referring surgeon&apos;s protocol always comes first.
        </p>
        <div className="grid gap-2 md:grid-cols-2" role="group" aria-describedby={e.precautionFlags ? "precautionFlags-error" : undefined}>
          {PRECAUTION_FLAGS.map((flag) => (
            <label key={flag} className="flex items-start gap-2 text-sm">
              <input type="checkbox" name="precautionFlags[]" value={flag} defaultChecked={flags.has(flag)} className="mt-0.5 h-4 w-4" />
              {PRECAUTION_LABELS[flag]}
            </label>
          ))}
        </div>
        {e.precautionFlags ? (
          <p id="precautionFlags-error" role="alert" className="text-sm text-flag-rose">
            {e.precautionFlags}
          </p>
        ) : null}
        <div className="grid gap-4 md:grid-cols-2">
          <TextField
            label="No resisted testing before"
            name="noResistedUntil"
            type="date"
            defaultValue={v.noResistedUntil ?? ""}
            error={e.noResistedUntil}
            hint="From the surgeon's protocol, e.g. 8 weeks after a flexor tendon repair."
          />
          <TextArea label="Precaution notes" name="precautionNote" defaultValue={v.precautionNote} error={e.precautionNote} />
        </div>
      </fieldset>
      <div className="flex gap-3">
        <Button type="submit" disabled={pending}>
          {pending ? "Saving…" : submitLabel}
        </Button>
        <ButtonLink href={cancelHref} variant="quiet">
          Cancel
        </ButtonLink>
      </div>
    </form>
  );
}
