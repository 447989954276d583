"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useEffect, useRef, useState } from "react";
import { SafetyNote } from "@/components/safety-note";
import { Badge, Card } from "@/components/ui/card";
import { RESISTED_TEST_CAUTION } from "@/lib/grading/grade";
import { MOTIONS, type MotionId } from "@/lib/motions/catalog";
import { fetchJson } from "@/lib/queries/query-client";
import { TelemetryAligner, type TelemetryFrame } from "@/lib/visits/telemetry";
import type { VisitSummary } from "@/lib/visits/summary";
import { useVisitRoom } from "@/lib/visits/use-visit-room";
import { DeviceCheck } from "./device-check";
import { ConsoleNeutralStatus, FOREARM_LINE_WORDS, type ConsoleNeutral } from "./neutral-reading";
import { CONDITION_LABELS, TestPicker, type TestChoice } from "./test-picker";
import { TrackAudio, TrackVideo } from "./track-video";
import { VisitOverlay } from "./visit-overlay";
import { MODELS_DISAGREE_NOTE } from "@/vision/model-pair-scope";

const PLANE_WORDS: Record<string, string> = {
  against_gravity: "against gravity",
  gravity_minimized: "gravity minimized",
  gravity_assisted: "gravity assisted",
  unclear: "plane unclear",
};

export interface VisitConsoleProps {
  visitId: string;
  clientName: string;
  when: string;
  affectedSide: "left" | "right" | "both";
  diagnosisNote: string;
  resistanceBlocked: boolean;
  noResistedUntil: string | null;
  precautionNote: string;
}

const sameTest = (a: Pick<TestChoice, "motion" | "side" | "digit" | "condition"> | null, b: { motion: string; side: string; digit: string | null; condition: string }) =>
  !!a && a.motion === b.motion && a.side === b.side && a.digit === b.digit && a.condition === b.condition;

/** The therapist's side of a video visit. */
export function VisitConsole(props: VisitConsoleProps) {
  const queryClient = useQueryClient();
  const aligner = useRef(new TelemetryAligner(150));
  const [frame, setFrame] = useState<TelemetryFrame | null>(null);
  const [test, setTest] = useState<TestChoice | null>(null);
  const [keepState, setKeepState] = useState<{ requestId: string; status: "asked" | "saved" | "queued" } | null>(null);
  const testRef = useRef<TestChoice | null>(null);
  useEffect(() => {
    testRef.current = test;
  });
  const [neutral, setNeutral] = useState<(ConsoleNeutral & { requestId: string }) | null>(null);
  const [notes, setNotes] = useState("");
  const [ended, setEnded] = useState(false);
  const [videoSize, setVideoSize] = useState({ width: 0, height: 0 });
  const summaryKey = ["visits", props.visitId, "summary"];
  const summary = useQuery({ queryKey: summaryKey, queryFn: () => fetchJson<VisitSummary>(`/api/v1/visits/${props.visitId}/summary`) });

  const { state, join, leave, sendControl } = useVisitRoom(props.visitId, {
    onTelemetry: (f, arrival) => aligner.current.push(f, arrival),
    onControl: (m) => {
      if (m.type === "test") {
        // A reading holds only for the test it was taken for, as on the client's device (use-hand-tracking.ts).
        if (!sameTest(testRef.current, m)) setNeutral(null);
        setTest({ motion: m.motion as MotionId, side: m.side, digit: m.digit as TestChoice["digit"], condition: m.condition, oneFinger: m.oneFinger === true });
      }
      if (m.type === "neutral") {
        // Only the answer to the latest request counts; a late answer to an earlier one is dropped.
        setNeutral((prev) => (prev && m.requestId !== null && m.requestId !== prev.requestId ? prev : { ...m, requestId: m.requestId ?? prev?.requestId ?? "" }));
      }
      if (m.type === "kept") {
        setKeepState({ requestId: m.requestId, status: m.queued ? "queued" : "saved" });
        void queryClient.invalidateQueries({ queryKey: summaryKey });
      }
    },
  });

  // Draw telemetry on the frame it belongs to: hold it back by the video's jitter-buffer delay.
  useEffect(() => {
    let raf = 0;
    const loop = () => {
      const due = aligner.current.take(performance.now());
      if (due) {
        setFrame(due);
        // `npm run bench -- visit` sets this flag to read the delay from sending to drawing; nothing else does.
        const bench = (window as { __kinarcOverlayDelays?: number[] }).__kinarcOverlayDelays;
        bench?.push((Date.now() % 2 ** 32) - due.t);
      }
      raf = requestAnimationFrame(loop);
    };
    raf = requestAnimationFrame(loop);
    return () => cancelAnimationFrame(raf);
  }, []);
  useEffect(() => {
    const track = state.remoteVideo;
    if (!track) return;
    const timer = setInterval(async () => {
      const stats = await track.receiver?.getStats();
      stats?.forEach((s) => {
        if (s.type === "inbound-rtp" && s.jitterBufferEmittedCount) {
          const delayMs = (s.jitterBufferDelay / s.jitterBufferEmittedCount) * 1000;
          aligner.current.setVideoDelay(delayMs);
          const w = window as { __kinarcOverlayDelays?: number[]; __kinarcVideoDelayMs?: number };
          if (w.__kinarcOverlayDelays) w.__kinarcVideoDelayMs = delayMs;
        }
      });
    }, 2000);
    return () => clearInterval(timer);
  }, [state.remoteVideo]);

  const endVisit = useMutation({
    mutationFn: () => fetchJson(`/api/v1/visits/${props.visitId}`, { method: "PATCH", body: JSON.stringify({ status: "finished", notes }) }),
    onSuccess: async () => {
      setEnded(true);
      await leave();
      void queryClient.invalidateQueries({ queryKey: summaryKey });
    },
  });

  const prompt = async (choice: TestChoice) => {
    await sendControl({ type: "prompt", ...choice });
    if (!sameTest(test, choice)) setNeutral(null);
    setTest(choice);
  };
  const askNeutral = async () => {
    if (!test) return;
    const requestId = crypto.randomUUID();
    setNeutral({ requestId, status: "asked", motion: test.motion, side: test.side, problem: null, view: null, spreadDeg: null });
    await sendControl({ type: "neutral-ask", requestId });
  };
  const keep = async () => {
    const requestId = crypto.randomUUID();
    setKeepState({ requestId, status: "asked" });
    await sendControl({ type: "keep", requestId });
  };

  const initialSide = props.affectedSide === "left" ? "left" : "right";
  const target = test ? MOTIONS[test.motion] : null;
  const isWrist = target?.joint === "wrist";

  return (
    <div className="grid gap-6 lg:grid-cols-[1fr_22rem]">
      <div className="space-y-4">
        <header className="flex flex-wrap items-baseline justify-between gap-2">
          <h1 className="text-2xl font-semibold">Video visit with {props.clientName}</h1>
          <p className="text-sm text-ink-soft">{props.when}</p>
        </header>
        {state.phase === "idle" || (state.phase === "failed" && !state.remote) ? (
          <Card title="Before you join">
            {state.error ? (
              <p role="alert" className="mb-3 text-sm text-flag-rose">
                {state.error}
              </p>
            ) : null}
            <div className="max-w-md">
              <DeviceCheck onReady={(d) => void join(d)} joining={false} />
            </div>
          </Card>
        ) : (
          <>
            <div className="relative overflow-hidden rounded-card bg-ink" data-testid="client-stage">
              {state.remoteVideo ? (
                <>
                  <TrackVideo
                    track={state.remoteVideo}
                    label={`${props.clientName}'s camera`}
                    className="aspect-[4/3] w-full object-contain"
                    onSize={(width, height) => setVideoSize({ width, height })}
                  />
                  <VisitOverlay frame={frame} motion={test?.motion ?? null} digit={test?.digit ?? null} videoWidth={videoSize.width} videoHeight={videoSize.height} />
                </>
              ) : (
                <p className="flex aspect-[4/3] items-center justify-center text-sand-100">
                  {state.phase === "connecting" ? "Connecting…" : state.phase === "reconnecting" ? "Reconnecting…" : `Waiting for ${props.clientName} to join…`}
                </p>
              )}
              <TrackAudio track={state.remoteAudio} />
              {state.localVideo ? (
                <TrackVideo track={state.localVideo} label="Your camera" mirrored muted className="absolute bottom-3 right-3 w-32 rounded-lg border-2 border-white" />
              ) : null}
            </div>
            <section aria-label="Live reading" className="grid grid-cols-2 gap-3 md:grid-cols-4">
              <Reading label="Angle now" value={frame?.angleDeg} unit="°" big testId="live-angle" uncertaintyDeg={frame?.uncertaintyDeg} />
              <Reading
                label="Peak"
                value={frame?.peakDeg}
                unit="°"
                testId="live-peak"
                uncertaintyDeg={frame?.peakUncertaintyDeg}
                uncertaintyTitle="90% of peaks in validation fell within this (a peak misses by more than a single frame)"
              />
              <Reading label="Repetitions" value={frame ? frame.reps : null} />
              <div className="rounded-card border border-sand-200 bg-white p-3">
                <p className="text-xs uppercase tracking-wide text-ink-soft">Plane check</p>
                <p className="mt-1 font-medium" data-testid="live-plane">
                  {frame?.plane ? PLANE_WORDS[frame.plane] : "—"}
                </p>
                {test && frame?.plane && frame.plane !== "unclear" && frame.plane !== test.condition ? (
                  <p className="text-xs text-flag-amber">does not match {CONDITION_LABELS[test.condition].toLowerCase()}</p>
                ) : null}
                <p className="text-xs text-ink-faint">tracking {frame ? frame.quality.replace("_", " ") : "—"}</p>
              </div>
            </section>
            {isWrist ? (
              <p className="text-sm text-ink-soft" data-testid="live-forearm" data-source={frame?.forearmSource ?? ""}>
                Wrist angle read against: {frame?.forearmSource ? FOREARM_LINE_WORDS[frame.forearmSource] : "—"}
              </p>
            ) : null}
            {test?.oneFinger ? (
              <p className="text-sm text-flag-amber" data-testid="live-one-finger">
                One finger on its own: the camera reads it far less truly than four fingers bent together, mostly too little bend. The ± above is the
                single-finger validation error; for a measured range, ask for all four fingers together.
              </p>
            ) : null}
          </>
        )}
      </div>
      <aside className="space-y-4">
        <Card title="Test in progress">
          {test && target ? (
            <p className="mb-3 text-sm" data-testid="current-test">
              {target.label}
              {test.digit ? `, ${test.digit}` : ""}
              {test.oneFinger ? " (on its own)" : ""}, {test.side} · {CONDITION_LABELS[test.condition]}
            </p>
          ) : (
            <p className="mb-3 text-sm text-ink-soft">No test asked yet.</p>
          )}
          <TestPicker initial={{ motion: "wrist.extension", side: initialSide, digit: null, condition: "against_gravity" }} onPrompt={(c) => void prompt(c)} disabled={state.phase !== "connected" || !state.remote} />
          {isWrist ? (
            <div className="mt-3">
              <button
                type="button"
                onClick={() => void askNeutral()}
                disabled={state.phase !== "connected" || !state.remote || neutral?.status === "asked" || neutral?.status === "holding"}
                className="w-full rounded-lg bg-white px-3 py-2 text-sm font-semibold text-tide-700 ring-1 ring-tide-200 disabled:opacity-40"
              >
                {neutral?.status === "taken" || neutral?.status === "refused" ? "Take the straight-wrist reading again" : "Ask for the straight-wrist reading"}
              </button>
              <ConsoleNeutralStatus neutral={neutral} />
            </div>
          ) : null}
          <button
            type="button"
            onClick={() => void keep()}
            disabled={state.phase !== "connected" || !state.remote || !test}
            className="mt-3 w-full rounded-lg bg-white px-3 py-2 text-sm font-semibold text-tide-700 ring-1 ring-tide-200 disabled:opacity-40"
          >
            Keep this attempt
          </button>
          <p className="mt-1 text-xs text-ink-faint">Keeps the client&apos;s last minute of movement since the test was asked for.</p>
          {keepState ? (
            <p role="status" className="mt-2 text-xs text-ink-soft">
              {keepState.status === "asked" ? "Asking the client's device for the attempt…" : keepState.status === "saved" ? "Attempt saved." : "The client's device is offline; it will send the attempt when back."}
            </p>
          ) : null}
          <KeptAttempts summary={summary.data} />
        </Card>
        <Card title="Proposed grades">
          <ProposedGrades summary={summary.data} />
          {props.resistanceBlocked || props.noResistedUntil ? (
            <p className="mt-3 rounded-lg bg-flag-roseBg p-2 text-xs text-flag-rose">
              No resisted testing{props.noResistedUntil ? ` before ${props.noResistedUntil}` : ""}. {props.precautionNote}
            </p>
          ) : null}
          <p className="mt-3 text-xs text-ink-faint">{RESISTED_TEST_CAUTION}</p>
        </Card>
        <Card title="Notes">
          <textarea aria-label="Visit notes" value={notes} onChange={(e) => setNotes(e.target.value)} rows={4} className="w-full rounded-lg border border-sand-200 p-2 text-sm" />
          <button
            type="button"
            onClick={() => endVisit.mutate()}
            disabled={endVisit.isPending || ended}
            className="mt-3 w-full rounded-lg bg-flag-rose px-3 py-2 text-sm font-semibold text-white disabled:opacity-50"
          >
            {ended ? "Visit ended" : "End visit and save summary"}
          </button>
          {endVisit.error ? <p role="alert" className="mt-2 text-xs text-flag-rose">{endVisit.error.message}</p> : null}
        </Card>
        <SafetyNote compact />
      </aside>
    </div>
  );
}

function Reading({
  label,
  value,
  unit = "",
  big = false,
  testId,
  uncertaintyDeg,
  uncertaintyTitle = "90% of readings in validation fell within this",
}: {
  label: string;
  value: number | null | undefined;
  unit?: string;
  big?: boolean;
  testId?: string;
  /** 90% interval half-width the engine states for this angle (vision/uncertainty.ts). */
  uncertaintyDeg?: number | null;
  /** What the ± means, shown on hover. */
  uncertaintyTitle?: string;
}) {
  const shown = value !== null && value !== undefined;
  return (
    <div className="rounded-card border border-sand-200 bg-white p-3">
      <p className="text-xs uppercase tracking-wide text-ink-soft">{label}</p>
      <p className={`${big ? "text-4xl" : "text-2xl"} font-semibold tabular-nums`} data-testid={testId}>
        {shown ? `${Math.round(value)}${unit}` : "—"}
      </p>
      {shown && uncertaintyDeg != null ? (
        <p className="text-sm tabular-nums text-ink-soft" data-testid={testId ? `${testId}-uncertainty` : undefined} title={uncertaintyTitle}>
          ± {Math.round(uncertaintyDeg)}°
        </p>
      ) : null}
    </div>
  );
}

/**
 * The attempts kept so far, as the server measured them from the raw capture (for finger flexion, both hand models
 * together), which can differ from the live reading above; the engine's notes show here (a disagreement of the two
 * models among them), so a doubtful attempt can be repeated while the client is still in view.
 */
function KeptAttempts({ summary }: { summary: VisitSummary | undefined }) {
  if (!summary?.attempts.length) return null;
  return (
    <ol className="mt-3 space-y-2 border-t border-sand-200 pt-2 text-xs" data-testid="kept-attempts" aria-label="Kept attempts">
      {summary.attempts.map((a) => {
        const gradedOnArc = MOTIONS[a.motion as MotionId]?.gradedOn === "arc";
        const value = gradedOnArc ? a.arcDeg : a.peakDeg;
        return (
          <li key={a.id}>
            <span className="font-medium text-ink">
              {MOTIONS[a.motion as MotionId]?.label ?? a.motion}
              {a.digit ? `, ${a.digit}` : ""} ({a.side}), {(CONDITION_LABELS[a.condition as keyof typeof CONDITION_LABELS] ?? a.condition).toLowerCase()}:
            </span>{" "}
            <span className="text-ink-soft" data-testid="kept-value">
              {gradedOnArc ? "arc" : "peak"} {value === null ? "not found" : `${Math.round(value)}°`}
              {value !== null && a.uncertaintyDeg !== null ? ` ± ${Math.round(a.uncertaintyDeg)}°` : ""}, {a.reps} repetition{a.reps === 1 ? "" : "s"}
              {a.planeVerified ? "" : ", position not confirmed"}
            </span>
            {a.warnings
              .filter((w) => w.startsWith(MODELS_DISAGREE_NOTE))
              .map((w) => (
                <span key={w} className="block text-flag-amber" data-testid="kept-disagree">
                  {w}
                </span>
              ))}
            {a.warnings.some((w) => !w.startsWith(MODELS_DISAGREE_NOTE)) ? (
              <span className="block text-ink-faint">Notes: {a.warnings.filter((w) => !w.startsWith(MODELS_DISAGREE_NOTE)).join("; ")}</span>
            ) : null}
          </li>
        );
      })}
    </ol>
  );
}

function ProposedGrades({ summary }: { summary: VisitSummary | undefined }) {
  if (!summary) return <p className="text-sm text-ink-soft">Loading…</p>;
  if (!summary.proposals.length) return <p className="text-sm text-ink-soft">Keep an attempt to see the grade it supports.</p>;
  return (
    <ul className="space-y-3" data-testid="proposals">
      {summary.proposals.map((p) => (
        <li key={`${p.motion}-${p.side}-${p.digit}`} className="text-sm">
          <p className="font-medium">
            {MOTIONS[p.motion as MotionId]?.label ?? p.motion}
            {p.digit ? `, ${p.digit}` : ""} ({p.side}): <span className="text-lg">{p.grade.value ?? "no grade"}</span> {p.grade.ceiling ? <Badge tone="caution">range ceiling</Badge> : null}
          </p>
          <ul className="ml-4 list-disc text-xs text-ink-soft">
            {p.grade.inPerson.map((n) => (
              <li key={n.reason}>
                In person: {n.detail}
                {n.notBefore ? ` (not before ${n.notBefore})` : ""}
              </li>
            ))}
          </ul>
        </li>
      ))}
      <li className="text-xs text-ink-faint">{summary.attempts.length} attempt(s) kept in this visit.</li>
    </ul>
  );
}
