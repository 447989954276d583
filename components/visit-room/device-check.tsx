"use client";

import { useEffect, useRef, useState } from "react";
import { MicCheck } from "./mic-check";

export interface DeviceCheckResult {
  videoDeviceId?: string;
  audioDeviceId?: string;
}

/**
 * Before joining: a live camera preview and a microphone level, with plain advice when something is wrong. The
 * preview streams are stopped before the room opens its own.
 */
export function DeviceCheck({ onReady, joining }: { onReady: (devices: DeviceCheckResult) => void; joining: boolean }) {
  const video = useRef<HTMLVideoElement>(null);
  const [stream, setStream] = useState<MediaStream | null>(null);
  const [problem, setProblem] = useState<string | null>(null);

  useEffect(() => {
    let cancelled = false;
    let local: MediaStream | null = null;
    navigator.mediaDevices
      .getUserMedia({ video: { width: 640, height: 480 } })
      .then((s) => {
        if (cancelled) return s.getTracks().forEach((t) => t.stop());
        local = s;
        setStream(s);
        if (video.current) video.current.srcObject = s;
      })
      .catch((error: Error) =>
        setProblem(
          error.name === "NotAllowedError"
            ? "Your browser is blocking the camera or microphone. Allow them for this site (the camera icon in the address bar), then reload the page."
            : error.name === "NotFoundError"
              ? "No camera or microphone was found. Plug one in, or use a phone or laptop that has them."
              : `The camera could not start (${error.message}). Close other apps that use it and reload.`,
        ),
      );
    return () => {
      cancelled = true;
      local?.getTracks().forEach((t) => t.stop());
    };
  }, []);

  const join = () => {
    const videoDeviceId = stream?.getVideoTracks()[0]?.getSettings().deviceId;
    stream?.getTracks().forEach((t) => t.stop());
    onReady({ videoDeviceId });
  };

  return (
    <div className="space-y-4">
      <div className="overflow-hidden rounded-card bg-ink">
        <video ref={video} autoPlay playsInline muted aria-label="Your camera" className="aspect-[4/3] w-full -scale-x-100 object-cover" />
      </div>
      {problem ? (
        <p role="alert" className="rounded-lg bg-flag-roseBg p-3 text-sm text-flag-rose">
          {problem}
        </p>
      ) : (
        <ul className="space-y-1 text-sm">
          <li>{stream ? "✓ Camera is on. Check that your hand and forearm fit in the picture." : "Starting the camera…"}</li>
          <li>
            <MicCheck active={!joining} />
          </li>
        </ul>
      )}
      <button
        type="button"
        onClick={join}
        disabled={!stream || joining}
        className="w-full rounded-lg bg-tide-600 px-4 py-3 text-base font-semibold text-white disabled:bg-tide-200"
      >
        {joining ? "Joining…" : "Join the visit"}
      </button>
    </div>
  );
}
