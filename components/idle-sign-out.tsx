"use client";

import { useEffect, useRef, useState } from "react";
import { signOutAction } from "@/app/actions";

const WARN_BEFORE_MS = 60_000;
const KEEP_ALIVE_EVERY_MS = 2 * 60_000;
const ACTIVITY_EVENTS = ["pointerdown", "keydown", "wheel", "touchstart", "mousemove"] as const;

/**
 * Staff are signed out after `idleMinutes` without input (the server enforces the same limit on its side). A minute
 * before, a notice offers to stay signed in. While someone is active, a keep-alive tells the server so.
 */
export function IdleSignOut({ idleMinutes }: { idleMinutes: number }) {
  const lastInput = useRef(0);
  const lastPing = useRef(0);
  const form = useRef<HTMLFormElement>(null);
  const [secondsLeft, setSecondsLeft] = useState<number | null>(null);

  useEffect(() => {
    lastInput.current = Date.now();
    lastPing.current = Date.now();
    const mark = () => {
      lastInput.current = Date.now();
    };
    for (const e of ACTIVITY_EVENTS) window.addEventListener(e, mark, { passive: true });
    const timer = window.setInterval(() => {
      const now = Date.now();
      const idleMs = now - lastInput.current;
      const limitMs = idleMinutes * 60_000;
      if (idleMs >= limitMs) {
        window.clearInterval(timer);
        form.current?.requestSubmit();
        return;
      }
      setSecondsLeft(limitMs - idleMs <= WARN_BEFORE_MS ? Math.ceil((limitMs - idleMs) / 1000) : null);
      if (idleMs < KEEP_ALIVE_EVERY_MS && now - lastPing.current >= KEEP_ALIVE_EVERY_MS) {
        lastPing.current = now;
        void fetch("/api/v1/session/activity", { method: "POST" }).catch(() => undefined);
      }
    }, 1000);
    return () => {
      window.clearInterval(timer);
      for (const e of ACTIVITY_EVENTS) window.removeEventListener(e, mark);
    };
  }, [idleMinutes]);

  return (
    <>
      <form ref={form} action={signOutAction} hidden />
      {secondsLeft !== null ? (
        <div role="alertdialog" aria-live="assertive" aria-label="About to sign out" className="fixed inset-x-0 bottom-4 z-50 mx-auto w-fit rounded-card border border-flag-amber/40 bg-flag-amberBg px-4 py-3 text-sm shadow">
          No activity for a while: you will be signed out in {secondsLeft} s to protect client records.{" "}
          <button
            type="button"
            className="ml-2 rounded-lg bg-white px-3 py-1 font-semibold text-tide-700 ring-1 ring-tide-200"
            onClick={() => {
              lastInput.current = Date.now();
              setSecondsLeft(null);
            }}
          >
            Stay signed in
          </button>
        </div>
      ) : null}
    </>
  );
}
