"use client";

import { useActionState } from "react";
import { cancelVisitAction } from "@/app/(signed-in)/visits/actions";
import type { FormState } from "@/lib/actions";

export function CancelVisitButton({ visitId, label }: { visitId: string; label: string }) {
  const [state, action, pending] = useActionState<FormState>(cancelVisitAction.bind(null, visitId), {});
  return (
    <form action={action} className="inline">
      <button type="submit" disabled={pending} aria-label={`Cancel ${label}`} className="text-sm text-flag-rose hover:underline disabled:opacity-50">
        Cancel
      </button>
      {state.message ? <span role="status" className="ml-2 text-xs text-ink-soft">{state.message}</span> : null}
    </form>
  );
}
