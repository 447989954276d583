/**
 * What Kinarc states about its own accuracy, per test motion and position, in the view the set-up check asks for:
 * the same 90% intervals the engine attaches to each reading (vision/uncertainty.ts, at full tracking confidence),
 * so the page a therapist reads and the ± beside an attempt cannot drift apart. Built from the committed table
 * (vision/uncertainty-table.json, derived from held-out rendered-hand clips by scripts/accuracy/derive-uncertainty.ts).
 */
import { CONDITIONS, isOneFingerMotion, MOTION_IDS, MOTIONS, type Condition, type Digit, type MotionId } from "@/lib/motions/catalog";
import { readsWithBothModels } from "@/vision/model-pair-scope";
import {
  angleUncertaintyDeg,
  FULL_CONFIDENCE_SCORE,
  fingerAloneUncertaintyDeg,
  ownAloneFigure,
  pairPeakUncertaintyDeg,
  pairUncertaintyDeg,
  peakUncertaintyDeg,
  UNCERTAINTY_TABLE,
  withoutStraightWristUncertaintyDeg,
  type UncertaintyTable,
  type ValidationView,
} from "@/vision/uncertainty";
import { handSpanBand, viewName, viewPolicy } from "@/vision/view-policy";
import { neutralReadingUncertaintyDeg } from "@/vision/wrist-axis";

export const CONDITION_WORDS: Record<Condition, string> = {
  against_gravity: "against gravity",
  gravity_minimized: "gravity minimized",
};

export interface Interval {
  /** 90% half-width of one frame's angle, degrees. */
  frameDeg: number | null;
  /** 90% half-width of a repetition's peak, degrees (never narrower than the frame's). */
  peakDeg: number | null;
}

export interface FingerInterval {
  digit: Digit;
  frameDeg: number | null;
}

export interface AccuracyRow {
  motion: MotionId;
  label: string;
  condition: Condition;
  /** Null: the four fingers together (the engine's pooled figure); "thumb" for the thumb's own row. */
  digit: "thumb" | null;
  view: ValidationView;
  viewLabel: string;
  /** The lite hand model alone: every live reading, and uploads the full model cannot also read. */
  lite: Interval;
  /** Both hand models read together, where that was measured (finger flexion); null elsewhere. */
  both: Interval | null;
  /** Where the fingers read unalike from this view, each finger's own frame interval (lite); empty otherwise. */
  byFinger: FingerInterval[];
  /** A finger tested with its neighbours still (the therapist's "one finger" choice), lite; null where not offered. */
  fingerAloneDeg: number | null;
  /**
   * Fingers whose lone readings held-out one-finger clips measured in this view (FingerAloneCell.byDigit), lite: the
   * frame interval the engine states for that finger bent alone (never narrower than its four-finger one); empty elsewhere.
   */
  fingerAloneByFinger: FingerInterval[];
  /**
   * Wrist motions: `lite` is read against the straight-wrist reading the self-check and visits take first (the figure
   * the engine states then); this is the interval without one, or with the forearm line taken from the upper body.
   * Null for other motions.
   */
  otherwiseDeg: number | null;
  /**
   * How much of the picture the hand should fill (its longer side over the picture's shorter side), where the set-up
   * check holds it to a band (vision/view-policy.ts handSpanBand: a finger from the thumb side); null elsewhere.
   */
  framing: { min: number; max: number } | null;
}

const SCORE = FULL_CONFIDENCE_SCORE;
const roundHalf = (deg: number | null) => (deg === null ? null : Math.round(deg * 2) / 2);

function peakOf(frameDeg: number | null, peakDeg: number | null): number | null {
  if (frameDeg === null) return roundHalf(peakDeg);
  return roundHalf(Math.max(frameDeg, peakDeg ?? frameDeg));
}

function framingOf(motion: MotionId, condition: Condition, digit: "thumb" | null): { min: number; max: number } | null {
  // The fingers together are asked with a finger, as a reading would be.
  const band = handSpanBand(motion, condition, digit ?? (MOTIONS[motion].digits.length ? "index" : null));
  return band.max === Infinity ? null : band;
}

function row(motion: MotionId, condition: Condition, digit: "thumb" | null, table: UncertaintyTable): AccuracyRow | null {
  const policy = viewPolicy(motion, condition, digit);
  const view = policy.recommended[0];
  const cellDeg = angleUncertaintyDeg(motion, digit, "lite", view, SCORE, table);
  if (cellDeg === null) return null;
  // A wrist is read against the straight-wrist reading where one was taken (vision/pipeline.ts statedInterval).
  const wrist = MOTIONS[motion].joint === "wrist";
  const neutralDeg = wrist ? neutralReadingUncertaintyDeg(motion, "lite", view, SCORE, undefined, table) : null;
  const frameDeg = neutralDeg ?? cellDeg;
  // Already never narrower than the cell's own figure.
  const otherwise = wrist ? (withoutStraightWristUncertaintyDeg(motion, cellDeg, SCORE, table) ?? cellDeg) : null;
  const lite = { frameDeg: roundHalf(frameDeg), peakDeg: peakOf(frameDeg, peakUncertaintyDeg(motion, digit, "lite", view, SCORE, table)) };
  // Both models read a finger's flexion; the page asks with a finger, as a reading would.
  const pairFrame = readsWithBothModels(motion, "index") && digit === null ? pairUncertaintyDeg(motion, null, view, SCORE, table) : null;
  const both = pairFrame === null ? null : { frameDeg: roundHalf(pairFrame), peakDeg: peakOf(pairFrame, pairPeakUncertaintyDeg(motion, null, view, SCORE, table)) };
  const fingers = digit === null ? MOTIONS[motion].digits.filter((d) => d !== "thumb") : [];
  const perFinger = fingers.map((d) => ({ digit: d, frameDeg: roundHalf(angleUncertaintyDeg(motion, d, "lite", view, SCORE, table)) }));
  const unalike = perFinger.some((f) => f.frameDeg !== lite.frameDeg);
  // The pooled figure (no finger named): the cell's own, for a finger no one-finger clip measured.
  const alone = fingers.length ? fingerAloneUncertaintyDeg(motion, null, "lite", view, SCORE, table) : null;
  const aloneByFinger = fingers.flatMap((d) => {
    const figures = ownAloneFigure(table, motion, d, "lite", view) ? oneFingerFigures(motion, condition, d, table) : null;
    return figures ? [{ digit: d, frameDeg: figures.aloneDeg }] : [];
  });
  return {
    motion,
    label: MOTIONS[motion].label,
    condition,
    digit,
    view,
    viewLabel: viewName(view),
    lite,
    both,
    byFinger: unalike ? perFinger : [],
    fingerAloneDeg: roundHalf(alone),
    fingerAloneByFinger: aloneByFinger,
    otherwiseDeg: neutralDeg === null ? null : roundHalf(otherwise),
    framing: framingOf(motion, condition, digit),
  };
}

/**
 * What a finger tested on its own is read within, in the view recommended for it at full confidence (lite, frames):
 * its lone interval as the engine states it (never narrower than the four-finger one) beside the interval of the
 * same finger bending with the others. Null where a lone finger is not offered or no figure exists.
 */
export function oneFingerFigures(
  motion: MotionId,
  condition: Condition,
  digit: Digit | null,
  table: UncertaintyTable = UNCERTAINTY_TABLE,
): { aloneDeg: number; togetherDeg: number } | null {
  if (!digit || !isOneFingerMotion(motion, digit)) return null;
  const view = viewPolicy(motion, condition, digit).recommended[0];
  const together = angleUncertaintyDeg(motion, digit, "lite", view, SCORE, table);
  const alone = fingerAloneUncertaintyDeg(motion, digit, "lite", view, SCORE, table);
  if (together === null || alone === null) return null;
  return { aloneDeg: roundHalf(Math.max(alone, together))!, togetherDeg: roundHalf(together)! };
}

/** Every motion Kinarc measures, in both test positions: the fingers together, then the thumb where it applies. */
export function accuracyRows(table: UncertaintyTable = UNCERTAINTY_TABLE): AccuracyRow[] {
  const rows: AccuracyRow[] = [];
  for (const motion of MOTION_IDS) {
    const digits = MOTIONS[motion].digits;
    const targets: ("thumb" | null)[] = digits.length === 0 || digits.some((d) => d !== "thumb") ? [null] : [];
    if (digits.includes("thumb")) targets.push("thumb");
    for (const condition of CONDITIONS) {
      for (const digit of targets) {
        const r = row(motion, condition, digit, table);
        if (r) rows.push(r);
      }
    }
  }
  return rows;
}

/** The versions the figures belong to, shown beside them. */
export function accuracySource(table: UncertaintyTable = UNCERTAINTY_TABLE): { uncertainty: string; correction: string } {
  return { uncertainty: table.version, correction: table.correctionVersion };
}
