import type { ErrorSummary } from "./stats";

export interface AcceptanceTarget {
  maxMaeDeg: number;
  /** Least-squares slope of estimate on truth must lie in this range; null where issue 8 sets no slope bar. */
  slope: [number, number] | null;
}

/** Issue 8's acceptance figures for a motion in its recommended view, after correction (wrist.flexion covers extension). */
export const ACCEPTANCE: Readonly<Record<"mcp.flexion" | "pip.flexion" | "wrist.flexion" | "dip.flexion", AcceptanceTarget>> = {
  "mcp.flexion": { maxMaeDeg: 5, slope: [0.9, 1.1] },
  "pip.flexion": { maxMaeDeg: 5, slope: [0.9, 1.1] },
  "wrist.flexion": { maxMaeDeg: 5, slope: [0.9, 1.1] },
  "dip.flexion": { maxMaeDeg: 8, slope: null },
};
export type AcceptanceKey = keyof typeof ACCEPTANCE;

/** Issue 8: detection at least 95%. */
export const MIN_DETECTION = 0.95;

export function meetsAcceptance(s: Pick<ErrorSummary, "meanAbsoluteErrorDeg" | "slope" | "detectionRate">, target: AcceptanceTarget): boolean {
  const maeOk = s.meanAbsoluteErrorDeg !== null && s.meanAbsoluteErrorDeg <= target.maxMaeDeg;
  const slopeOk = !target.slope || (s.slope !== null && s.slope >= target.slope[0] && s.slope <= target.slope[1]);
  return maeOk && slopeOk && s.detectionRate >= MIN_DETECTION;
}
