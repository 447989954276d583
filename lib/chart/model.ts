// Pure rules of the chart: which rows exist, which grade entry is current, which in-person needs are still open.
// No database here, so the rules are tested directly and shared by the chart, the follow-up queue and the reports.
import type { GradeEntry } from "@/db/schema";
import { gradeMotion, RESISTED_TEST_CAUTION, type GradeScale, type InPersonNeed, type InPersonReason } from "@/lib/grading/grade";
import { MOTIONS, MOTION_IDS, SIDES, type Digit, type MotionId, type Side } from "@/lib/motions/catalog";
import { FLAGS_BLOCKING_RESISTANCE } from "@/lib/validation/client";
import type { PrecautionFlag } from "@/db/schema";

export interface RowKey {
  motion: MotionId;
  side: Side;
  digit: Digit | null;
}

export function rowKey(r: { motion: string; side: string; digit: string | null }): string {
  return `${r.motion}|${r.side}|${r.digit ?? "-"}`;
}

export function parseRowKey(key: string): RowKey | null {
  const [motion, side, digit] = key.split("|");
  if (!(MOTION_IDS as readonly string[]).includes(motion) || !(SIDES as readonly string[]).includes(side)) return null;
  return { motion: motion as MotionId, side: side as Side, digit: digit === "-" || digit === undefined ? null : (digit as Digit) };
}

/** Every motion of the wrist and each digit the catalog lists, on both sides, in catalog order. */
export function allRows(): RowKey[] {
  const rows: RowKey[] = [];
  for (const motion of MOTION_IDS) {
    const def = MOTIONS[motion];
    const digits: (Digit | null)[] = def.joint === "wrist" ? [null] : [...def.digits];
    for (const digit of digits) for (const side of SIDES) rows.push({ motion, side, digit });
  }
  return rows;
}

export function rowLabel(r: { motion: string; digit: string | null }): string {
  const def = MOTIONS[r.motion as MotionId];
  const name = def ? def.label : r.motion;
  // A motion of one digit only (thumb IP flexion) already names it.
  return r.digit && !(def && def.digits.length === 1) ? `${name}, ${r.digit}` : name;
}

/** Daniels & Worthingham (Hislop, Avers & Brown, 9th ed., 2014) and MRC Memorandum 45 (1976) grades by how they are found. */
export const IN_PERSON_GRADES: Record<GradeScale, { resisted: readonly string[]; palpation: readonly string[] }> = {
  daniels: { resisted: ["3+", "4", "5"], palpation: ["0", "1"] },
  mrc: { resisted: ["4", "5"], palpation: ["0", "1"] },
  // Brandsma & Schreuders' intrinsic scale keeps 4 and 5 for resistance, 1 for a palpable contraction [from memory].
  intrinsic: { resisted: ["4", "5"], palpation: ["0", "1"] },
};

export const GRADE_METHOD_LABELS = {
  remote_range: "Remote, range-based (camera)",
  in_person_resisted: "In person, resisted",
  in_person_palpation: "In person, palpation",
} as const;

export const REASON_LABELS: Record<InPersonReason, string> = {
  resistance: "Resisted test",
  palpation: "Palpation",
  position: "Position not verified",
  tracking: "Tracking quality",
  uncertain: "Measurement uncertainty",
  precaution: "Precaution",
};

/** Palpation first (no movement seen may be a nerve problem), then resistance, then checks of the camera reading. */
export const REASON_URGENCY: Record<InPersonReason, number> = { palpation: 3, resistance: 2, position: 1, tracking: 1, uncertain: 1, precaution: 0 };

/** Entries not replaced by a later correction, oldest first. Corrected entries stay in the history, never here. */
export function currentEntries(entries: readonly GradeEntry[]): GradeEntry[] {
  const replaced = new Set(entries.map((e) => e.replacesId).filter(Boolean));
  return entries.filter((e) => !replaced.has(e.id)).sort((a, b) => +a.recordedAt - +b.recordedAt);
}

export interface ResistancePrecaution {
  /** Resisted testing is not allowed today. */
  active: boolean;
  /** The earliest date resisted testing is allowed, or null when only the surgeon's clearance ends it. */
  notBefore: string | null;
  detail: string;
}

/**
 * Whether the record forbids resisted testing now. A date alone blocks until that date; a blocking flag blocks until
 * the flag is removed from the record (the date, if given, is the earliest that may happen).
 */
export function resistancePrecaution(
  client: { precautionFlags: readonly PrecautionFlag[]; noResistedUntil: string | null; precautionNote?: string },
  today: string,
): ResistancePrecaution {
  const flags = client.precautionFlags.filter((f) => FLAGS_BLOCKING_RESISTANCE.includes(f));
  const dated = client.noResistedUntil && client.noResistedUntil > today ? client.noResistedUntil : null;
  const active = flags.length > 0 || dated !== null;
  const note = client.precautionNote ? ` ${client.precautionNote}` : "";
  const detail = !active
    ? ""
    : dated
      ? `No resisted testing before ${dated}.${note} ${RESISTED_TEST_CAUTION}`
      : `No resisted testing until the referring surgeon clears it (${flags.join(", ").replaceAll("_", " ")}).${note} ${RESISTED_TEST_CAUTION}`;
  return { active, notBefore: dated, detail };
}

export interface ProposalAttempt {
  id: string;
  condition: "against_gravity" | "gravity_minimized";
  planeVerdict: string;
  peakDeg: number | null;
  arcDeg: number | null;
  frames: number;
  usableFrames: number;
  uncertaintyDeg?: number | null;
  warnings: readonly string[];
}

// The same share of usable frames the engine uses to call tracking poor (vision/analyze-capture.ts).
const MIN_USABLE_FRACTION = 0.75;

export function trackingOk(a: Pick<ProposalAttempt, "frames" | "usableFrames">): boolean {
  return a.frames > 0 && a.usableFrames / a.frames >= MIN_USABLE_FRACTION;
}

const PLANE_VERDICTS = ["against_gravity", "gravity_assisted", "gravity_minimized", "unclear"] as const;

/** The engine's range-based grade for a row from its attempts (lib/grading), without precautions: those are live. */
export function proposeGrade(
  row: RowKey,
  attemptRows: readonly ProposalAttempt[],
  reference: { endRangeDeg: number; source: string },
  opts: { scale: GradeScale; fullRangeFraction: number },
) {
  return gradeMotion({
    motion: row.motion,
    scale: opts.scale,
    reference,
    thresholds: { fullRangeFraction: opts.fullRangeFraction },
    attempts: attemptRows.map((a) => ({
      condition: a.condition,
      planeVerdict: (PLANE_VERDICTS as readonly string[]).includes(a.planeVerdict) ? (a.planeVerdict as (typeof PLANE_VERDICTS)[number]) : "unclear",
      peakDeg: a.peakDeg,
      arcDeg: a.arcDeg,
      trackingOk: trackingOk(a),
      uncertaintyDeg: a.uncertaintyDeg,
      label: `attempt ${a.id.slice(0, 8)}`,
    })),
  });
}

export interface OpenNeed extends InPersonNeed {
  /** When the need arose (the grade or proposal it comes from). */
  since: number | null;
}

/**
 * The in-person needs of one row that are still open. A need comes from the current remote grade (or, before one is
 * signed, from the engine's proposal) and closes when an in-person grade for the row is recorded after it. A resisted
 * need under an active precaution carries the earliest allowed date, and the precaution itself is listed.
 */
export function openNeeds(args: {
  current: readonly GradeEntry[];
  proposal: { inPerson: readonly InPersonNeed[]; at: number } | null;
  precaution: ResistancePrecaution;
}): OpenNeed[] {
  const remote = args.current.filter((e) => e.method === "remote_range").at(-1);
  const inPerson = args.current.filter((e) => e.method !== "remote_range").at(-1);
  let needs: OpenNeed[];
  if (remote) {
    if (inPerson && +inPerson.recordedAt >= +remote.recordedAt) return [];
    const details = (remote.basis?.inPerson as InPersonNeed[] | undefined) ?? [];
    needs = remote.inPersonReasons
      .filter((r): r is InPersonReason => r in REASON_LABELS && r !== "precaution")
      .map((reason) => ({ reason, detail: details.find((d) => d.reason === reason)?.detail ?? REASON_LABELS[reason], since: +remote.recordedAt }));
  } else if (args.proposal) {
    if (inPerson && +inPerson.recordedAt >= args.proposal.at) return [];
    needs = args.proposal.inPerson.filter((n) => n.reason !== "precaution").map((n) => ({ ...n, notBefore: undefined, since: args.proposal!.at }));
  } else {
    return [];
  }
  if (args.precaution.active && needs.some((n) => n.reason === "resistance")) {
    for (const n of needs) if (n.reason === "resistance" && args.precaution.notBefore) n.notBefore = args.precaution.notBefore;
    needs.push({ reason: "precaution", detail: args.precaution.detail, notBefore: args.precaution.notBefore ?? undefined, since: needs[0].since });
  }
  return needs;
}
