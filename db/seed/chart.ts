// Demo measurements for the chart: attempts made by the measurement engine from synthetic captures, a passive range,
// and range-based grades computed by lib/grading from those attempts. All people and findings are invented.
import type { Tx } from "@/db";
import { attempts, gradeEntries, passiveRanges } from "@/db/schema";
import { chooseReference } from "@/lib/grading/grade";
import { proposeGrade, rowKey, type RowKey } from "@/lib/chart/model";
import { analyzeSynthetic, attemptRow, type SyntheticAttemptSpec } from "@/lib/chart/synthetic-attempts";

interface DemoRow extends RowKey {
  condition: SyntheticAttemptSpec["condition"];
  /** Peak per session, oldest first; sessions are a week apart, the last one yesterday. */
  peaksDeg: number[];
  noHandRate?: number;
  passiveDeg?: number;
  /** Sign the engine's grade as this role after the last session. */
  sign?: "therapist" | "assistant";
}

const DEMO_ROWS: Record<string, DemoRow[]> = {
  // Healing wrist fracture on the right; the left side is the comparison.
  dorian: [
    { motion: "wrist.extension", side: "right", digit: null, condition: "against_gravity", peaksDeg: [34, 45, 52], passiveDeg: 60, sign: "therapist" },
    { motion: "wrist.extension", side: "left", digit: null, condition: "against_gravity", peaksDeg: [68], sign: "therapist" },
    { motion: "wrist.flexion", side: "right", digit: null, condition: "gravity_minimized", peaksDeg: [30, 41], sign: "assistant" },
  ],
  // Radial nerve recovering: wrist extension back to full range, finger extension at the knuckle not yet seen.
  bram: [
    { motion: "wrist.extension", side: "right", digit: null, condition: "against_gravity", peaksDeg: [40, 66], sign: "therapist" },
    { motion: "mcp.extension", side: "right", digit: "index", condition: "against_gravity", peaksDeg: [2], sign: "therapist" },
  ],
  // Ulnar nerve: weak spreading of the little finger, and one capture with poor tracking.
  kofi: [{ motion: "finger.abduction", side: "left", digit: "little", condition: "against_gravity", peaksDeg: [12], noHandRate: 0.3 }],
};

export async function seedChartDemo(
  tx: Tx,
  ids: { clinicId: string; clientIds: Record<string, string>; therapistId: string; assistantId: string },
  today: Date,
): Promise<void> {
  const day = 86_400_000;
  let seed = 1;
  for (const [key, rows] of Object.entries(DEMO_ROWS)) {
    const clientId = ids.clientIds[key];
    if (!clientId) continue;
    for (const row of rows) {
      const made = [];
      for (const [i, peakDeg] of row.peaksDeg.entries()) {
        const when = new Date(today.getTime() - (row.peaksDeg.length - 1 - i) * 7 * day - day);
        const analysis = analyzeSynthetic({ ...row, peakDeg, seed: seed++, noHandRate: row.noHandRate, requirePlane: true });
        const [inserted] = await tx
          .insert(attempts)
          .values(attemptRow(analysis, { clinicId: ids.clinicId, clientId, recordedByUserId: null }, when, `demo-${key}-${rowKey(row).replaceAll("|", "-")}-${i}`))
          .returning();
        made.push(inserted);
      }
      if (row.passiveDeg) {
        await tx.insert(passiveRanges).values({
          clinicId: ids.clinicId,
          clientId,
          motion: row.motion,
          side: row.side,
          digit: row.digit,
          valueDeg: row.passiveDeg,
          measuredAt: new Date(today.getTime() - 15 * day),
          measuredByUserId: ids.therapistId,
          note: "Goniometer, forearm pronated.",
        });
      }
      if (!row.sign) continue;
      const reference = chooseReference(row.motion, row.digit, { passiveRangeDeg: row.passiveDeg })!;
      const result = proposeGrade(row, made, reference, { scale: "daniels", fullRangeFraction: 0.9 });
      const at = new Date(made.at(-1)!.recordedAt.getTime() + 3600_000);
      const signer = row.sign === "therapist" ? ids.therapistId : ids.assistantId;
      await tx.insert(gradeEntries).values({
        clinicId: ids.clinicId,
        clientId,
        motion: row.motion,
        side: row.side,
        digit: row.digit,
        scale: "daniels",
        value: result.value,
        method: "remote_range",
        basis: { attemptIds: made.map((a) => a.id), reference, reasons: result.reasons, inPerson: result.inPerson, fullRangeFraction: 0.9 },
        inPersonReasons: result.inPerson.map((n) => n.reason),
        recordedByUserId: signer,
        recordedByRole: row.sign,
        recordedAt: at,
        status: row.sign === "therapist" ? "signed" : "awaiting_cosign",
        signedByUserId: row.sign === "therapist" ? signer : null,
        signedAt: row.sign === "therapist" ? at : null,
      });
    }
  }
}
