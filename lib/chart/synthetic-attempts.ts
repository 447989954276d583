// Attempts for tests, the demo and the benchmark, made the honest way: a synthetic hand (vision/testing) moves to a
// chosen peak, and the measurement engine analyzes the capture. No angle here is typed in as a result.
import { measuredColumns } from "@/lib/captures/columns";
import type { NewAttempt } from "@/db/schema";
import type { Condition, Digit, MotionId, Side } from "@/lib/motions/catalog";
import { analyzeCapture, type CaptureAnalysis } from "@/vision/analyze-capture";
import { buildSyntheticCapture, randomPlacement, SeededRandom } from "@/vision/testing/synthetic-hand";
import type { Vec3 } from "@/vision/vec";

export interface SyntheticAttemptSpec {
  motion: MotionId;
  side: Side;
  digit: Digit | null;
  condition: Condition;
  /** Where the synthetic hand stops, as the motion reports it. */
  peakDeg: number;
  restDeg?: number;
  noiseMm?: number;
  /** Share of frames with no hand, to make a capture with poor tracking. */
  noHandRate?: number;
  seed: number;
  /** When false, keep the first placement even if the plane check disagrees (an unverified attempt). */
  requirePlane?: boolean;
}

/**
 * Runs the engine on a synthetic capture. The camera and gravity are placed at random (seeded) until the engine's
 * plane check reads the declared condition, as a client would be re-positioned until the check passes.
 */
export function analyzeSynthetic(spec: SyntheticAttemptSpec): CaptureAnalysis {
  const random = new SeededRandom(spec.seed);
  let last: CaptureAnalysis | null = null;
  for (let attempt = 0; attempt < 60; attempt++) {
    const placement = randomPlacement(random);
    const gravity: Vec3 = random.direction();
    const capture = buildSyntheticCapture({
      motion: spec.motion,
      side: spec.side,
      digit: spec.digit,
      condition: spec.condition,
      placement,
      gravity,
      restDeg: spec.restDeg ?? 0,
      reps: [{ peakDeg: spec.peakDeg }, { peakDeg: spec.peakDeg - 3 }],
      noiseMm: spec.noiseMm ?? 1,
      noHandRate: spec.noHandRate ?? 0,
      seed: spec.seed * 31 + attempt,
    });
    // The synthetic hand gives exact landmarks, not a tracker's: the correction fitted to the tracker's under-reading
    // would move them off the chosen peak, so it is off here (the stated uncertainty is then the raw method's).
    last = analyzeCapture(capture, { correction: "off" });
    if (spec.requirePlane === false || last.planeAgrees) return last;
  }
  throw new Error(`no placement in 60 tries gave a ${spec.condition} plane for ${spec.motion}`);
}

export const SYNTHETIC_ENGINE_VERSION = "kinarc-engine/synthetic-hand";

/** The attempts row the engine's analysis makes (the same fields the capture upload stores). */
export function attemptRow(
  analysis: CaptureAnalysis,
  ids: { clinicId: string; clientId: string; recordedByUserId: string | null },
  recordedAt: Date,
  captureUid: string,
): NewAttempt {
  return {
    captureUid,
    clinicId: ids.clinicId,
    clientId: ids.clientId,
    source: "self_check",
    recordedByUserId: ids.recordedByUserId,
    recordedAt,
    ...measuredColumns(analysis, SYNTHETIC_ENGINE_VERSION),
  };
}
