import { MOTIONS, getReferenceEndRange, type Condition, type Digit, type MotionId, type RangeTableId } from "@/lib/motions/catalog";

// The range-based part of manual muscle testing, for one motion, side and digit. Only grades that range decides can be
// given without touch; everything else becomes a reason for an in-person test.
// Sources: Hislop, Avers & Brown, Daniels and Worthingham's Muscle Testing, 9th ed., 2014 (default ladder);
// Medical Research Council, Aids to the Investigation of Peripheral Nerve Injuries, Memorandum 45, HMSO 1976;
// Brandsma & Schreuders's modified scale for the intrinsic hand muscles as recommended by the ASHT (gravity ignored).

export const GRADE_SCALES = ["daniels", "mrc", "intrinsic"] as const;
export type GradeScale = (typeof GRADE_SCALES)[number];
export const DEFAULT_GRADE_SCALE: GradeScale = "daniels";

export type InPersonReason = "resistance" | "palpation" | "position" | "tracking" | "uncertain" | "precaution";

/** Per-clinic thresholds; defaults follow the issue's reading of Daniels & Worthingham. */
export interface GradingThresholds {
  /** Share of the reference end-range that counts as full range. */
  fullRangeFraction: number;
  /** Share of the reference against gravity from which a partial range grades 3- (Daniels: more than half). */
  halfRangeFraction: number;
  /** Arcs no larger than this are not counted as movement (about the precision of goniometry, Macionis 2013). */
  minMotionDeg: number;
}

export const DEFAULT_THRESHOLDS: GradingThresholds = { fullRangeFraction: 0.9, halfRangeFraction: 0.5, minMotionDeg: 5 };

/** Shown wherever a resisted test is suggested. General practice; local protocols come first. */
export const RESISTED_TEST_CAUTION =
  "Before any resisted test: none with an unhealed fracture or dislocation or early after tendon, ligament or capsule repair; " +
  "stop if pain, swelling, numbness or colour change increases; the referring surgeon's protocol and local licensed practice come first.";

/** One kept attempt as the analyzer summed it up. */
export interface GradingAttempt {
  condition: Condition;
  /** What the plane check read; an attempt counts for its declared condition only when this agrees. */
  planeVerdict: "against_gravity" | "gravity_assisted" | "gravity_minimized" | "unclear" | null;
  peakDeg: number | null;
  arcDeg: number | null;
  trackingOk: boolean;
  /** 90% interval half-width of the attempt's angles (vision/uncertainty.ts); absent or null when not stated. */
  uncertaintyDeg?: number | null;
  /** Optional label used in the explanations (file name, attempt id). */
  label?: string;
}

export interface Precaution {
  /** No resisted testing before this date (YYYY-MM-DD). */
  noResistanceUntil: string;
  note?: string;
}

export interface ReferenceRange {
  endRangeDeg: number;
  source: string;
}

export interface GradeInput {
  motion: MotionId;
  scale?: GradeScale;
  attempts: readonly GradingAttempt[];
  reference: ReferenceRange;
  thresholds?: Partial<GradingThresholds>;
  precautions?: readonly Precaution[];
  /** Today's date (YYYY-MM-DD), for deciding which precautions still hold. */
  today?: string;
}

export interface InPersonNeed {
  reason: InPersonReason;
  detail: string;
  /** For `precaution` (and `resistance` under one): the earliest date resisted testing is allowed. */
  notBefore?: string;
}

export interface GradeResult {
  scale: GradeScale;
  /** The grade, or null when no movement was seen (or nothing could be verified). */
  value: string | null;
  /** True when the value is the highest a range-only check can give: the true grade may be higher. */
  ceiling: boolean;
  inPerson: InPersonNeed[];
  /** Why this grade, in plain words, one line each. */
  reasons: string[];
  againstGravityBestDeg: number | null;
  gravityMinimizedBestDeg: number | null;
  reference: ReferenceRange;
}

/**
 * The reference end-range: the client's recorded passive range for the motion when there is one, otherwise the
 * chosen normal table's value (AAOS 1965 unless the clinic picked another).
 */
export function chooseReference(motion: MotionId, digit: Digit | null, options: { passiveRangeDeg?: number | null; table?: RangeTableId } = {}): ReferenceRange | null {
  if (options.passiveRangeDeg != null && options.passiveRangeDeg > 0) {
    return { endRangeDeg: options.passiveRangeDeg, source: "client's recorded passive range for this motion" };
  }
  const normal = getReferenceEndRange(motion, digit, options.table);
  return normal ? { endRangeDeg: normal.endRangeDeg, source: normal.source } : null;
}

function isoDate(value: string | undefined): string {
  return (value ?? new Date().toISOString()).slice(0, 10);
}

function fmt(deg: number): string {
  return `${Math.round(deg * 10) / 10}°`;
}

export function gradeMotion(input: GradeInput): GradeResult {
  const scale = input.scale ?? DEFAULT_GRADE_SCALE;
  const t = { ...DEFAULT_THRESHOLDS, ...input.thresholds };
  const ref = input.reference.endRangeDeg;
  const measure = MOTIONS[input.motion].gradedOn;
  const reasons: string[] = [];
  const inPerson: InPersonNeed[] = [];
  const gravityIgnored = scale === "intrinsic";

  // How far an attempt got by the motion's graded measure; an arc within the noise floor is no movement at all.
  const extent = (a: GradingAttempt): number => {
    if (a.arcDeg == null || a.arcDeg <= t.minMotionDeg) return 0;
    return measure === "arc" ? a.arcDeg : (a.peakDeg ?? 0);
  };

  const counted: GradingAttempt[] = [];
  let bestAG: number | null = null;
  let bestGM: number | null = null;
  let bestAGAttempt: GradingAttempt | null = null;
  let bestGMAttempt: GradingAttempt | null = null;
  for (const a of input.attempts) {
    const name = a.label ? `${a.label} ` : "";
    if (!gravityIgnored && a.planeVerdict !== a.condition) {
      reasons.push(`${name}not counted: declared ${a.condition.replace("_", " ")} but the plane check read ${a.planeVerdict ?? "nothing"}`);
      continue;
    }
    counted.push(a);
    const e = extent(a);
    if (gravityIgnored || a.condition === "against_gravity") {
      if (bestAG === null || e > bestAG) bestAGAttempt = a;
      bestAG = Math.max(bestAG ?? 0, e);
    } else {
      if (bestGM === null || e > bestGM) bestGMAttempt = a;
      bestGM = Math.max(bestGM ?? 0, e);
    }
  }
  if (gravityIgnored) bestGM = null;

  const full = t.fullRangeFraction * ref;
  const half = t.halfRangeFraction * ref;
  const pct = (deg: number) => `${Math.round((deg / ref) * 100)}% of ${fmt(ref)}`;
  const agMoved = bestAG !== null && bestAG > 0;
  const gmMoved = bestGM !== null && bestGM > 0;
  let value: string | null = null;
  let ceiling = false;

  if (scale === "intrinsic") {
    if (bestAG !== null && bestAG >= full) {
      value = "3";
      ceiling = true;
      reasons.push(`full active range in any plane: ${fmt(bestAG)}, ${pct(bestAG)} (modified intrinsic scale: 3)`);
    } else if (agMoved) {
      value = "2";
      reasons.push(`reduced active range: ${fmt(bestAG!)}, ${pct(bestAG!)} (modified intrinsic scale: 2)`);
    }
  } else if (bestAG !== null && bestAG >= full) {
    value = "3";
    ceiling = true;
    reasons.push(`full range against gravity: ${fmt(bestAG)}, ${pct(bestAG)}`);
  } else if (scale === "mrc") {
    if (agMoved || gmMoved) {
      value = "2";
      const best = Math.max(bestAG ?? 0, bestGM ?? 0);
      reasons.push(`active movement without full range against gravity: best ${fmt(best)}, ${pct(best)} (MRC: 2)`);
    }
  } else if (bestAG !== null && bestAG >= half) {
    value = "3-";
    reasons.push(`more than half but not full range against gravity: ${fmt(bestAG)}, ${pct(bestAG)}`);
  } else if (agMoved) {
    value = "2+";
    reasons.push(`less than half the range against gravity: ${fmt(bestAG!)}, ${pct(bestAG!)}`);
  } else if (bestGM !== null && bestGM >= full) {
    value = "2";
    reasons.push(`full range with gravity minimized: ${fmt(bestGM)}, ${pct(bestGM)}`);
  } else if (gmMoved) {
    value = "2-";
    reasons.push(`partial range with gravity minimized: ${fmt(bestGM!)}, ${pct(bestGM!)}`);
  }

  if (ceiling) {
    inPerson.push({
      reason: "resistance",
      detail: `a resisted test in person decides grades above ${value} (${RESISTED_TEST_CAUTION})`,
    });
  } else if (value === "2" && scale === "daniels") {
    inPerson.push({ reason: "resistance", detail: `holding mild resistance through the gravity-minimized range would make it 2+ (${RESISTED_TEST_CAUTION})` });
  }

  if (value === null) {
    if (counted.length > 0) {
      reasons.push(`no movement larger than ${fmt(t.minMotionDeg)} seen`);
      inPerson.push({ reason: "palpation", detail: "palpation in person tells a flicker of contraction (1) from none (0)" });
    } else {
      reasons.push("no attempt could be verified");
    }
  }

  if (!gravityIgnored) {
    const verifiedAG = counted.some((a) => a.condition === "against_gravity");
    const verifiedGM = counted.some((a) => a.condition === "gravity_minimized");
    if (!verifiedAG && !ceiling) {
      inPerson.push({ reason: "position", detail: "no verified against-gravity attempt: the grade may be higher than shown" });
    } else if (verifiedAG && !agMoved && !verifiedGM) {
      inPerson.push({ reason: "position", detail: "no movement against gravity and no verified gravity-minimized attempt to grade below 2+" });
    }
  }

  // A grade line inside the best attempt's interval (extent - u < line <= extent + u) means the measurement cannot tell
  // which side of the line the client is on; the lines are the ones this scale grades by.
  const straddled: string[] = [];
  const checkLines = (best: number | null, attempt: GradingAttempt | null, lines: Array<[number, string]>, where: string) => {
    const u = attempt?.uncertaintyDeg;
    if (best === null || best <= 0 || u == null || !(u > 0)) return;
    for (const [line, name] of lines) {
      if (best - u < line && line <= best + u) straddled.push(`${where} ${fmt(best)} ± ${fmt(u)} straddles the ${name} line at ${fmt(line)}`);
    }
  };
  const fullLine: [number, string] = [full, `full-range (${Math.round(t.fullRangeFraction * 100)}%)`];
  const halfLine: [number, string] = [half, `${Math.round(t.halfRangeFraction * 100)}% range`];
  checkLines(bestAG, bestAGAttempt, scale === "daniels" ? [halfLine, fullLine] : [fullLine], gravityIgnored ? "best range" : "against gravity");
  if (scale === "daniels") checkLines(bestGM, bestGMAttempt, [fullLine], "gravity minimized");
  if (straddled.length > 0) {
    inPerson.push({ reason: "uncertain", detail: `${straddled.join("; ")}: the grade could be either side, confirm the range in person` });
  }

  const poorTracking = counted.filter((a) => !a.trackingOk);
  if (poorTracking.length > 0) {
    inPerson.push({ reason: "tracking", detail: `${poorTracking.length} counted attempt(s) had poor hand tracking: confirm the range in person` });
  }

  const today = isoDate(input.today);
  const active = (input.precautions ?? []).filter((p) => p.noResistanceUntil.slice(0, 10) > today);
  if (active.length > 0) {
    // Resisted testing is allowed only once every precaution on file has lapsed.
    const notBefore = active.map((p) => p.noResistanceUntil.slice(0, 10)).sort().at(-1)!;
    inPerson.push({
      reason: "precaution",
      detail: `a precaution on file forbids resisted testing until ${notBefore}${active.some((p) => p.note) ? ` (${active.map((p) => p.note).filter(Boolean).join("; ")})` : ""}`,
      notBefore,
    });
    for (const need of inPerson) if (need.reason === "resistance") need.notBefore = notBefore;
  }

  return { scale, value, ceiling, inPerson, reasons, againstGravityBestDeg: bestAG, gravityMinimizedBestDeg: bestGM, reference: input.reference };
}
