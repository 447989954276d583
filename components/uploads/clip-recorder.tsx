"use client";

import { useEffect, useRef, useState } from "react";
import { Button } from "@/components/ui/button";

/** Long enough for a few slow repetitions of one motion, short enough to stay well under the upload limit. */
const MAX_CLIP_SECONDS = 60;

function pickMimeType(): string | undefined {
  if (typeof MediaRecorder === "undefined") return undefined;
  return ["video/webm;codecs=vp9", "video/webm;codecs=vp8", "video/webm", "video/mp4"].find((t) => MediaRecorder.isTypeSupported(t));
}

type Phase = "idle" | "preview" | "recording" | "recorded" | "error";

/**
 * Records a short clip with the camera, in the browser, as WebM (or MP4 where only that is offered). The clip stays on
 * this device until it is sent; nothing is uploaded while recording.
 */
export function ClipRecorder({ onRecorded }: { onRecorded: (file: File | null) => void }) {
  const video = useRef<HTMLVideoElement>(null);
  const stream = useRef<MediaStream | null>(null);
  const recorder = useRef<MediaRecorder | null>(null);
  const [phase, setPhase] = useState<Phase>("idle");
  const [seconds, setSeconds] = useState(0);
  const [playback, setPlayback] = useState<string | null>(null);
  const [message, setMessage] = useState<string | null>(null);

  const stopCamera = () => {
    stream.current?.getTracks().forEach((t) => t.stop());
    stream.current = null;
  };
  useEffect(() => () => stopCamera(), []);
  useEffect(() => () => void (playback && URL.revokeObjectURL(playback)), [playback]);

  useEffect(() => {
    if (phase !== "recording") return;
    const started = Date.now();
    const timer = window.setInterval(() => {
      const s = Math.floor((Date.now() - started) / 1000);
      setSeconds(s);
      if (s >= MAX_CLIP_SECONDS) recorder.current?.stop();
    }, 250);
    return () => window.clearInterval(timer);
  }, [phase]);

  async function startCamera() {
    setMessage(null);
    try {
      stream.current = await navigator.mediaDevices.getUserMedia({ video: { width: { ideal: 1280 }, height: { ideal: 720 } }, audio: false });
      if (video.current) {
        video.current.srcObject = stream.current;
        await video.current.play().catch(() => undefined);
      }
      setPhase("preview");
    } catch {
      setPhase("error");
      setMessage("The camera could not be opened. Allow camera access in the browser, or choose a clip you recorded with your phone below.");
    }
  }

  function record() {
    const mimeType = pickMimeType();
    if (!stream.current || !mimeType) {
      setPhase("error");
      setMessage("This browser cannot record video here; choose a clip you recorded with your phone instead.");
      return;
    }
    const chunks: Blob[] = [];
    const r = new MediaRecorder(stream.current, { mimeType, videoBitsPerSecond: 2_500_000 });
    r.ondataavailable = (e) => e.data.size && chunks.push(e.data);
    r.onstop = () => {
      const type = mimeType.split(";")[0];
      const blob = new Blob(chunks, { type });
      const file = new File([blob], `clip-${new Date().toISOString().slice(0, 19).replace(/[:T]/g, "-")}.${type === "video/mp4" ? "mp4" : "webm"}`, { type });
      setPlayback(URL.createObjectURL(blob));
      stopCamera();
      setPhase("recorded");
      onRecorded(file);
    };
    recorder.current = r;
    r.start(1000);
    setSeconds(0);
    setPhase("recording");
  }

  return (
    <div className="grid gap-2 rounded-lg border border-sand-200 p-3">
      <p className="text-sm font-medium">Record with the camera</p>
      {phase === "recorded" && playback ? (
        <video src={playback} controls className="max-h-64 w-full rounded-lg bg-ink" aria-label="Your recorded clip" />
      ) : (
        <video ref={video} muted playsInline className={`max-h-64 w-full rounded-lg bg-ink ${phase === "preview" || phase === "recording" ? "" : "hidden"}`} aria-label="Camera preview" />
      )}
      <div className="flex flex-wrap items-center gap-2">
        {phase === "idle" || phase === "error" ? (
          <Button type="button" variant="quiet" onClick={() => void startCamera()}>
            Open camera
          </Button>
        ) : null}
        {phase === "preview" ? (
          <Button type="button" onClick={record}>
            Start recording
          </Button>
        ) : null}
        {phase === "recording" ? (
          <Button type="button" variant="danger" onClick={() => recorder.current?.stop()}>
            Stop recording ({seconds} s of {MAX_CLIP_SECONDS})
          </Button>
        ) : null}
        {phase === "recorded" ? (
          <>
            <span role="status" className="text-sm text-tide-700">
              Clip recorded; it is sent when you press Send.
            </span>
            <Button
              type="button"
              variant="quiet"
              onClick={() => {
                onRecorded(null);
                setPlayback(null);
                void startCamera();
              }}
            >
              Record again
            </Button>
          </>
        ) : null}
      </div>
      {message ? (
        <p role="alert" className="text-sm text-flag-rose">
          {message}
        </p>
      ) : null}
    </div>
  );
}
