"use client";

import { useState } from "react";
import { oneFingerFigures } from "@/lib/accuracy/spec";
import { CONDITIONS, isOneFingerMotion, MOTION_IDS, MOTIONS, type Condition, type Digit, type MotionId, type Side } from "@/lib/motions/catalog";

export interface TestChoice {
  motion: MotionId;
  side: Side;
  digit: Digit | null;
  condition: Condition;
  /** The tested finger bends on its own, the others held straight (only for a finger's MCP, PIP or DIP motion). */
  oneFinger?: boolean;
}

/**
 * Past this half-width a lone finger's reading cannot tell half of a finger joint's range from all of it (about 90
 * degrees for MCP and PIP, AAOS normal values from memory); our threshold, not a published one.
 */
const ONE_FINGER_TOO_WIDE_DEG = 45;

export const CONDITION_LABELS: Record<Condition, string> = { against_gravity: "Against gravity", gravity_minimized: "Gravity minimized" };

/** The therapist's choice of the next test: motion, side, digit (for finger motions) and condition. */
export function TestPicker({ initial, onPrompt, disabled }: { initial: TestChoice; onPrompt: (choice: TestChoice) => void; disabled?: boolean }) {
  const [choice, setChoice] = useState<TestChoice>(initial);
  const def = MOTIONS[choice.motion];
  const lone = oneFingerFigures(choice.motion, choice.condition, choice.digit);
  const set = (patch: Partial<TestChoice>) =>
    setChoice((c) => {
      const next = { ...c, ...patch };
      const digits = MOTIONS[next.motion].digits;
      if (!digits.length) next.digit = null;
      else if (!next.digit || !digits.includes(next.digit)) next.digit = digits[0];
      if (!isOneFingerMotion(next.motion, next.digit)) next.oneFinger = false;
      return next;
    });
  const select = "mt-1 block w-full rounded-lg border border-sand-200 bg-white px-2 py-2 text-sm";
  return (
    <form
      className="grid grid-cols-2 gap-3"
      aria-label="Next test"
      onSubmit={(e) => {
        e.preventDefault();
        onPrompt(choice);
      }}
    >
      <label className="col-span-2 text-sm font-medium">
        Motion
        <select className={select} value={choice.motion} onChange={(e) => set({ motion: e.target.value as MotionId })}>
          {MOTION_IDS.map((id) => (
            <option key={id} value={id}>
              {MOTIONS[id].label}
            </option>
          ))}
        </select>
      </label>
      <label className="text-sm font-medium">
        Side
        <select className={select} value={choice.side} onChange={(e) => set({ side: e.target.value as Side })}>
          <option value="left">Left</option>
          <option value="right">Right</option>
        </select>
      </label>
      <label className="text-sm font-medium">
        Digit
        <select className={select} value={choice.digit ?? ""} disabled={!def.digits.length} onChange={(e) => set({ digit: e.target.value as Digit })}>
          {def.digits.length ? (
            def.digits.map((d) => (
              <option key={d} value={d}>
                {d}
              </option>
            ))
          ) : (
            <option value="">—</option>
          )}
        </select>
      </label>
      <label className="col-span-2 text-sm font-medium">
        Condition
        <select className={select} value={choice.condition} onChange={(e) => set({ condition: e.target.value as Condition })}>
          {CONDITIONS.map((c) => (
            <option key={c} value={c}>
              {CONDITION_LABELS[c]}
            </option>
          ))}
        </select>
      </label>
      {isOneFingerMotion(choice.motion, choice.digit) ? (
        <label className="col-span-2 flex items-start gap-2 text-sm">
          <input type="checkbox" className="mt-1" checked={choice.oneFinger === true} onChange={(e) => set({ oneFinger: e.target.checked })} />
          <span>
            <span className="font-medium">Other fingers held straight</span>
            <span className="block text-xs text-ink-soft" data-testid="one-finger-hint">
              The camera reads a finger bent on its own less truly than four fingers bent together; such readings carry a wider ± and a note.
              {lone ? ` Here the ${choice.digit} finger alone reads within ± ${lone.aloneDeg}° (± ${lone.togetherDeg}° bending with the others).` : ""}
              {lone && lone.aloneDeg > ONE_FINGER_TOO_WIDE_DEG ? " That is too wide to decide a range-based grade: ask for all four fingers together, or measure it in person." : ""}
            </span>
          </span>
        </label>
      ) : null}
      <p className="col-span-2 text-xs text-ink-soft">{def.testPosition[choice.condition]}</p>
      <button type="submit" disabled={disabled} className="col-span-2 rounded-lg bg-tide-600 px-3 py-2 text-sm font-semibold text-white disabled:bg-tide-200">
        Ask the client to do this
      </button>
    </form>
  );
}
