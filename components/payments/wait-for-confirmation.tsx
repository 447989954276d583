"use client";

import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";

/**
 * After returning from checkout the visit stays "pending" until the payment service's signed event arrives; the
 * browser's return is never taken as proof of payment. Refreshes for a minute while waiting.
 */
export function WaitForConfirmation({ waiting }: { waiting: boolean }) {
  const router = useRouter();
  const [tries, setTries] = useState(0);
  useEffect(() => {
    if (!waiting || tries >= 30) return;
    const timer = setTimeout(() => {
      router.refresh();
      setTries((n) => n + 1);
    }, 2000);
    return () => clearTimeout(timer);
  }, [waiting, tries, router]);
  if (!waiting) return null;
  return (
    <p role="status" className="mb-4 rounded-lg bg-flag-amberBg px-3 py-2 text-sm text-ink">
      {tries >= 30
        ? "The payment service has not confirmed yet. If you paid, it will show here once it does; you will not be charged twice."
        : "Thank you. Waiting for the payment service to confirm your payment…"}
    </p>
  );
}
