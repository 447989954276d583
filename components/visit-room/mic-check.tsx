"use client";

import { useEffect, useState } from "react";

/**
 * The microphone check before joining: listens on its own audio stream (closed again on unmount, before the room
 * opens its microphone) and shows the level, with plain words once speech is heard.
 */
export function MicCheck({ active = true }: { active?: boolean }) {
  const [level, setLevel] = useState(0);
  const [heard, setHeard] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);

  useEffect(() => {
    if (!active) return;
    let cancelled = false;
    let raf = 0;
    let ctx: AudioContext | null = null;
    let stream: MediaStream | null = null;
    navigator.mediaDevices
      .getUserMedia({ audio: true })
      .then((s) => {
        if (cancelled) return s.getTracks().forEach((t) => t.stop());
        stream = s;
        ctx = new AudioContext();
        const analyser = ctx.createAnalyser();
        analyser.fftSize = 512;
        ctx.createMediaStreamSource(s).connect(analyser);
        const data = new Uint8Array(analyser.fftSize);
        const tick = () => {
          analyser.getByteTimeDomainData(data);
          let peak = 0;
          for (const v of data) peak = Math.max(peak, Math.abs(v - 128));
          const l = peak / 128;
          setLevel(l);
          if (l > 0.05) setHeard(true);
          raf = requestAnimationFrame(tick);
        };
        tick();
      })
      .catch((error: Error) =>
        setProblem(
          error.name === "NotAllowedError"
            ? "Your browser is blocking the microphone. Allow it for this site (the icon in the address bar), then reload the page."
            : "No microphone was found. Plug one in, or use a phone or laptop that has one.",
        ),
      );
    return () => {
      cancelled = true;
      cancelAnimationFrame(raf);
      void ctx?.close();
      stream?.getTracks().forEach((t) => t.stop());
    };
  }, [active]);

  if (problem)
    return (
      <p role="alert" className="text-sm text-flag-rose">
        {problem}
      </p>
    );
  return (
    <p className="flex items-center gap-2 text-sm" data-testid="mic-check">
      {heard ? "✓ We can hear you." : "Say something to test your microphone."}
      <span className="inline-block h-2 w-24 overflow-hidden rounded bg-sand-200" aria-hidden>
        <span className="block h-full bg-tide-500" style={{ width: `${Math.min(100, level * 200)}%` }} />
      </span>
    </p>
  );
}
