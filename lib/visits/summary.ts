import { and, asc, desc, eq } from "drizzle-orm";
import type { Database } from "@/db";
import { attempts, clients, clinics, passiveRanges, type Visit } from "@/db/schema";
import { chooseReference, gradeMotion, type GradeResult, type GradeScale } from "@/lib/grading/grade";
import { isMotionId, type Digit, type MotionId, type RangeTableId } from "@/lib/motions/catalog";

export interface VisitAttemptRow {
  id: string;
  motion: string;
  side: string;
  digit: string | null;
  condition: string;
  peakDeg: number | null;
  arcDeg: number | null;
  uncertaintyDeg: number | null;
  planeVerdict: string;
  planeVerified: boolean;
  reps: number;
  /** The engine's notes on the attempt, e.g. that the two hand models disagree about its peak. */
  warnings: string[];
  recordedAt: string;
}

export interface VisitProposal {
  motion: string;
  side: string;
  digit: string | null;
  grade: GradeResult;
}

export interface VisitSummary {
  visitId: string;
  attempts: VisitAttemptRow[];
  proposals: VisitProposal[];
  notes: string;
}

/**
 * The attempts kept in one visit and the range-based grade each motion earns from them, with every reason an
 * in-person test is still needed. Reference: the client's latest passive range for the motion, else the clinic's table.
 */
export async function buildVisitSummary(db: Database, visit: Visit): Promise<VisitSummary> {
  const rows = await db
    .select()
    .from(attempts)
    .where(and(eq(attempts.visitId, visit.id), eq(attempts.clientId, visit.clientId)))
    .orderBy(asc(attempts.recordedAt));
  const [client] = await db.select().from(clients).where(eq(clients.id, visit.clientId));
  const [clinic] = await db.select().from(clinics).where(eq(clinics.id, visit.clinicId));
  const groups = new Map<string, typeof rows>();
  for (const r of rows) {
    const key = `${r.motion}|${r.side}|${r.digit ?? ""}`;
    groups.set(key, [...(groups.get(key) ?? []), r]);
  }
  const proposals: VisitProposal[] = [];
  for (const group of groups.values()) {
    const { motion, side, digit } = group[0];
    if (!isMotionId(motion)) continue;
    const [passive] = await db
      .select({ valueDeg: passiveRanges.valueDeg })
      .from(passiveRanges)
      .where(and(eq(passiveRanges.clientId, visit.clientId), eq(passiveRanges.motion, motion), eq(passiveRanges.side, side), digit ? eq(passiveRanges.digit, digit) : undefined))
      .orderBy(desc(passiveRanges.measuredAt))
      .limit(1);
    const reference = chooseReference(motion as MotionId, digit as Digit | null, { passiveRangeDeg: passive?.valueDeg, table: clinic.normTable as RangeTableId });
    if (!reference) continue;
    const grade = gradeMotion({
      motion: motion as MotionId,
      scale: clinic.gradeScale as GradeScale,
      reference,
      thresholds: { fullRangeFraction: clinic.fullRangePercent / 100 },
      attempts: group.map((a) => ({
        condition: a.condition,
        planeVerdict: a.planeVerdict as "against_gravity" | "gravity_assisted" | "gravity_minimized" | "unclear",
        peakDeg: a.peakDeg,
        arcDeg: a.arcDeg,
        trackingOk: a.frames > 0 && a.usableFrames / a.frames >= 0.8,
        uncertaintyDeg: a.uncertaintyDeg,
        label: a.id,
      })),
      precautions: client.noResistedUntil ? [{ noResistanceUntil: client.noResistedUntil, note: client.precautionNote }] : [],
      today: new Date().toISOString().slice(0, 10),
    });
    proposals.push({ motion, side, digit, grade });
  }
  return {
    visitId: visit.id,
    notes: visit.notes,
    attempts: rows.map((a) => ({
      id: a.id,
      motion: a.motion,
      side: a.side,
      digit: a.digit,
      condition: a.condition,
      peakDeg: a.peakDeg,
      arcDeg: a.arcDeg,
      uncertaintyDeg: a.uncertaintyDeg,
      planeVerdict: a.planeVerdict,
      planeVerified: a.planeVerified,
      reps: a.reps,
      warnings: a.warnings,
      recordedAt: a.recordedAt.toISOString(),
    })),
    proposals,
  };
}
