"use client";

import { useEffect, useMemo, useRef, useState } from "react";
import { Badge, Card } from "@/components/ui/card";
import { Button } from "@/components/ui/button";
import { SelectField } from "@/components/ui/field";
import { SafetyNote } from "@/components/safety-note";
import { browserOutbox, fetchSender } from "@/lib/captures/outbox";
import type { CaptureSaveResponse, StoredAttempt } from "@/lib/captures/upload";
import { CONDITIONS, MOTIONS, getReferenceEndRange, type CameraView, type Condition, type Digit, type MotionId, type RangeTableId, type Side } from "@/lib/motions/catalog";
import { newCaptureUid } from "@/lib/tracking/capture-recorder";
import { readyToStart } from "@/lib/tracking/setup-checks";
import { fingersTogetherNote } from "@/lib/tracking/self-check-plan";
import { NEUTRAL_HOLD_MS, useHandTracking } from "@/lib/tracking/use-hand-tracking";
import { NEUTRAL_INSTRUCTION } from "@/components/visit-room/neutral-reading";
import type { CaptureAnalysis } from "@/vision/analyze-capture";
import { analyzeCaptureFile, type PairAnalysis } from "@/vision/model-pair";
import { readsWithBothModels } from "@/vision/model-pair-scope";
import { describeView, viewPolicy } from "@/vision/view-policy";
import { HandOverlay } from "./hand-overlay";
import { PositionIllustration } from "./position-illustration";

export interface SelfCheckFlowProps {
  clientId: string;
  sides: Side[];
  offered: MotionId[];
  withheld: { motion: MotionId; reason: string }[];
  rangeTable: RangeTableId;
  /** The client's own precaution note from the clinic, shown with the safety note. */
  precautionNote: string;
  /**
   * Practising a home program item: the motion is fixed, attempts are saved with `source: "practice"`, and every
   * attempt of this sitting carries the same session id (chosen when the page was served).
   */
  practice?: { itemId: string; sessionId: string; motion: MotionId; digit: Digit | null; side: Side; condition: Condition; repetitions: number; notes: string };
}

type Step = "safety" | "choose" | "position" | "setup" | "neutral" | "countdown" | "recording" | "summary";

const REPETITIONS = 3;
const HOLD_SECONDS = 2;
const COUNTDOWN_SECONDS = 3;
// An attempt ends by itself after this long even if fewer repetitions were seen, so a lost hand cannot record forever.
const MAX_RECORDING_MS = 60_000;

const CONDITION_WORDS: Record<Condition, { title: string; hint: string }> = {
  against_gravity: { title: "Lifting up (against gravity)", hint: "The hand or finger moves upward." },
  gravity_minimized: { title: "Sliding on the table (gravity minimized)", hint: "The hand or finger moves flat along a smooth surface." },
};

const CAMERA_WORDS: Record<CameraView, string> = {
  side: "A phone propped on its side against a mug works well.",
  overhead: "For example a phone leaning over the edge of a shelf or a stack of books.",
  front: "About an arm's length away.",
};

const FOREARM_WORDS: Record<NonNullable<CaptureAnalysis["forearmSource"]>, string> = {
  pose: "your forearm, seen by the camera",
  "neutral-reading": "your straight-wrist reading",
  "capture-start": "how your hand started (no straight-wrist reading)",
};

const DIGIT_WORDS: Record<Digit, string> = { thumb: "Thumb", index: "Index finger", middle: "Middle finger", ring: "Ring finger", little: "Little finger" };

const PHASE_WORDS = { rest: "Ready: start moving", move: "Moving…", hold: `Hold it there (${HOLD_SECONDS} seconds)`, return: "Now relax back" } as const;

function motionLabel(motion: MotionId, digit: Digit | null, side: Side) {
  return `${MOTIONS[motion].label}, ${side}${digit ? ` ${DIGIT_WORDS[digit].toLowerCase()}` : ""}`;
}

export function SelfCheckFlow(props: SelfCheckFlowProps) {
  const [step, setStep] = useState<Step>("safety");
  const [motion, setMotion] = useState<MotionId>(props.practice?.motion ?? props.offered[0]);
  const [digit, setDigit] = useState<Digit | null>(props.practice ? props.practice.digit : (MOTIONS[props.offered[0]].digits[0] ?? null));
  const [side, setSide] = useState<Side>(props.practice?.side ?? props.sides[0]);
  const [condition, setCondition] = useState<Condition>(props.practice?.condition ?? "against_gravity");
  const [facing, setFacing] = useState<"user" | "environment">("user");
  const [countdown, setCountdown] = useState(COUNTDOWN_SECONDS);
  const [result, setResult] = useState<{ captureUid: string; local: CaptureAnalysis | PairAnalysis } | null>(null);
  const [saved, setSaved] = useState<StoredAttempt | null>(null);
  const [queueProblem, setQueueProblem] = useState<string | null>(null);
  const recordingStartedAt = useRef(0);
  const videoRef = useRef<HTMLVideoElement>(null);

  const def = MOTIONS[motion];
  // Where the camera goes comes from the view policy, which follows the test position (vision/view-policy.ts).
  const policy = useMemo(() => viewPolicy(motion, condition, digit), [motion, condition, digit]);
  const isWrist = def.joint === "wrist";
  const reference = useMemo(() => getReferenceEndRange(motion, digit, props.rangeTable), [motion, digit, props.rangeTable]);
  const cameraOn = step === "setup" || step === "neutral" || step === "countdown" || step === "recording";
  const mirrored = facing === "user";
  // Finger flexion is read by both hand models while recording, as an uploaded clip is (vision/model-pair.ts): the
  // second model loads during the set-up and reads from the countdown on, so every recorded frame has both readings.
  // Other motions never load it.
  const bothModels = !readsWithBothModels(motion, digit) ? "off" : step === "countdown" || step === "recording" ? "on" : cameraOn ? "ready" : "off";
  const tracking = useHandTracking({ motion, side, digit, condition, videoRef, enabled: cameraOn, facing, displayMirrored: mirrored, bothModels });
  const { startRecording } = tracking;

  // Server confirmations of the latest attempt (now or later, after a dropped connection). The id is set before the
  // attempt is queued, so a confirmation that comes back at once is not missed.
  const latestUid = useRef<string | null>(null);
  useEffect(
    () =>
      browserOutbox().onSaved((entry, response: CaptureSaveResponse) => {
        if (entry.captureUid === latestUid.current) setSaved(response.attempt);
      }),
    [],
  );

  useEffect(() => {
    if (step !== "countdown") return;
    const timer = setTimeout(() => {
      if (countdown > 1) return setCountdown(countdown - 1);
      recordingStartedAt.current = performance.now();
      startRecording();
      setStep("recording");
    }, 1000);
    return () => clearTimeout(timer);
  }, [step, countdown, startRecording]);

  const finish = async () => {
    const recorded = tracking.stopRecording();
    setStep("summary");
    if (!recorded) return;
    const captureUid = newCaptureUid();
    latestUid.current = captureUid;
    // The same reading the server will make of the same file: both models together when it carries both.
    setResult({ captureUid, local: analyzeCaptureFile(recorded.capture) });
    setSaved(null);
    setQueueProblem(null);
    const practiceIds = props.practice ? { practiceItemId: props.practice.itemId, practiceSessionId: props.practice.sessionId } : {};
    const body = { captureUid, source: props.practice ? "practice" : "self_check", clientId: props.clientId, ...practiceIds, recordedAt: Date.now(), capture: recorded.capture };
    try {
      await browserOutbox().enqueue(body, motionLabel(motion, digit, side));
    } catch (error) {
      // No IndexedDB (some private windows): send it straight away instead, once, and say so if that fails too.
      const outcome = await fetchSender()({ captureUid, body, label: "", queuedAt: 0, tries: 0, nextTryAt: 0, state: "pending", lastError: null });
      if (outcome.kind === "saved") setSaved(outcome.response.attempt);
      else
        setQueueProblem(
          `This device could not keep the attempt (${error instanceof Error ? error.message : String(error)}) and sending it failed (${outcome.error}). Try again in a normal (not private) browser window.`,
        );
    }
  };

  // Ends the attempt after the last repetition has come back to rest, or at the time limit.
  const reps = tracking.update?.rep.count ?? 0;
  const phase = tracking.update?.rep.phase ?? "rest";
  useEffect(() => {
    if (step !== "recording") return;
    const done = reps >= REPETITIONS && phase === "rest";
    const timedOut = performance.now() - recordingStartedAt.current > MAX_RECORDING_MS;
    if (done || timedOut) void finish();
    // finish reads the latest state; re-running on every frame is what checks the time limit.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [step, reps, phase, tracking.frame]);

  const chooseMotion = (next: MotionId) => {
    setMotion(next);
    const digits = MOTIONS[next].digits;
    setDigit(digits.length ? (digit && digits.includes(digit) ? digit : digits[0]) : null);
  };

  const angle = tracking.update?.smoothedDeg ?? null;
  const ready = tracking.status === "running" && readyToStart(tracking.checks);

  return (
    <div className="mx-auto max-w-3xl space-y-5" data-testid="self-check" data-step={step}>
      {step === "safety" ? (
        <Card title="Before you start">
          <SafetyNote />
          {props.precautionNote ? (
            <p className="mt-3 rounded-lg bg-flag-amberBg p-3 text-sm text-ink">
              <span className="font-semibold">From your clinic: </span>
              {props.precautionNote}
            </p>
          ) : null}
          <ul className="mt-3 list-disc space-y-1 pl-5 text-sm text-ink-soft">
            <li>Move only as far as is comfortable. Never push with your other hand or press against anything.</li>
            <li>Stop at once if pain, swelling, numbness or tingling starts or gets worse, and tell your therapist.</li>
            <li>If your surgeon or therapist has told you not to move a joint yet, do not check it here.</li>
          </ul>
          {props.practice ? (
            <p className="mt-3 text-sm text-ink" data-testid="practice-item">
              Practising: <span className="font-medium">{motionLabel(motion, digit, side)}</span>, {props.practice.repetitions} times.
              {props.practice.notes ? <span className="block text-ink-soft">{props.practice.notes}</span> : null}
            </p>
          ) : null}
          <Button className="mt-4 w-full sm:w-auto" onClick={() => setStep(props.practice ? "position" : "choose")}>
            I understand, continue
          </Button>
        </Card>
      ) : null}

      {step === "choose" ? (
        <Card title="What to check">
          <div className="grid gap-4 sm:grid-cols-2">
            <SelectField
              label="Movement"
              name="motion"
              id="self-check-motion"
              value={motion}
              onChange={(e) => chooseMotion(e.target.value as MotionId)}
              options={props.offered.map((m) => ({ value: m, label: MOTIONS[m].label }))}
            />
            {def.digits.length ? (
              <SelectField
                label="Finger"
                name="digit"
                id="self-check-digit"
                value={digit ?? ""}
                onChange={(e) => setDigit(e.target.value as Digit)}
                options={def.digits.map((d) => ({ value: d, label: DIGIT_WORDS[d] }))}
              />
            ) : null}
            {props.sides.length > 1 ? (
              <SelectField
                label="Hand"
                name="side"
                id="self-check-side"
                value={side}
                onChange={(e) => setSide(e.target.value as Side)}
                options={props.sides.map((s) => ({ value: s, label: s === "left" ? "Left hand" : "Right hand" }))}
              />
            ) : (
              <p className="text-sm text-ink-soft">
                Hand: <span className="font-medium text-ink">{side === "left" ? "left" : "right"}</span>
              </p>
            )}
          </div>
          <fieldset className="mt-4">
            <legend className="text-sm font-medium text-ink">Position</legend>
            <div className="mt-2 grid gap-2 sm:grid-cols-2">
              {CONDITIONS.map((c) => (
                <label key={c} className={`flex cursor-pointer gap-3 rounded-lg border p-3 text-sm ${condition === c ? "border-tide-500 bg-tide-50" : "border-sand-200"}`}>
                  <input type="radio" name="condition" value={c} checked={condition === c} onChange={() => setCondition(c)} />
                  <span>
                    <span className="block font-medium text-ink">{CONDITION_WORDS[c].title}</span>
                    <span className="block text-ink-soft">{CONDITION_WORDS[c].hint}</span>
                  </span>
                </label>
              ))}
            </div>
          </fieldset>
          {props.withheld.length ? (
            <details className="mt-4 text-sm text-ink-soft">
              <summary className="cursor-pointer">Not offered here ({props.withheld.length})</summary>
              <ul className="mt-2 space-y-1">
                {props.withheld.map((w) => (
                  <li key={w.motion}>
                    <span className="font-medium text-ink">{MOTIONS[w.motion].label}:</span> {w.reason}
                  </li>
                ))}
              </ul>
            </details>
          ) : null}
          <Button className="mt-4 w-full sm:w-auto" onClick={() => setStep("position")}>
            Next: how to sit
          </Button>
        </Card>
      ) : null}

      {step === "position" ? (
        <Card title={`Getting into position: ${motionLabel(motion, digit, side)}`}>
          <div className="grid gap-4 sm:grid-cols-[1fr_16rem]">
            <ol className="list-decimal space-y-2 pl-5 text-sm text-ink">
              <li>Sit at a table with your {side} forearm resting on it, shoulder relaxed.</li>
              <li>{def.testPosition[condition]}</li>
              {fingersTogetherNote(motion, digit) ? <li>{fingersTogetherNote(motion, digit)}</li> : null}
              <li>
                {policy.instruction} {CAMERA_WORDS[policy.placement]}
              </li>
              <li>
                Then you will {def.gradedOn === "arc" ? "make the movement" : "move as far as is comfortable"}, hold for {HOLD_SECONDS} seconds, and relax: {REPETITIONS} times.
              </li>
            </ol>
            <PositionIllustration cameraView={policy.placement} condition={condition} wrist={isWrist} />
          </div>
          <label className="mt-4 flex items-center gap-2 text-sm text-ink-soft">
            <input type="checkbox" checked={facing === "environment"} onChange={(e) => setFacing(e.target.checked ? "environment" : "user")} />
            Use the back camera (phones)
          </label>
          <div className="mt-4 flex flex-wrap gap-2">
            <Button
              onClick={() => {
                void tracking.requestMotionSensors();
                setStep("setup");
              }}
            >
              Turn on the camera
            </Button>
            <Button variant="quiet" onClick={() => setStep(props.practice ? "safety" : "choose")}>
              Back
            </Button>
          </div>
        </Card>
      ) : null}

      {cameraOn ? (
        <section className="space-y-3">
          <div className="relative mx-auto aspect-[3/4] w-full max-w-xl overflow-hidden rounded-card bg-ink sm:aspect-[4/3]" data-testid="camera-view" data-thread={tracking.thread ?? ""}>
            <video ref={videoRef} className={`absolute inset-0 h-full w-full object-contain ${mirrored ? "-scale-x-100" : ""}`} playsInline muted />
            <HandOverlay
              image={tracking.frame?.image ?? null}
              videoWidth={tracking.videoWidth}
              videoHeight={tracking.videoHeight}
              fit="contain"
              mirrored={mirrored}
              motion={motion}
              digit={digit}
              angleDeg={angle}
              targetDeg={reference?.endRangeDeg ?? null}
              faded={tracking.update?.quality !== "ok"}
            />
            {step === "countdown" ? (
              <div className="absolute inset-0 flex items-center justify-center bg-ink/40 text-7xl font-bold text-white" aria-live="assertive" data-testid="countdown">
                {countdown}
              </div>
            ) : null}
            <div className="absolute left-2 top-2 rounded-lg bg-white/90 px-3 py-1 text-sm">
              <span className="text-ink-soft">Angle </span>
              <span className="text-xl font-semibold tabular-nums text-tide-900" data-testid="live-angle">
                {angle === null ? "–" : `${Math.round(angle)}°`}
              </span>
              {reference ? <span className="text-ink-faint"> / {reference.endRangeDeg}° typical</span> : null}
            </div>
            <div className="absolute bottom-2 right-2 rounded bg-white/80 px-2 text-xs text-ink-soft">{tracking.fps} fps</div>
          </div>

          {tracking.status === "failed" ? (
            <p role="alert" className="rounded-lg bg-flag-roseBg p-3 text-sm text-flag-rose">
              {tracking.error}
            </p>
          ) : null}

          {step === "setup" ? (
            <Card title="Set-up checks">
              {tracking.status !== "running" ? <p className="text-sm text-ink-soft">Starting the camera and hand tracking…</p> : null}
              <ul className="space-y-2" data-testid="setup-checks">
                {tracking.checks.map((c) => (
                  <li key={c.id} className="flex gap-3 text-sm" data-check={c.id} data-status={c.status}>
                    <Badge tone={c.status === "ok" ? "good" : c.status === "fix" ? "alert" : "caution"}>{c.status === "ok" ? "OK" : c.status === "fix" ? "Change" : "Tip"}</Badge>
                    <span>
                      <span className="font-medium text-ink">{c.label}</span>
                      {c.instruction ? <span className="block text-ink-soft">{c.instruction}</span> : null}
                    </span>
                  </li>
                ))}
              </ul>
              <div className="mt-4 flex flex-wrap gap-2">
                <Button
                  disabled={!ready}
                  onClick={() => {
                    // Wrist angles need a forearm line: a straight-wrist reading first, unless one is already taken.
                    if (isWrist && tracking.neutral.status !== "taken") return setStep("neutral");
                    setCountdown(COUNTDOWN_SECONDS);
                    setStep("countdown");
                  }}
                >
                  {isWrist && tracking.neutral.status !== "taken" ? "Next: straight-wrist reading" : "Start"}
                </Button>
                <Button variant="quiet" onClick={() => setStep("position")}>
                  Back
                </Button>
              </div>
            </Card>
          ) : null}

          {step === "neutral" ? (
            <Card title="Straight-wrist reading">
              <p className="text-sm text-ink">{NEUTRAL_INSTRUCTION}</p>
              <p className="mt-2 text-sm" aria-live="polite" data-testid="neutral-status" data-status={tracking.neutral.status}>
                {tracking.neutral.status === "holding" ? (
                  <span className="font-medium text-tide-900">Hold still… {Math.max(1, Math.ceil(((1 - tracking.neutral.progress) * NEUTRAL_HOLD_MS) / 1000))}</span>
                ) : tracking.neutral.status === "taken" ? (
                  <span className="text-tide-700">Reading taken ({describeView(tracking.neutral.reading.view)} seen). Keep your forearm on the table.</span>
                ) : tracking.neutral.status === "refused" ? (
                  <span className="text-flag-rose">The reading could not be taken: {tracking.neutral.problem}</span>
                ) : (
                  <span className="text-ink-soft">Takes {NEUTRAL_HOLD_MS / 1000} seconds.</span>
                )}
              </p>
              <div className="mt-4 flex flex-wrap gap-2">
                {tracking.neutral.status === "taken" ? (
                  <Button
                    onClick={() => {
                      setCountdown(COUNTDOWN_SECONDS);
                      setStep("countdown");
                    }}
                  >
                    Start
                  </Button>
                ) : (
                  <Button disabled={tracking.status !== "running" || tracking.neutral.status === "holding"} onClick={() => tracking.takeNeutral()}>
                    {tracking.neutral.status === "refused" ? "Try the reading again" : "Take the reading"}
                  </Button>
                )}
                <Button variant="quiet" onClick={() => setStep("setup")}>
                  Back
                </Button>
              </div>
            </Card>
          ) : null}

          {step === "recording" ? (
            <Card title={motionLabel(motion, digit, side)}>
              <p className="text-lg font-semibold text-tide-900" aria-live="polite" data-testid="rep-phase">
                {PHASE_WORDS[phase]}
              </p>
              <p className="mt-1 text-sm text-ink-soft">
                Repetition <span data-testid="rep-count">{Math.min(reps + 1, REPETITIONS)}</span> of {REPETITIONS}. Move only as far as is comfortable;
                stop if it hurts.
              </p>
              {tracking.paired ? (
                <p className="mt-1 text-xs text-ink-faint" data-testid="recording-models">
                  Two tracking models read each frame, so the picture updates a little less often.
                </p>
              ) : null}
              <Button className="mt-3" variant="quiet" onClick={() => void finish()}>
                Finish now
              </Button>
            </Card>
          ) : null}
        </section>
      ) : null}

      {step === "summary" ? (
        <Card title="What was measured">
          {result ? <Summary local={result.local} saved={saved} reference={reference} /> : <p className="text-sm text-ink-soft">Nothing was recorded: the camera saw no frames.</p>}
          {result ? (
            <p className="mt-3 text-sm" data-testid="save-status" data-saved={saved ? "yes" : "no"}>
              {queueProblem ? (
                <span className="text-flag-rose">{queueProblem}</span>
              ) : saved ? (
                <span className="text-tide-700">Saved to your record. Your therapist will see it.</span>
              ) : (
                <span className="text-ink-soft">Sending… If the connection is down, the attempt is kept on this device and sent automatically when you are back online.</span>
              )}
            </p>
          ) : null}
          <div className="mt-4 flex flex-wrap gap-2">
            {props.practice ? null : (
              <Button
                onClick={() => {
                  setResult(null);
                  setStep("choose");
                }}
              >
                Check another movement
              </Button>
            )}
            <Button
              variant="quiet"
              onClick={() => {
                setResult(null);
                setStep("setup");
              }}
            >
              Try this one again
            </Button>
          </div>
          <div className="mt-4">
            <SafetyNote compact />
          </div>
        </Card>
      ) : null}
    </div>
  );
}

function Summary({ local, saved, reference }: { local: CaptureAnalysis | PairAnalysis; saved: StoredAttempt | null; reference: { endRangeDeg: number; source: string } | null }) {
  // The server's numbers, once it has them, are the ones kept; until then the same engine's reading in the browser.
  const shown = saved ?? { reps: local.reps, peakDeg: local.peakDeg, arcDeg: local.arcDeg, planeVerified: local.planeAgrees, warnings: local.warnings, usableFrames: local.usableFrames, frames: local.frames };
  const measure = MOTIONS[local.motion].gradedOn === "arc" ? shown.arcDeg : shown.peakDeg;
  return (
    <dl className="grid grid-cols-2 gap-x-4 gap-y-2 text-sm" data-testid="summary">
      <dt className="text-ink-soft">Repetitions seen</dt>
      <dd className="font-medium" data-testid="summary-reps">
        {shown.reps}
      </dd>
      <dt className="text-ink-soft">{MOTIONS[local.motion].gradedOn === "arc" ? "Largest movement" : "Furthest angle"}</dt>
      <dd className="font-medium" data-testid="summary-peak">
        {measure === null ? "not measured" : `${Math.round(measure)}°`}
        {reference ? <span className="text-ink-faint"> (typical {reference.endRangeDeg}°)</span> : null}
      </dd>
      <dt className="text-ink-soft">Position check</dt>
      <dd className="font-medium" data-testid="summary-plane">
        {shown.planeVerified ? "The camera confirmed the position." : "The camera could not confirm the position; your therapist will review it."}
      </dd>
      <dt className="text-ink-soft">Camera view</dt>
      <dd className="font-medium" data-testid="summary-view" data-quality={local.viewQuality ?? ""}>
        {local.view ? `It saw ${describeView(local.view)}` : "It changed during the attempt"}
        {local.viewQuality === "recommended" ? ", as it should." : local.viewQuality === "usable" ? ": usable, but the recommended side reads more truly." : ": this view measures poorly; your therapist will review it."}
      </dd>
      {local.forearmSource ? (
        <>
          <dt className="text-ink-soft">Wrist measured against</dt>
          <dd className="font-medium" data-testid="summary-forearm" data-source={local.forearmSource}>
            {FOREARM_WORDS[local.forearmSource]}
          </dd>
        </>
      ) : null}
      <dt className="text-ink-soft">Hand tracked</dt>
      <dd className="font-medium">
        {shown.usableFrames} of {shown.frames} frames
      </dd>
      <dt className="text-ink-soft">Tracking models</dt>
      <dd className="font-medium" data-testid="summary-models" data-models={"byModel" in local ? 2 : 1}>
        {"byModel" in local ? "Two models read each frame; the angles are their combined reading." : "One model read the frames."}
      </dd>
      {shown.warnings.length ? (
        <>
          <dt className="text-ink-soft">Notes</dt>
          <dd className="text-ink-soft">{shown.warnings.join("; ")}</dd>
        </>
      ) : null}
      <dt className="col-span-2 mt-2 text-xs text-ink-faint">
        Camera angles are estimates and can differ from a therapist&apos;s measurement by several degrees, most for the finger joints. Your therapist reads them
        alongside what they see.
      </dt>
    </dl>
  );
}
