// The evaluation summary for the medical record and the referring physician: one data shape for the print page, the
// PDF and the FHIR export, built from the chart.
import { eq } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { clinics, type Client } from "@/db/schema";
import { RESISTED_TEST_CAUTION } from "@/lib/grading/grade";
import { KG_PER_LB, MATHIOWETZ_1985, STRENGTH_TEST_LABELS } from "@/lib/norms/grip-pinch";
import { PRECAUTION_LABELS } from "@/lib/validation/client";
import { buildChart, type ChartData, type ChartRow } from "@/lib/chart/chart";
import { GRADE_METHOD_LABELS, REASON_LABELS } from "@/lib/chart/model";

/** How far the camera's angles can be trusted, with sources (shared/notes/clinical-references.md). */
export const ACCURACY_NOTES: readonly string[] = [
  "Angles are estimated from the client's camera with hand landmarks, not measured with a goniometer. In a pilot study camera-based landmarks agreed with a goniometer to a mean absolute error of about 5 degrees, with limits of agreement near ±17 degrees (Science Progress, 2026); on fast movements errors up to about 22 degrees RMSE were reported (Sprague et al., Sensors 2025;25:5716), and occlusion lowers the accuracy of MCP flexion (Gionfrida et al., PLoS ONE 2022;17:e0276799).",
  "For comparison, a universal goniometer at the wrist has ICCs of about 0.80-0.93 (LaStayo & Wheeler, Phys Ther 1994;74:162) and an accuracy of 6-7 degrees against fluoroscopy (Carter et al., J Hand Surg Am 2009;34:1422); finger goniometry has an SEM of 2.4-4.9 degrees (Macionis, BMC Musculoskelet Disord 2013;14:17).",
  "Each attempt carries its own stated uncertainty where the engine gives one: a 90% interval from Kinarc's validation on rendered hands for that joint, camera view and tracking quality, for the peak the width that held nine in ten held-out peaks. A test plane is counted only when the camera's gravity check agreed with the declared position (against gravity or gravity minimized).",
  "Range-based grades (up to 3) follow Daniels and Worthingham's Muscle Testing (Hislop, Avers & Brown, 9th ed., 2014); grades above 3, and 0 versus 1, need a resisted or palpation test in person.",
];

export const REPORT_CAUTIONS: readonly string[] = [
  RESISTED_TEST_CAUTION,
  "Kinarc supports a licensed therapist's judgement; it does not diagnose. The referring surgeon's protocol comes first.",
];

export interface ReportRow {
  motion: string;
  side: string;
  peak: string;
  reference: string;
  otherSide: string;
  grade: string;
  how: string;
  signed: string;
  open: string;
}

export interface ReportData {
  title: string;
  clinicName: string;
  clientName: string;
  dateOfBirth: string;
  referringPhysician: string;
  diagnosisNote: string;
  preparedOn: string;
  precautions: string[];
  rows: ReportRow[];
  strength: { test: string; side: string; reading: string; norm: string }[];
  accuracy: readonly string[];
  cautions: readonly string[];
  chart: ChartData;
}

const deg = (v: number | null | undefined) => (v == null ? "-" : `${Math.round(v)}°`);

function reportRow(r: ChartRow): ReportRow {
  const g = r.grade;
  const pct = r.bestPeakDeg != null && r.reference ? ` (${Math.round((r.bestPeakDeg / r.reference.endRangeDeg) * 100)}%)` : "";
  return {
    motion: r.label,
    side: r.side,
    peak: r.bestPeakDeg == null ? "-" : `${deg(r.bestPeakDeg)}${r.latestUncertaintyDeg ? ` ±${Math.round(r.latestUncertaintyDeg)}°` : ""}${pct}`,
    reference: r.reference ? `${deg(r.reference.endRangeDeg)} (${r.passiveRangeDeg != null ? "passive range" : r.reference.source.split(",")[0]})` : "-",
    otherSide: deg(r.otherSideBestPeakDeg),
    grade: g ? (g.value ?? "no movement seen") : "not graded",
    how: g ? GRADE_METHOD_LABELS[g.method] : "-",
    signed: g ? (g.status === "signed" ? `${g.signedByName ?? "?"}, ${g.signedAt?.slice(0, 10)}` : `awaiting co-signature (${g.recordedByName ?? "?"})`) : "-",
    open: r.needs.length ? r.needs.map((n) => `${REASON_LABELS[n.reason]}${n.notBefore ? ` (not before ${n.notBefore})` : ""}`).join("; ") : "none",
  };
}

export async function buildReport(db: DbOrTx, client: Client, today: string): Promise<ReportData> {
  const [clinic] = await db.select().from(clinics).where(eq(clinics.id, client.clinicId));
  const chart = await buildChart(db, client, { today });
  return {
    title: "Wrist and hand strength and range: evaluation summary",
    clinicName: clinic.name,
    clientName: `${client.givenName} ${client.familyName}`,
    dateOfBirth: client.dateOfBirth,
    referringPhysician: client.referringPhysician,
    diagnosisNote: client.diagnosisNote,
    preparedOn: today,
    precautions: [
      ...client.precautionFlags.map((f) => PRECAUTION_LABELS[f]),
      ...(client.noResistedUntil ? [`No resisted testing before ${client.noResistedUntil}`] : []),
      ...(client.precautionNote ? [client.precautionNote] : []),
    ],
    rows: chart.rows.map(reportRow),
    strength: chart.strength.map((s) => ({
      test: STRENGTH_TEST_LABELS[s.test],
      side: s.side,
      reading: `${s.meanKg.toFixed(1)} kg (${(s.meanKg / KG_PER_LB).toFixed(1)} lb), ${s.recordedAt.slice(0, 10)}`,
      norm: s.comparison
        ? `${Math.round(s.comparison.percentOfNorm)}% of the norm ${s.comparison.norm.meanLb} ± ${s.comparison.norm.sdLb} lb (${s.comparison.norm.group}; ${MATHIOWETZ_1985})`
        : "no published norm in Kinarc's table for this age, sex and test",
    })),
    accuracy: ACCURACY_NOTES,
    cautions: REPORT_CAUTIONS,
    chart,
  };
}
