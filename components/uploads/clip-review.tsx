"use client";

import { useRouter } from "next/navigation";
import { useEffect, useMemo, useRef, useState } from "react";
import { CartesianGrid, Line, LineChart, ReferenceArea, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { HandOverlay } from "@/components/tracking/hand-overlay";
import { Button } from "@/components/ui/button";
import { Badge } from "@/components/ui/card";
import { SelectField } from "@/components/ui/field";
import type { StoredAttempt } from "@/lib/captures/upload";
import type { Condition, Digit, MotionId } from "@/lib/motions/catalog";
import { frameIndexAt, type ClipReviewTrace } from "@/lib/uploads/clip-review";
import { clipTarget, type ClipTarget } from "@/lib/uploads/clip-target";
import { FOREARM_LINE_WORDS } from "@/components/visit-room/neutral-reading";
import { FOREARM_SOURCES, type ForearmSource } from "@/vision/wrist-axis";
import { measurementMethodWords } from "@/vision/pipeline";
import { ClipAnalyzer, type ClipToAnalyze } from "./clip-analyzer";

export interface ClipReviewProps {
  upload: {
    id: string;
    uploadUid: string;
    clientId: string;
    motion: MotionId;
    side: "left" | "right" | null;
    digit: Digit | null;
    createdAt: string;
    reviewedAt: string | null;
  };
  attempt: (StoredAttempt & { keptAt: string | null }) | null;
  trace: ClipReviewTrace | null;
  /** The motion's digits (for a clip sent without one) and its two test positions in words. */
  digits: readonly Digit[];
  positions: Record<Condition, string>;
}

const deg = (v: number | null, digits = 0) => (v === null ? "—" : `${v.toFixed(digits)}°`);
const PLANE_WORDS: Record<string, string> = { against_gravity: "against gravity", gravity_assisted: "gravity assisted", gravity_minimized: "gravity minimized", unclear: "unclear" };

/** The stored clip as an object URL: fetched once through the owner-checked route, so the player can seek freely. */
function useClipUrl(uploadId: string): { url: string | null; error: string | null } {
  const [state, setState] = useState<{ url: string | null; error: string | null }>({ url: null, error: null });
  useEffect(() => {
    let url: string | null = null;
    let cancelled = false;
    void fetch(`/api/v1/uploads/${uploadId}/file`, { credentials: "same-origin" })
      .then(async (res) => {
        if (!res.ok) throw new Error(`the server answered ${res.status}`);
        const blob = await res.blob();
        if (cancelled) return;
        url = URL.createObjectURL(blob);
        setState({ url, error: null });
      })
      .catch((error: unknown) => !cancelled && setState({ url: null, error: `The clip could not be loaded (${error instanceof Error ? error.message : String(error)}).` }));
    return () => {
      cancelled = true;
      if (url) URL.revokeObjectURL(url);
    };
  }, [uploadId]);
  return state;
}

/**
 * The therapist's review of an uploaded clip: the server's measurement with its uncertainty, repetitions, plane check
 * and tracking quality; the per-frame angle trace; the clip with the measured hand drawn over it; and the decision
 * whether the attempt counts. Without a measurement (the client's browser never finished), this browser measures it.
 */
export function ClipReview({ upload, attempt, trace, digits, positions }: ClipReviewProps) {
  const router = useRouter();
  const clip = useClipUrl(upload.id);
  const video = useRef<HTMLVideoElement>(null);
  const [frameIndex, setFrameIndex] = useState(0);
  const [size, setSize] = useState({ width: 640, height: 480 });
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  // Follows the frame on screen while the clip plays or is scrubbed, so the drawing is the one measured on that frame.
  useEffect(() => {
    const element = video.current;
    if (!element || !trace || !clip.url || !("requestVideoFrameCallback" in element)) return;
    let handle = 0;
    const onFrame = (_now: number, metadata: VideoFrameCallbackMetadata) => {
      setFrameIndex(frameIndexAt(trace.points, metadata.mediaTime * 1000));
      handle = element.requestVideoFrameCallback(onFrame);
    };
    handle = element.requestVideoFrameCallback(onFrame);
    return () => element.cancelVideoFrameCallback(handle);
  }, [trace, clip.url]);

  async function review(counts: boolean | undefined) {
    setBusy(true);
    setError(null);
    const res = await fetch(`/api/v1/uploads/${upload.id}`, {
      method: "PATCH",
      headers: { "content-type": "application/json" },
      body: JSON.stringify(counts === undefined ? { reviewed: true } : { reviewed: true, counts }),
    }).catch(() => null);
    setBusy(false);
    if (res?.ok) router.refresh();
    else setError(((await res?.json().catch(() => ({}))) as { error?: string } | undefined)?.error ?? "The review could not be saved; try again.");
  }

  const point = trace?.points[frameIndex] ?? null;
  const chartData = useMemo(() => trace?.points.map((p) => ({ s: p.t / 1000, angle: p.angleDeg, smoothed: p.smoothedDeg })) ?? [], [trace]);
  const withAngle = trace?.points.filter((p) => p.angleDeg !== null).length ?? 0;

  return (
    <div className="grid gap-6">
      {attempt ? (
        <section aria-label="Measurement" className="grid gap-3">
          <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-sm sm:grid-cols-4" data-testid="clip-measurement">
            <div>
              <dt className="text-ink-soft">Peak</dt>
              <dd className="text-lg font-semibold" data-testid="clip-peak" data-peak-deg={attempt.peakDeg ?? ""} data-uncertainty-deg={attempt.uncertaintyDeg ?? ""}>
                {deg(attempt.peakDeg)}
                {attempt.uncertaintyDeg === null ? "" : ` ± ${attempt.uncertaintyDeg.toFixed(0)}°`}
              </dd>
            </div>
            <div>
              <dt className="text-ink-soft">Start · arc</dt>
              <dd>
                {deg(attempt.startDeg)} · {deg(attempt.arcDeg)}
              </dd>
            </div>
            <div>
              <dt className="text-ink-soft">Repetitions</dt>
              <dd data-testid="clip-reps">{attempt.reps}</dd>
            </div>
            <div>
              <dt className="text-ink-soft">Test plane</dt>
              <dd data-testid="clip-plane">
                {PLANE_WORDS[attempt.planeVerdict] ?? attempt.planeVerdict}
                {attempt.axisToGravityDeg === null ? "" : ` (axis ${attempt.axisToGravityDeg.toFixed(0)}° from gravity)`}{" "}
                {attempt.planeVerified ? <Badge tone="good">as declared</Badge> : <Badge tone="caution">not as declared ({PLANE_WORDS[attempt.condition]})</Badge>}
              </dd>
            </div>
            <div>
              <dt className="text-ink-soft">Tracking</dt>
              <dd data-testid="clip-quality">
                hand usable in {attempt.usableFrames} of {attempt.frames} frames ({Math.round((100 * attempt.usableFrames) / Math.max(1, attempt.frames))}%)
              </dd>
            </div>
            {attempt.forearmSource && (FOREARM_SOURCES as readonly string[]).includes(attempt.forearmSource) ? (
              <div>
                <dt className="text-ink-soft">Wrist angle read against</dt>
                <dd data-testid="clip-forearm" data-source={attempt.forearmSource}>
                  {FOREARM_LINE_WORDS[attempt.forearmSource as ForearmSource]}
                </dd>
              </div>
            ) : null}
            <div>
              <dt className="text-ink-soft">Method</dt>
              <dd>
                {measurementMethodWords(attempt.method)}
                {trace?.handModels.length === 2 ? (
                  <span data-testid="clip-hand-models">; read by both hand models (lite and full), the mean where both saw the hand</span>
                ) : null}
              </dd>
            </div>
          </dl>
          {attempt.warnings.length ? (
            <ul className="list-disc pl-5 text-sm text-flag-amber" data-testid="clip-warnings">
              {attempt.warnings.map((w) => (
                <li key={w}>{w}</li>
              ))}
            </ul>
          ) : null}
          <p className="text-xs text-ink-faint">
            ± is the 90% interval of the angle for this joint, camera view and tracking score, from Kinarc&apos;s validation against rendered hands (for
            the peak, the width that held nine in ten peaks there, as a peak misses by more than a single frame); the numbers are the server&apos;s own
            analysis of the stored frames.
          </p>
        </section>
      ) : null}

      <section aria-label="Clip with the hand drawing" className="grid gap-2">
        {clip.error ? <p role="alert" className="text-sm text-flag-rose">{clip.error}</p> : null}
        {clip.url && trace ? (
          <>
            <div className="relative max-w-2xl">
              <video
                ref={video}
                src={clip.url}
                controls
                muted
                playsInline
                data-testid="review-video"
                className="w-full rounded-lg bg-ink object-contain"
                onLoadedMetadata={(e) => setSize({ width: e.currentTarget.videoWidth, height: e.currentTarget.videoHeight })}
              />
              <HandOverlay
                image={trace.images[frameIndex] ?? null}
                videoWidth={size.width}
                videoHeight={size.height}
                fit="contain"
                mirrored={false}
                motion={upload.motion}
                digit={attempt?.digit as Digit | null}
                angleDeg={point?.smoothedDeg ?? point?.angleDeg ?? null}
                targetDeg={null}
                faded={point?.quality !== "ok"}
              />
            </div>
            <p className="text-sm text-ink-soft" data-testid="overlay-reading" data-frame={frameIndex}>
              Frame {frameIndex + 1} of {trace.points.length}: {point?.angleDeg === null || !point ? "no usable hand" : `${deg(point.smoothedDeg ?? point.angleDeg, 1)}`}
            </p>
          </>
        ) : null}
      </section>

      {trace ? (
        <figure aria-label="Angle over the clip" data-testid="angle-trace" data-points={trace.points.length} data-with-angle={withAngle}>
          <div className="h-56 w-full">
            <ResponsiveContainer>
              <LineChart data={chartData} margin={{ top: 12, right: 16, bottom: 4, left: 0 }}>
                <CartesianGrid stroke="#e8e1d6" strokeDasharray="3 3" />
                <XAxis dataKey="s" type="number" domain={["dataMin", "dataMax"]} unit=" s" fontSize={11} />
                <YAxis unit="°" fontSize={11} />
                <Tooltip formatter={(v) => `${Number(v).toFixed(1)}°`} labelFormatter={(v) => `${Number(v).toFixed(2)} s`} />
                <Line name="angle" dataKey="angle" stroke="#c9bfae" strokeWidth={1} dot={false} isAnimationActive={false} connectNulls={false} />
                <Line name="smoothed" dataKey="smoothed" stroke="#1b6f67" strokeWidth={2} dot={false} isAnimationActive={false} connectNulls={false} />
                {trace.repetitions.map((r) => (
                  <ReferenceArea
                    key={r.startMs}
                    x1={r.startMs / 1000}
                    x2={r.endMs / 1000}
                    fill="#b45309"
                    fillOpacity={0.08}
                    label={{ value: `${r.peakDeg.toFixed(0)}°`, position: "insideTop", fontSize: 10, fill: "#b45309" }}
                  />
                ))}
                {point ? <ReferenceLine x={point.t / 1000} stroke="#0b2f2b" strokeDasharray="2 2" /> : null}
              </LineChart>
            </ResponsiveContainer>
          </div>
          <figcaption className="text-xs text-ink-faint">
            The engine&apos;s angle on every frame ({withAngle} of {trace.points.length} with a usable hand), smoothed line in green; each repetition found is
            shaded with its held peak.
          </figcaption>
        </figure>
      ) : null}

      {!attempt ? <MeasureHere upload={upload} digits={digits} positions={positions} onSaved={() => router.refresh()} /> : null}

      <section aria-label="Review" className="grid gap-2">
        <div className="flex flex-wrap items-center gap-2">
          {upload.reviewedAt ? <Badge tone="good">Reviewed</Badge> : <Badge tone="caution">Not reviewed</Badge>}
          {attempt ? attempt.keptAt ? <Badge tone="good">Counts towards the grade</Badge> : <Badge>Does not count</Badge> : null}
        </div>
        <div className="flex flex-wrap gap-2">
          {attempt ? (
            <>
              <Button disabled={busy} onClick={() => void review(true)}>
                Reviewed: counts towards the grade
              </Button>
              <Button variant="quiet" disabled={busy} onClick={() => void review(false)}>
                Reviewed: does not count
              </Button>
            </>
          ) : !upload.reviewedAt ? (
            <Button variant="quiet" disabled={busy} onClick={() => void review(undefined)}>
              Mark reviewed
            </Button>
          ) : null}
        </div>
        {error ? (
          <p role="alert" className="text-sm text-flag-rose">
            {error}
          </p>
        ) : null}
      </section>
    </div>
  );
}

/** Measures the stored clip in this browser when the client's own measurement never arrived. */
function MeasureHere({ upload, digits, positions, onSaved }: Pick<ClipReviewProps, "upload" | "digits" | "positions"> & { onSaved: () => void }) {
  const [run, setRun] = useState<{ clip: ClipToAnalyze; target: ClipTarget } | null>(null);
  const [error, setError] = useState<string | null>(null);

  async function start(form: HTMLFormElement) {
    const data = new FormData(form);
    setError(null);
    try {
      const target = clipTarget({ motion: upload.motion, side: upload.side, digit: upload.digit ?? String(data.get("digit") ?? "") }, String(data.get("condition") ?? ""));
      const res = await fetch(`/api/v1/uploads/${upload.id}/file`, { credentials: "same-origin" });
      if (!res.ok) throw new Error(`the clip could not be fetched (the server answered ${res.status})`);
      const blob = await res.blob();
      setRun({ clip: { uploadId: upload.id, uploadUid: upload.uploadUid, clientId: upload.clientId, sentAt: Date.parse(upload.createdAt), source: blob }, target });
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
    }
  }

  return (
    <section aria-label="Measure this clip" className="grid max-w-xl gap-3 rounded-lg border border-sand-200 p-3">
      <p className="text-sm">
        This clip has not been measured yet: the client&apos;s browser did not finish. Measure it here with the same hand tracking; the result is stored
        once, whoever measures it.
      </p>
      {run ? (
        <ClipAnalyzer clip={run.clip} target={run.target} showNumbers onSaved={onSaved} />
      ) : (
        <form
          aria-label="Measure this clip"
          className="grid gap-3"
          onSubmit={(e) => {
            e.preventDefault();
            void start(e.currentTarget);
          }}
        >
          {!upload.digit && digits.length ? (
            <SelectField label="Finger" name="digit" options={digits.map((d) => ({ value: d, label: d }))} />
          ) : null}
          <SelectField
            label="Test position seen in the clip"
            name="condition"
            options={[
              { value: "against_gravity", label: `Against gravity: ${positions.against_gravity}` },
              { value: "gravity_minimized", label: `Gravity minimized: ${positions.gravity_minimized}` },
            ]}
          />
          <div>
            <Button type="submit">Measure this clip here</Button>
          </div>
        </form>
      )}
      {error ? (
        <p role="alert" className="text-sm text-flag-rose">
          {error}
        </p>
      ) : null}
    </section>
  );
}
