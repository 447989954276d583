/**
 * The trend of one practised motion across sessions and Kinarc's own rule for a note when the range falls or stalls.
 * Practice readings inform the therapist; they are never grades. Pure.
 */

export interface SessionReading {
  sessionId: string;
  startedAt: Date;
  /** Best reading of the session: the largest peak (or arc, for motions graded on the arc) of its attempts. */
  bestDeg: number;
  /** The engine's stated ± for that reading, when it gave one. */
  uncertaintyDeg: number | null;
}

/**
 * Floor of the typical error. Goniometer SEM of 2.4-4.9° for fingers (Macionis, BMC Musculoskelet Disord 2013;14:17)
 * and camera-landmark MAE of about 5° against a goniometer (see shared clinical references) put a single reading's
 * typical error near 5°; the "5° rule" for a meaningful change is often quoted [from memory].
 */
export const TYPICAL_ERROR_FLOOR_DEG = 5;

/** How many of the latest sessions the rule compares with the best before them. */
export const RECENT_SESSIONS = 3;

export type TrendVerdict = "too_few" | "improving" | "stalled" | "falling" | "at_reference";

export interface TrendNote {
  verdict: TrendVerdict;
  earlierBestDeg: number | null;
  recentBestDeg: number | null;
  typicalErrorDeg: number;
  message: string;
}

function median(values: number[]): number | null {
  if (!values.length) return null;
  const s = [...values].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

/**
 * Kinarc's rule (our own, reasoning rather than a published criterion): with at least one session before the last
 * three, compare the best of the last three with the best before them. Below it by more than the typical error:
 * falling. Not above it by more than the typical error: stalled, unless the earlier best already reached the
 * reference end-range (nothing left to gain). The typical error is the larger of the floor above and the median of
 * the engine's own ± for these readings, so a noisy view does not raise false notes.
 */
export function practiceTrend(readings: readonly SessionReading[], referenceEndRangeDeg: number | null): TrendNote {
  const sorted = [...readings].sort((a, b) => a.startedAt.getTime() - b.startedAt.getTime());
  const stated = median(sorted.flatMap((r) => (r.uncertaintyDeg === null ? [] : [r.uncertaintyDeg])));
  const typicalErrorDeg = Math.max(TYPICAL_ERROR_FLOOR_DEG, stated ?? 0);
  if (sorted.length < RECENT_SESSIONS + 1) {
    return { verdict: "too_few", earlierBestDeg: null, recentBestDeg: null, typicalErrorDeg, message: `A trend needs at least ${RECENT_SESSIONS + 1} practice sessions.` };
  }
  const earlier = sorted.slice(0, -RECENT_SESSIONS);
  const recent = sorted.slice(-RECENT_SESSIONS);
  const earlierBestDeg = Math.max(...earlier.map((r) => r.bestDeg));
  const recentBestDeg = Math.max(...recent.map((r) => r.bestDeg));
  const base = { earlierBestDeg, recentBestDeg, typicalErrorDeg };
  const err = Math.round(typicalErrorDeg);
  if (recentBestDeg < earlierBestDeg - typicalErrorDeg) {
    return { ...base, verdict: "falling", message: `Range falling: the best of the last ${RECENT_SESSIONS} sessions (${Math.round(recentBestDeg)}°) is more than ${err}° below the earlier best (${Math.round(earlierBestDeg)}°).` };
  }
  if (recentBestDeg <= earlierBestDeg + typicalErrorDeg) {
    if (referenceEndRangeDeg !== null && earlierBestDeg >= referenceEndRangeDeg) {
      return { ...base, verdict: "at_reference", message: `At or beyond the typical end-range (${referenceEndRangeDeg}°).` };
    }
    return { ...base, verdict: "stalled", message: `Range stalled: the last ${RECENT_SESSIONS} sessions (best ${Math.round(recentBestDeg)}°) are not above the earlier best (${Math.round(earlierBestDeg)}°) by more than ${err}°.` };
  }
  return { ...base, verdict: "improving", message: `Improving: the best of the last ${RECENT_SESSIONS} sessions is ${Math.round(recentBestDeg - earlierBestDeg)}° above the earlier best.` };
}
