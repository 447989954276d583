"use client";

import { useActionState } from "react";
import { saveClinicSettingsAction } from "@/app/(signed-in)/clinic/actions";
import { Button } from "@/components/ui/button";
import { FormMessage, SelectField, TextField } from "@/components/ui/field";
import { formKey, type FormState } from "@/lib/form-state";

export interface ClinicSettingsValues {
  name: string;
  timezone: string;
  normTable: string;
  gradeScale: string;
  fullRangePercent: number;
  contactEmail: string | null;
}

const SCALES = [
  { value: "daniels", label: "0–5 with plus and minus (Daniels & Worthingham)" },
  { value: "mrc", label: "0–5 whole grades (MRC)" },
  { value: "intrinsic", label: "Hand intrinsics, gravity ignored (modified scale)" },
];

export function ClinicSettingsForm({ initial, tables }: { initial: ClinicSettingsValues; tables: { value: string; label: string }[] }) {
  const [state, action, pending] = useActionState<FormState, FormData>(saveClinicSettingsAction, {});
  const v = { ...initial, ...(state.values as Partial<ClinicSettingsValues> | undefined) };
  const e = state.fields ?? {};
  return (
    <form key={formKey(state)} action={action} className="grid max-w-2xl gap-4" noValidate>
      <TextField label="Clinic name" name="name" required defaultValue={v.name} error={e.name} />
      <TextField label="Time zone" name="timezone" defaultValue={v.timezone} error={e.timezone} hint="IANA name, e.g. Europe/London or America/Chicago." />
      <TextField label="Contact e-mail for clients" name="contactEmail" type="email" defaultValue={v.contactEmail ?? ""} error={e.contactEmail} />
      <SelectField label="Normal range table used as the default reference" name="normTable" defaultValue={v.normTable} options={tables} error={e.normTable} />
      <SelectField label="Grading scale" name="gradeScale" defaultValue={v.gradeScale} options={SCALES} error={e.gradeScale} />
      <TextField
        label="“Full range” means at least this share of the reference (%)"
        name="fullRangePercent"
        type="number"
        min={50}
        max={100}
        defaultValue={String(v.fullRangePercent)}
        error={e.fullRangePercent}
      />
      <FormMessage state={state} />
      <div>
        <Button type="submit" disabled={pending}>
          Save settings
        </Button>
      </div>
    </form>
  );
}
