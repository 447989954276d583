// The 1-euro filter of Casiez, Roussel & Vogel, "1 Euro Filter: A Simple Speed-based Low-pass Filter for Noisy Input in
// Interactive Systems", CHI 2012: an exponential smoother whose cutoff rises with speed, so a held angle is steady
// and a moving one lags little. Written here rather than imported because it is a dozen lines and runs per frame
// without allocating.

export interface OneEuroParams {
  /** Cutoff at rest, Hz: lower = steadier hold, more lag. */
  minCutoffHz: number;
  /** How fast the cutoff rises with speed (per unit of the signal's speed, here degrees per second). */
  beta: number;
  /** Cutoff used to smooth the speed estimate, Hz (the paper keeps it at 1 Hz). */
  derivativeCutoffHz: number;
}

// Tuned on the synthetic hand with 2 mm landmark noise at 30 fps: a held angle settles within about a degree and
// a 100 deg/s flexion lags by a few frames. [common practice: the paper's procedure of setting beta last]
export const DEFAULT_ONE_EURO: OneEuroParams = { minCutoffHz: 1, beta: 0.007, derivativeCutoffHz: 1 };

/** Smoothing factor for a first-order low-pass with cutoff `cutoffHz` sampled every `periodS` seconds (paper, eq. for alpha). */
export function smoothingFactor(periodS: number, cutoffHz: number): number {
  const tau = 1 / (2 * Math.PI * cutoffHz);
  return 1 / (1 + tau / periodS);
}

export class OneEuroFilter {
  private readonly params: OneEuroParams;
  private lastTimeS = Number.NaN;
  private lastValue = Number.NaN;
  private lastSpeed = 0;

  constructor(params: Partial<OneEuroParams> = {}) {
    this.params = { ...DEFAULT_ONE_EURO, ...params };
  }

  /** Smoothed speed of the signal, units per second (0 before the second sample). */
  get speed(): number {
    return this.lastSpeed;
  }

  get value(): number {
    return this.lastValue;
  }

  reset(): void {
    this.lastTimeS = Number.NaN;
    this.lastValue = Number.NaN;
    this.lastSpeed = 0;
  }

  /** Feeds one sample at time `tS` (seconds) and returns the filtered value. */
  filter(value: number, tS: number): number {
    if (Number.isNaN(this.lastValue)) {
      this.lastValue = value;
      this.lastTimeS = tS;
      this.lastSpeed = 0;
      return value;
    }
    const periodS = tS - this.lastTimeS;
    // A repeated or backwards timestamp carries no timing information; keep the previous estimate.
    if (!(periodS > 0)) return this.lastValue;
    const rawSpeed = (value - this.lastValue) / periodS;
    const aSpeed = smoothingFactor(periodS, this.params.derivativeCutoffHz);
    this.lastSpeed = aSpeed * rawSpeed + (1 - aSpeed) * this.lastSpeed;
    const cutoff = this.params.minCutoffHz + this.params.beta * Math.abs(this.lastSpeed);
    const a = smoothingFactor(periodS, cutoff);
    this.lastValue = a * value + (1 - a) * this.lastValue;
    this.lastTimeS = tS;
    return this.lastValue;
  }
}
