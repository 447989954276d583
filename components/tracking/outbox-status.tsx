"use client";

import { useEffect, useState } from "react";
import { browserOutbox, runOutbox, type OutboxEntry } from "@/lib/captures/outbox";

/**
 * Runs the attempt outbox on this page (sends what is waiting now, on reconnect and on a timer) and says what is
 * still waiting. Mount it on any page a client uses; it shows nothing when the outbox is empty.
 */
export function OutboxStatus() {
  const [entries, setEntries] = useState<OutboxEntry[]>([]);
  const [problem, setProblem] = useState<string | null>(null);

  useEffect(() => {
    const outbox = browserOutbox();
    const refresh = () =>
      void outbox.entries().then(setEntries, (error: unknown) => setProblem(`Attempts cannot be kept on this device: ${error instanceof Error ? error.message : String(error)}`));
    const unsubscribe = outbox.subscribe(refresh);
    const stop = runOutbox(outbox);
    refresh();
    return () => {
      unsubscribe();
      stop();
    };
  }, []);

  const pending = entries.filter((e) => e.state === "pending");
  const rejected = entries.filter((e) => e.state === "rejected");
  if (!problem && entries.length === 0) return null;
  return (
    <aside className="rounded-card border border-sand-200 bg-white p-3 text-sm" data-testid="outbox-status" data-pending={pending.length}>
      {problem ? <p className="text-flag-rose">{problem}</p> : null}
      {pending.length ? (
        <p className="text-ink-soft">
          {pending.length === 1 ? "1 attempt is" : `${pending.length} attempts are`} waiting to be sent. They are kept on this device and sent as soon as the connection allows.
        </p>
      ) : null}
      {rejected.map((e) => (
        <p key={e.captureUid} className="mt-1 text-flag-rose">
          {e.label}: not accepted ({e.lastError}).{" "}
          <button type="button" className="underline" onClick={() => void browserOutbox().discard(e.captureUid)}>
            Remove
          </button>
        </p>
      ))}
    </aside>
  );
}
