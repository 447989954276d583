"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";

/**
 * Asks Kinarc for a checkout page and goes there. The card is entered on the payment service's own page, never here.
 */
export function PayButton({ visitId, label }: { visitId: string; label: string }) {
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  return (
    <span className="inline-flex flex-col items-end gap-1">
      <Button
        disabled={busy}
        onClick={async () => {
          setBusy(true);
          setError(null);
          try {
            const res = await fetch("/api/v1/payments/checkout", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ visitId }) });
            const body = (await res.json().catch(() => ({}))) as { url?: string; error?: string };
            if (res.ok && body.url) {
              window.location.assign(body.url);
              return;
            }
            setError(body.error ?? `Payment could not start (${res.status}).`);
          } catch {
            setError("The connection dropped; nothing was charged. Try again.");
          }
          setBusy(false);
        }}
      >
        {busy ? "Opening…" : label}
      </Button>
      {error ? (
        <span role="alert" className="text-sm text-flag-rose">
          {error}
        </span>
      ) : null}
    </span>
  );
}
