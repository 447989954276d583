/** One truth/estimate pair; `estimateDeg` is null when the tracker found no hand (or the angle could not be read). */
export interface ErrorSample {
  truthDeg: number;
  estimateDeg: number | null;
}

export interface ErrorSummary {
  samples: number;
  detected: number;
  /** detected / samples. */
  detectionRate: number;
  /** Mean of estimate - truth over detected samples. */
  biasDeg: number | null;
  meanAbsoluteErrorDeg: number | null;
  /** Least-squares slope of estimate on truth: 1 means changes are read at full size, 0 means not at all. */
  slope: number | null;
  intercept: number | null;
  /** Share of detected samples within 5 and 10 degrees of the truth. */
  within5: number | null;
  within10: number | null;
}

/** Means and centred sums of squares and products of paired values; refuses mismatched lengths. */
function moments(name: string, x: readonly number[], y: readonly number[]): { meanX: number; meanY: number; sxx: number; sxy: number; syy: number } {
  if (x.length !== y.length) throw new Error(`${name}: expected x and y of equal length, got ${x.length} and ${y.length}`);
  const meanX = x.reduce((a, b) => a + b, 0) / x.length;
  const meanY = y.reduce((a, b) => a + b, 0) / y.length;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < x.length; i++) {
    sxy += (x[i] - meanX) * (y[i] - meanY);
    sxx += (x[i] - meanX) ** 2;
    syy += (y[i] - meanY) ** 2;
  }
  return { meanX, meanY, sxx, sxy, syy };
}

/**
 * Ordinary least squares of y on x: slope = Sxy / Sxx, intercept = mean(y) - slope * mean(x). Null when x does not
 * vary (a slope means nothing without a spread of truths).
 */
export function leastSquares(x: readonly number[], y: readonly number[]): { slope: number; intercept: number } | null {
  const m = moments("leastSquares", x, y);
  if (x.length < 2 || m.sxx < 1e-9) return null;
  const slope = m.sxy / m.sxx;
  return { slope, intercept: m.meanY - slope * m.meanX };
}

/**
 * Pearson's correlation coefficient of x and y: Sxy / sqrt(Sxx Syy). Null when either does not vary; refuses
 * mismatched lengths.
 */
export function pearson(x: readonly number[], y: readonly number[]): number | null {
  const m = moments("pearson", x, y);
  if (x.length < 2 || m.sxx < 1e-12 || m.syy < 1e-12) return null;
  return m.sxy / Math.sqrt(m.sxx * m.syy);
}

export function summarizeErrors(samples: readonly ErrorSample[]): ErrorSummary {
  const detected = samples.filter((s): s is { truthDeg: number; estimateDeg: number } => s.estimateDeg !== null);
  const errors = detected.map((s) => s.estimateDeg - s.truthDeg);
  const mean = (values: number[]) => (values.length ? values.reduce((a, b) => a + b, 0) / values.length : null);
  const fit = leastSquares(
    detected.map((s) => s.truthDeg),
    detected.map((s) => s.estimateDeg),
  );
  const share = (limit: number) => (errors.length ? errors.filter((e) => Math.abs(e) <= limit).length / errors.length : null);
  return {
    samples: samples.length,
    detected: detected.length,
    detectionRate: samples.length ? detected.length / samples.length : 0,
    biasDeg: mean(errors),
    meanAbsoluteErrorDeg: mean(errors.map(Math.abs)),
    slope: fit?.slope ?? null,
    intercept: fit?.intercept ?? null,
    within5: share(5),
    within10: share(10),
  };
}

/**
 * The nearest-rank percentile: the smallest value with at least p of the values at or below it (the ceil(p * n)-th
 * smallest; Hyndman and Fan's definition 1). With the values the absolute errors of held-out readings, p of them lie
 * within it, which is how a stated interval is checked (clip-validation.ts "within stated ±"). Null with no values;
 * refuses p outside (0, 1].
 */
export function nearestRankPercentile(values: readonly number[], p: number): number | null {
  if (!(p > 0 && p <= 1)) throw new Error(`nearestRankPercentile: expected p in (0, 1], got ${p}`);
  if (!values.length) return null;
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.ceil(p * sorted.length) - 1];
}
