"use client";

import { useEffect, useRef, useState } from "react";
import { SafetyNote } from "@/components/safety-note";
import { HandOverlay } from "@/components/tracking/hand-overlay";
import { PositionIllustration } from "@/components/tracking/position-illustration";
import { browserOutbox, runOutbox } from "@/lib/captures/outbox";
import { getReferenceEndRange, isOneFingerMotion, MOTIONS, type Condition, type Digit, type MotionId, type Side } from "@/lib/motions/catalog";
import { newCaptureUid, VISIT_KEEP_LAST_MS } from "@/lib/tracking/capture-recorder";
import { useHandTracking } from "@/lib/tracking/use-hand-tracking";
import { encodeTelemetry, type ControlMessage } from "@/lib/visits/telemetry";
import { useVisitRoom } from "@/lib/visits/use-visit-room";
import { MicCheck } from "./mic-check";
import { fingersTogetherNote, oneFingerNote } from "@/lib/tracking/self-check-plan";
import { ClientNeutralReading } from "./neutral-reading";
import { CONDITION_LABELS } from "./test-picker";
import { TrackAudio, TrackVideo } from "./track-video";

interface Test {
  motion: MotionId;
  side: Side;
  digit: Digit | null;
  condition: Condition;
  oneFinger: boolean;
}

/** Telemetry goes out at most this often: enough for a smooth overlay, well under the data budget. */
const TELEMETRY_INTERVAL_MS = 66;

/**
 * The client's side of a video visit. The browser tracks the hand locally and sends the therapist compact telemetry;
 * it follows the therapist's prompts, and when the therapist keeps an attempt it sends the raw capture through the
 * outbox (kept in this browser until the server confirms, so a dropped connection loses nothing).
 */
export function ClientVisitRoom({ visitId, clientId, therapistName, when, side }: { visitId: string; clientId: string; therapistName: string; when: string; side: Side }) {
  const video = useRef<HTMLVideoElement>(null);
  const [test, setTest] = useState<Test>({ motion: "wrist.extension", side, digit: null, condition: "against_gravity", oneFinger: false });
  const [prompted, setPrompted] = useState(false);
  const [kept, setKept] = useState<string | null>(null);
  // Finger flexion is read by both hand models, as a self-check is: the kept attempt carries both models' frames. The
  // live angle the therapist watches stays the lite model's. The second model loads as the visit starts, so the first
  // finger test already has it.
  // The recording runs from the prompt until the therapist keeps it, however long they talk: only its last minute is
  // kept, so a long wait neither fills the device's memory nor passes the upload limit.
  const tracking = useHandTracking({ ...test, videoRef: video, enabled: true, displayMirrored: true, bothModels: "on", keepLastMs: VISIT_KEEP_LAST_MS });
  const seq = useRef(0);
  const lastSent = useRef(0);
  const peak = useRef<number | null>(null);
  const peakUncertainty = useRef<number | null>(null);
  // The therapist's request for a straight-wrist reading in progress, answered when the reading is taken or refused.
  const neutralAsk = useRef<string | null>(null);
  const [neutralAsked, setNeutralAsked] = useState(false);
  const trackingRef = useRef(tracking);
  useEffect(() => {
    trackingRef.current = tracking;
  });

  useEffect(() => runOutbox(browserOutbox()), []);

  const onControl = async (m: ControlMessage) => {
    if (m.type === "prompt") {
      const digit = m.digit as Digit | null;
      const next: Test = { motion: m.motion as MotionId, side: m.side, digit, condition: m.condition, oneFinger: m.oneFinger === true && isOneFingerMotion(m.motion as MotionId, digit) };
      setTest(next);
      setPrompted(true);
      setKept(null);
      setNeutralAsked(false);
      peak.current = null;
      await room.sendControl({ type: "test", ...next, targetDeg: getReferenceEndRange(next.motion, next.digit)?.endRangeDeg ?? null }).catch(() => undefined);
      // The attempt starts now; the hook starts a fresh reading for the new test on the next frame.
      setTimeout(() => trackingRef.current.startRecording(), 0);
    }
    if (m.type === "neutral-ask") {
      const t = testRef.current;
      const base = { type: "neutral", requestId: m.requestId, motion: t.motion, side: t.side, view: null, spreadDeg: null } as const;
      if (MOTIONS[t.motion].joint !== "wrist") {
        await room.sendControl({ ...base, status: "refused", problem: "the straight-wrist reading is for wrist tests; ask for a wrist test first." }).catch(() => undefined);
        return;
      }
      neutralAsk.current = m.requestId;
      setNeutralAsked(true);
      trackingRef.current.takeNeutral();
      await room.sendControl({ ...base, status: "holding", problem: null }).catch(() => undefined);
    }
    if (m.type === "keep") {
      const result = trackingRef.current.stopRecording();
      if (!result) {
        await room.sendControl({ type: "kept", requestId: m.requestId, captureUid: "", attemptId: null, queued: false }).catch(() => undefined);
        return;
      }
      const captureUid = newCaptureUid();
      const outbox = browserOutbox();
      const label = `${MOTIONS[result.capture.motion as MotionId]?.label ?? result.capture.motion}, ${result.capture.side}`;
      let attemptId: string | null = null;
      const stopWatching = outbox.onSaved((entry, response) => {
        if (entry.captureUid === captureUid) attemptId = response.attempt.id;
      });
      await outbox.enqueue({ captureUid, source: "visit", clientId, visitId, capture: result.capture }, label);
      await outbox.flush({ force: true });
      stopWatching();
      setKept(attemptId ? "Your therapist kept that attempt." : "That attempt is saved on this device and will be sent when the connection is back.");
      await room.sendControl({ type: "kept", requestId: m.requestId, captureUid, attemptId, queued: attemptId === null }).catch(() => undefined);
      peak.current = null;
      trackingRef.current.startRecording();
    }
  };

  const room = useVisitRoom(visitId, { onControl: (m) => void onControl(m) });
  const testRef = useRef(test);
  useEffect(() => {
    testRef.current = test;
  });

  // The reading's outcome goes back to the therapist; once taken, the attempt starts over from it, so the kept
  // attempt's angles (and its capture's neutral frames) all belong to the same forearm line.
  const neutral = tracking.neutral;
  useEffect(() => {
    const requestId = neutralAsk.current;
    if (requestId === null || (neutral.status !== "taken" && neutral.status !== "refused")) return;
    neutralAsk.current = null;
    if (neutral.status === "taken") {
      peak.current = null;
      trackingRef.current.startRecording();
    }
    const t = testRef.current;
    void room
      .sendControl({
        type: "neutral",
        requestId,
        status: neutral.status,
        motion: t.motion,
        side: t.side,
        problem: neutral.status === "refused" ? neutral.problem : null,
        view: neutral.status === "taken" ? neutral.reading.view : null,
        spreadDeg: neutral.status === "taken" ? Math.round(neutral.reading.spreadDeg * 10) / 10 : null,
      })
      .catch(() => undefined);
  }, [neutral, room]);

  // Telemetry: one compact packet per tracked frame, at most every 66 ms.
  useEffect(() => {
    const f = tracking.frame;
    const u = tracking.update;
    if (!f || room.state.phase !== "connected") return;
    const now = performance.now();
    if (now - lastSent.current < TELEMETRY_INTERVAL_MS) return;
    lastSent.current = now;
    const angle = u?.smoothedDeg ?? null;
    // The peak keeps the interval of the frame that set it: a peak's, wider than a frame's where peaks read worse.
    if (angle !== null && (peak.current === null || angle > peak.current)) {
      peak.current = angle;
      peakUncertainty.current = u?.peakUncertaintyDeg ?? null;
    }
    room.sendTelemetry(
      encodeTelemetry({
        seq: seq.current++,
        // Wall-clock send time (ms, modulo 2^32): lets the receiver measure the delay when clocks agree.
        t: Date.now() % 2 ** 32,
        angleDeg: angle,
        peakDeg: peak.current,
        quality: u?.quality ?? (f.hand ? "ok" : "no_hand"),
        plane: u?.plane?.verdict ?? null,
        reps: u?.rep.count ?? 0,
        repPhase: u?.rep.phase ?? "rest",
        score: f.score,
        uncertaintyDeg: u?.uncertaintyDeg ?? null,
        peakUncertaintyDeg: peak.current === null ? null : peakUncertainty.current,
        image: f.image ? f.image.map((p) => [p[0], p[1]] as [number, number]) : null,
        forearmSource: u?.forearmSource ?? null,
      }),
    );
  }, [tracking.frame, tracking.update, room]);

  const join = () => {
    const stream = video.current?.srcObject as MediaStream | null;
    void room.join({ videoTrack: stream?.getVideoTracks()[0] });
  };

  const def = MOTIONS[test.motion];
  const fixes = tracking.checks.filter((c) => c.status === "fix");
  const connected = room.state.phase === "connected" || room.state.phase === "reconnecting";

  return (
    <div className="mx-auto max-w-3xl space-y-4">
      <header>
        <h1 className="text-2xl font-semibold">Video visit with {therapistName}</h1>
        <p className="text-sm text-ink-soft">{when}</p>
      </header>
      <div
        className="relative overflow-hidden rounded-card bg-ink"
        data-testid="client-camera"
        data-thread={tracking.thread ?? ""}
        data-paired={tracking.paired ? "yes" : "no"}
        data-pairing-stopped={tracking.pairingStopped ? "yes" : "no"}
      >
        <video ref={video} aria-label="Your camera" autoPlay playsInline muted className="aspect-[4/3] w-full -scale-x-100 object-cover" />
        <HandOverlay
          image={tracking.frame?.image ?? null}
          videoWidth={tracking.videoWidth}
          videoHeight={tracking.videoHeight}
          fit="cover"
          mirrored
          motion={test.motion}
          digit={test.digit}
          angleDeg={tracking.update?.smoothedDeg ?? null}
          targetDeg={getReferenceEndRange(test.motion, test.digit)?.endRangeDeg ?? null}
          faded={tracking.update?.quality !== "ok"}
        />
        {room.state.remoteVideo ? (
          <TrackVideo track={room.state.remoteVideo} label={`${therapistName}'s camera`} className="absolute right-3 top-3 w-28 rounded-lg border-2 border-white md:w-40" />
        ) : null}
        <TrackAudio track={room.state.remoteAudio} />
        {room.state.phase === "reconnecting" ? <p className="absolute inset-x-0 top-0 bg-flag-amber p-2 text-center text-sm text-white">Reconnecting… keep going; nothing is lost.</p> : null}
      </div>
      {tracking.error ? (
        <p role="alert" className="rounded-lg bg-flag-roseBg p-3 text-sm text-flag-rose">
          {tracking.error}
        </p>
      ) : null}
      {!connected ? (
        <div className="space-y-3">
          {room.state.error ? (
            <p role="alert" className="text-sm text-flag-rose">
              {room.state.error}
            </p>
          ) : null}
          <p className="text-sm text-ink-soft">
            {tracking.status === "running" ? "✓ Your camera is on. Check that your hand and forearm fit in the picture." : "Starting your camera…"}
          </p>
          <MicCheck active={room.state.phase === "idle" || room.state.phase === "failed"} />
          <button
            type="button"
            onClick={join}
            disabled={tracking.status !== "running" || room.state.phase === "connecting"}
            className="w-full rounded-lg bg-tide-600 px-4 py-3 text-base font-semibold text-white disabled:bg-tide-200"
          >
            {room.state.phase === "connecting" ? "Joining…" : "Join the visit"}
          </button>
        </div>
      ) : (
        <section aria-label="What to do now" className="rounded-card border border-sand-200 bg-white p-4">
          {prompted ? (
            <>
              <p className="text-lg font-semibold" data-testid="client-test">
                {def.label}
                {test.digit ? `, ${test.digit} finger` : ""}
                {test.oneFinger ? " on its own" : ""} ({test.side}) · {CONDITION_LABELS[test.condition]}
              </p>
              <div className="mt-2 grid gap-3 md:grid-cols-[1fr_14rem]">
                <p className="text-base">
                  {def.testPosition[test.condition]} {(test.oneFinger ? oneFingerNote(test.digit) : fingersTogetherNote(test.motion, test.digit)) ?? ""}
                </p>
                <PositionIllustration cameraView={def.cameraView} condition={test.condition} wrist={def.joint === "wrist"} />
              </div>
              <p className="mt-2 text-4xl font-semibold tabular-nums" aria-live="polite">
                {tracking.update?.smoothedDeg == null ? "—" : `${Math.round(tracking.update.smoothedDeg)}°`}
              </p>
              {neutralAsked && def.joint === "wrist" ? <ClientNeutralReading neutral={tracking.neutral} /> : null}
              {fixes.length ? (
                <ul className="mt-2 space-y-1 text-sm text-flag-amber">
                  {fixes.map((c) => (
                    <li key={c.id}>{c.instruction}</li>
                  ))}
                </ul>
              ) : null}
            </>
          ) : (
            <p className="text-base" data-testid="client-test">
              You are connected. {therapistName} will tell you which movement to make.
            </p>
          )}
          {kept ? (
            <p role="status" className="mt-2 text-sm text-tide-700">
              {kept}
            </p>
          ) : null}
          <button type="button" onClick={() => void room.leave()} className="mt-4 rounded-lg px-3 py-2 text-sm ring-1 ring-sand-200">
            Leave the visit
          </button>
        </section>
      )}
      <SafetyNote compact />
    </div>
  );
}
