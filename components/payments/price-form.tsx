"use client";

import { useActionState } from "react";
import { saveVisitPriceAction } from "@/app/(signed-in)/admin-billing/actions";
import { Button } from "@/components/ui/button";
import { FormMessage, SelectField, TextField } from "@/components/ui/field";
import type { FormState } from "@/lib/actions";

export function PriceForm({ visitKind, kindLabel, initial, currencies }: { visitKind: string; kindLabel: string; initial: { amount: string; currency: string; label: string }; currencies: readonly string[] }) {
  const [state, action, pending] = useActionState<FormState, FormData>(saveVisitPriceAction, {});
  const v = { ...initial, ...(state.values as Partial<typeof initial> | undefined) };
  const e = state.fields ?? {};
  return (
    <form action={action} aria-label={`Price of ${kindLabel}`} className="grid gap-3 sm:grid-cols-[8rem_7rem_1fr_auto] sm:items-end" noValidate>
      <input type="hidden" name="visitKind" value={visitKind} />
      <TextField id={`amount-${visitKind}`} label="Amount" name="amount" inputMode="decimal" defaultValue={v.amount} error={e.amount} />
      <SelectField id={`currency-${visitKind}`} label="Currency" name="currency" defaultValue={v.currency} options={currencies.map((c) => ({ value: c, label: c.toUpperCase() }))} error={e.currency} />
      <TextField id={`label-${visitKind}`} label="Name on the receipt" name="label" defaultValue={v.label} error={e.label} />
      <Button type="submit" disabled={pending}>
        Save
      </Button>
      <div className="sm:col-span-4">
        <FormMessage state={state} />
      </div>
    </form>
  );
}
