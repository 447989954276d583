"use client";

import { useActionState } from "react";
import { refundPaymentAction } from "@/app/(signed-in)/admin-billing/actions";
import { Button } from "@/components/ui/button";
import type { FormState } from "@/lib/actions";

export function RefundForm({ paymentId }: { paymentId: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(refundPaymentAction, {});
  return (
    <form action={action} className="inline-flex items-center gap-2">
      <input type="hidden" name="paymentId" value={paymentId} />
      <Button variant="danger" type="submit" disabled={pending}>
        Refund
      </Button>
      {state.message && !state.ok ? (
        <span role="alert" className="text-sm text-flag-rose">
          {state.message}
        </span>
      ) : null}
    </form>
  );
}
