"use client";

import { NEUTRAL_HOLD_MS, type NeutralState } from "@/lib/tracking/use-hand-tracking";
import type { NeutralStatus } from "@/lib/visits/telemetry";
import type { ForearmSource } from "@/vision/wrist-axis";
import { describeView } from "@/vision/view-policy";
import { UNCERTAINTY_TABLE, VALIDATION_VIEWS, type ValidationView } from "@/vision/uncertainty";

/** Held-out clips read without a straight-wrist reading: their stated uncertainty (vision/uncertainty-table.json). */
const WITHOUT_READING_DEG = UNCERTAINTY_TABLE.withoutStraightWristReading?.uncertaintyDeg ?? null;

/** The straight-wrist instruction, worded as the guided self-check words it (components/tracking/self-check-flow.tsx). */
export const NEUTRAL_INSTRUCTION =
  "Rest your forearm on the table with your wrist straight, in line with the forearm, and your fingers relaxed. Keep your arm and the camera where they are from now on: the camera measures the wrist against this position.";

/** Which forearm line a wrist angle is read against, in the therapist's words. */
export const FOREARM_LINE_WORDS: Record<ForearmSource, string> = {
  pose: "the forearm seen by the camera",
  "neutral-reading": "the client's straight-wrist reading",
  "capture-start": "how the hand started (no straight-wrist reading)",
};

/** The client's card while the therapist's straight-wrist reading is asked for: the instruction, the hold, the outcome. */
export function ClientNeutralReading({ neutral }: { neutral: NeutralState }) {
  return (
    <div className="mt-3 rounded-lg bg-tide-50 p-3" aria-label="Straight-wrist reading" role="group">
      <p className="text-sm font-semibold text-tide-900">Straight-wrist reading</p>
      <p className="mt-1 text-sm text-ink">{NEUTRAL_INSTRUCTION}</p>
      <p className="mt-2 text-sm" aria-live="polite" data-testid="neutral-status" data-status={neutral.status}>
        {neutral.status === "holding" ? (
          <span className="font-medium text-tide-900">Hold still… {Math.max(1, Math.ceil(((1 - neutral.progress) * NEUTRAL_HOLD_MS) / 1000))}</span>
        ) : neutral.status === "taken" ? (
          <span className="text-tide-700">Reading taken ({describeView(neutral.reading.view)} seen). Keep your forearm on the table.</span>
        ) : neutral.status === "refused" ? (
          <span className="text-flag-rose">The reading could not be taken: {neutral.problem}</span>
        ) : (
          <span className="text-ink-soft">Takes {NEUTRAL_HOLD_MS / 1000} seconds.</span>
        )}
      </p>
    </div>
  );
}

export interface ConsoleNeutral {
  status: NeutralStatus | "asked";
  motion: string;
  side: "left" | "right";
  problem: string | null;
  view: string | null;
  spreadDeg: number | null;
}

/** The therapist's view of the straight-wrist reading: asked, holding, taken (with view and stillness) or refused and why. */
export function ConsoleNeutralStatus({ neutral }: { neutral: ConsoleNeutral | null }) {
  // The view arrives as a string from the other browser: named only when it is one the engine knows.
  const view = neutral?.view && (VALIDATION_VIEWS as readonly string[]).includes(neutral.view) ? describeView(neutral.view as ValidationView) : null;
  const details = [view ? `${view} seen` : null, neutral?.spreadDeg == null ? null : `held within ${neutral.spreadDeg.toFixed(1)}°`].filter(Boolean).join(", ");
  if (!neutral)
    return (
      <p className="mt-2 text-xs text-ink-soft" data-testid="console-neutral" data-status="none">
        No straight-wrist reading yet: wrist angles are read from how the hand started
        {WITHOUT_READING_DEG === null ? "" : `, to within about ± ${WITHOUT_READING_DEG.toFixed(0)}° only`}. Ask for the reading before the attempt.
      </p>
    );
  return (
    <p className={`mt-2 text-xs ${neutral.status === "refused" ? "text-flag-rose" : "text-ink-soft"}`} role="status" data-testid="console-neutral" data-status={neutral.status}>
      {neutral.status === "asked" ? "Asking the client's device for the straight-wrist reading…" : null}
      {neutral.status === "holding" ? "The client is holding the wrist straight and still…" : null}
      {neutral.status === "taken"
        ? `Straight-wrist reading taken${details ? ` (${details})` : ""}. Wrist angles are read against it.`
        : null}
      {neutral.status === "refused" ? `The reading could not be taken: ${neutral.problem ?? "no reason given"} Ask again when the client is ready.` : null}
    </p>
  );
}
