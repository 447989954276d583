"use client";

import { useActionState, useState } from "react";
import { CONDITIONS, PRACTICE_PERIODS, SIDES } from "@/db/schema";
import { Button } from "@/components/ui/button";
import { FormMessage, SelectField, TextArea, TextField } from "@/components/ui/field";
import type { FormState } from "@/lib/actions";
import { MOTION_IDS, MOTIONS, type MotionId } from "@/lib/motions/catalog";

export interface ProgramItemFormValues {
  motion?: string;
  side?: string;
  digit?: string | null;
  condition?: string;
  repetitions?: number | string;
  sessionsPerPeriod?: number | string;
  period?: string;
  startDate?: string;
  endDate?: string;
  notes?: string;
}

const CONDITION_LABELS: Record<string, string> = { against_gravity: "Against gravity", gravity_minimized: "Gravity minimized" };

/** Assign or edit one home program item; the server's zod schema (lib/validation/practice.ts) has the last word. */
export function ProgramItemForm({
  action,
  initial,
  submitLabel,
  idPrefix,
}: {
  action: (prev: FormState, formData: FormData) => Promise<FormState>;
  initial: ProgramItemFormValues;
  submitLabel: string;
  /** Keeps field ids unique when several forms share the page. */
  idPrefix: string;
}) {
  const [state, formAction, pending] = useActionState(action, {});
  const v = { ...initial, ...(state.ok ? {} : (state.values as ProgramItemFormValues | undefined)) };
  const e = state.fields ?? {};
  const shownMotion = (v.motion as MotionId) ?? MOTION_IDS[0];
  const [motion, setMotion] = useState<MotionId>(shownMotion);
  // React resets a form after its action runs, and a select resets to the option it was first mounted with, not to a
  // later default: the form is mounted afresh for each answer so every field shows what was sent (or the defaults).
  const [answered, setAnswered] = useState({ state, revision: 0 });
  if (answered.state !== state) {
    setAnswered({ state, revision: answered.revision + 1 });
    setMotion(shownMotion);
  }
  const digits = MOTIONS[motion]?.digits ?? [];
  const id = (name: string) => `${idPrefix}-${name}`;
  return (
    <form key={answered.revision} action={formAction} className="space-y-4" noValidate data-testid={`${idPrefix}-form`}>
      <FormMessage state={state} />
      <div className="grid gap-4 md:grid-cols-3">
        <SelectField
          label="Motion"
          name="motion"
          id={id("motion")}
          defaultValue={shownMotion}
          onChange={(ev) => setMotion(ev.target.value as MotionId)}
          options={MOTION_IDS.map((m) => ({ value: m, label: MOTIONS[m].label }))}
          error={e.motion}
        />
        <SelectField label="Side" name="side" id={id("side")} defaultValue={v.side ?? "right"} options={SIDES.map((s) => ({ value: s, label: s === "left" ? "Left" : "Right" }))} error={e.side} />
        <SelectField
          key={motion}
          label="Finger"
          name="digit"
          id={id("digit")}
          defaultValue={v.digit && digits.includes(v.digit as never) ? v.digit : (digits[0] ?? "")}
          options={digits.length ? digits.map((d) => ({ value: d, label: d[0].toUpperCase() + d.slice(1) })) : [{ value: "", label: "None (wrist)" }]}
          error={e.digit}
        />
        <SelectField label="Position" name="condition" id={id("condition")} defaultValue={v.condition ?? "against_gravity"} options={CONDITIONS.map((c) => ({ value: c, label: CONDITION_LABELS[c] }))} error={e.condition} />
        <TextField label="Repetitions per session" name="repetitions" id={id("repetitions")} type="number" min={1} max={50} defaultValue={String(v.repetitions ?? 10)} error={e.repetitions} />
        <div className="grid grid-cols-2 gap-2">
          <TextField label="Sessions" name="sessionsPerPeriod" id={id("sessionsPerPeriod")} type="number" min={1} max={6} defaultValue={String(v.sessionsPerPeriod ?? 1)} error={e.sessionsPerPeriod} />
          <SelectField label="Per" name="period" id={id("period")} defaultValue={v.period ?? "day"} options={PRACTICE_PERIODS.map((p) => ({ value: p, label: p }))} error={e.period} />
        </div>
        <TextField label="Start date" name="startDate" id={id("startDate")} type="date" defaultValue={v.startDate ?? ""} error={e.startDate} />
        <TextField label="End date" name="endDate" id={id("endDate")} type="date" defaultValue={v.endDate ?? ""} error={e.endDate} />
      </div>
      <TextArea label="Notes for the client" name="notes" id={id("notes")} defaultValue={v.notes ?? ""} error={e.notes} />
      <Button type="submit" disabled={pending}>
        {submitLabel}
      </Button>
    </form>
  );
}

/** A one-button form that ends an item (kept for its adherence history). */
export function EndProgramItemButton({ action, label }: { action: (prev: FormState, formData: FormData) => Promise<FormState>; label: string }) {
  const [state, formAction, pending] = useActionState(action, {});
  return (
    <form action={formAction} className="inline">
      <Button type="submit" variant="danger" disabled={pending} aria-label={`End ${label}`}>
        End
      </Button>
      <FormMessage state={state.ok ? null : state} />
    </form>
  );
}
