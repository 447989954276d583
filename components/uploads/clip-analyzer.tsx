"use client";

import { useEffect, useRef, useState } from "react";
import { HandOverlay } from "@/components/tracking/hand-overlay";
import { browserOutbox, runOutbox } from "@/lib/captures/outbox";
import type { CaptureSaveResponse } from "@/lib/captures/upload";
import { clipCaptureUid, clipLabel, type ClipTarget } from "@/lib/uploads/clip-target";
import { MOTIONS } from "@/lib/motions/catalog";
import type { ClipNeutral } from "@/vision/live/clip-capture";
import type { TrackedFrame } from "@/vision/live/types";
import { readsWithBothModels } from "@/vision/model-pair-scope";

export interface ClipToAnalyze {
  uploadId: string;
  uploadUid: string;
  clientId: string;
  /** When the clip reached the clinic (UTC ms); the attempt is dated by it. */
  sentAt: number;
  /** The picked or recorded file, or the stored file's URL (therapist's run). */
  source: Blob | string;
}

type Phase =
  | { kind: "loading" }
  | { kind: "measuring"; done: number; total: number }
  | { kind: "queued" }
  | { kind: "saved"; peakDeg: number | null; uncertaintyDeg: number | null; reps: number }
  | { kind: "failed"; message: string };

/**
 * Measures an uploaded clip in this browser with the app's own tracking (vision/live/clip-analysis.ts), frame by
 * frame, with the hand drawn over the clip as it goes, then hands the capture to the attempt outbox: kept on this
 * device until the server has stored it (and re-analyzed it with the same engine), so nothing is lost to a dropped
 * connection. `showNumbers` shows the stored result (staff); clients see only that it was sent.
 */
export function ClipAnalyzer({ clip, target, showNumbers, onSaved }: { clip: ClipToAnalyze; target: ClipTarget; showNumbers: boolean; onSaved?: (response: CaptureSaveResponse) => void }) {
  const video = useRef<HTMLVideoElement>(null);
  const [phase, setPhase] = useState<Phase>({ kind: "loading" });
  const [frame, setFrame] = useState<TrackedFrame | null>(null);
  const [size, setSize] = useState({ width: 640, height: 480 });
  const [neutral, setNeutral] = useState<ClipNeutral | null>(null);
  const onSavedRef = useRef(onSaved);
  useEffect(() => {
    onSavedRef.current = onSaved;
  });

  useEffect(() => {
    const element = video.current;
    if (!element) return;
    const abort = new AbortController();
    const captureUid = clipCaptureUid(clip.uploadUid);
    const outbox = browserOutbox();
    const stopOutbox = runOutbox(outbox);
    const unsubscribe = outbox.onSaved((entry, response) => {
      if (entry.captureUid !== captureUid) return;
      setPhase({ kind: "saved", peakDeg: response.attempt.peakDeg, uncertaintyDeg: response.attempt.uncertaintyDeg, reps: response.attempt.reps });
      onSavedRef.current?.(response);
    });
    const src = typeof clip.source === "string" ? clip.source : URL.createObjectURL(clip.source);
    let lastDrawn = 0;
    void (async () => {
      try {
        // Loaded only when a clip is measured: the tasks library is large and most pages never need it.
        const { analyzeClipInBrowser } = await import("@/vision/live/clip-analysis");
        const result = await analyzeClipInBrowser(element, src, target, {
          forearm: MOTIONS[target.motion].joint === "wrist",
          // A finger's flexion clip is read by both hand models (vision/model-pair.ts): on held-out clips that read the
          // angles more truly and lost fewer frames than either model alone (scripts/accuracy/README.md).
          fullModel: readsWithBothModels(target.motion, target.digit),
          signal: abort.signal,
          onProgress: (done, total) => {
            // A state update per frame would re-render hundreds of times for nothing a person can read.
            if (done === total || performance.now() - lastDrawn > 100) {
              lastDrawn = performance.now();
              setPhase({ kind: "measuring", done, total });
            }
          },
          onFrame: (f) => setFrame(f),
        });
        setSize({ width: result.stepped.videoWidth, height: result.stepped.videoHeight });
        setNeutral(result.neutral);
        await outbox.enqueue({ captureUid, source: "upload", clientId: clip.clientId, uploadId: clip.uploadId, recordedAt: clip.sentAt, capture: result.capture }, clipLabel(target));
        setPhase((p) => (p.kind === "saved" ? p : { kind: "queued" }));
      } catch (error) {
        if (abort.signal.aborted) return;
        const message = error instanceof Error ? error.message : String(error);
        setPhase({ kind: "failed", message: message.replace(/^(CLIP|clip): /, "") });
      }
    })();
    return () => {
      abort.abort();
      unsubscribe();
      stopOutbox();
      if (typeof clip.source !== "string") URL.revokeObjectURL(src);
    };
  }, [clip, target]);

  return (
    <section aria-label="Clip measurement" className="grid gap-2 rounded-lg border border-sand-200 p-3" data-testid="clip-analyzer" data-phase={phase.kind}>
      <p className="text-sm font-medium">Measuring the clip on this device</p>
      <div className="relative">
        <video
          ref={video}
          muted
          playsInline
          className="max-h-64 w-full rounded-lg bg-ink object-contain"
          onLoadedMetadata={(e) => setSize({ width: e.currentTarget.videoWidth, height: e.currentTarget.videoHeight })}
        />
        <HandOverlay
          image={frame?.image ?? null}
          videoWidth={size.width}
          videoHeight={size.height}
          fit="contain"
          mirrored={false}
          motion={target.motion}
          digit={target.digit}
          angleDeg={null}
          targetDeg={null}
        />
      </div>
      <p role="status" className="text-sm text-ink-soft" data-testid="clip-analyzer-status">
        {phase.kind === "loading" ? "Loading the hand tracker…" : null}
        {phase.kind === "measuring" ? `Measuring frame ${phase.done} of ${phase.total}…` : null}
        {phase.kind === "queued" ? "Measured. The result is kept on this device and sent as soon as the connection allows." : null}
        {phase.kind === "saved"
          ? showNumbers
            ? `Measured and stored: peak ${phase.peakDeg === null ? "not found" : `${phase.peakDeg.toFixed(0)}°`}${phase.uncertaintyDeg === null ? "" : ` ± ${phase.uncertaintyDeg.toFixed(0)}°`}, ${phase.reps} repetition${phase.reps === 1 ? "" : "s"}.`
            : "Measured and sent. Your therapist will review it."
          : null}
        {phase.kind === "failed"
          ? showNumbers
            ? `The clip could not be measured: ${phase.message}.`
            : `The clip could not be measured here: ${phase.message}. It was still sent; your therapist can measure it.`
          : null}
      </p>
      {neutral ? (
        <p className={`text-sm ${neutral.ok ? "text-tide-700" : "text-flag-amber"}`} data-testid="clip-neutral" data-status={neutral.ok ? "taken" : "refused"}>
          {neutral.ok
            ? `Straight-wrist reading taken from ${(neutral.startMs / 1000).toFixed(1)} s into the clip: the wrist is measured against it.`
            : `No straight-wrist reading: ${neutral.problem} The wrist is measured from how the hand started instead, which is far less certain. If you can, record the clip again, starting with 3 seconds of a still, straight wrist and the forearm resting.`}
        </p>
      ) : null}
    </section>
  );
}
