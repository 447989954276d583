"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";

export function ReviewButton({ uploadId }: { uploadId: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  return (
    <span>
      <Button
        variant="quiet"
        disabled={busy}
        onClick={async () => {
          setBusy(true);
          const res = await fetch(`/api/v1/uploads/${uploadId}`, { method: "PATCH", headers: { "content-type": "application/json" }, body: JSON.stringify({ reviewed: true }) });
          setBusy(false);
          if (res.ok) router.refresh();
          else setError(((await res.json().catch(() => ({}))) as { error?: string }).error ?? "Could not mark as reviewed.");
        }}
      >
        Mark reviewed
      </Button>
      {error ? <span role="alert" className="ml-2 text-sm text-flag-rose">{error}</span> : null}
    </span>
  );
}
