import { PlaneAccumulator, type PlaneReading } from "./plane";

export type RepPhase = "rest" | "move" | "hold" | "return";

export interface RepParams {
  /** Rise above the resting angle that starts a repetition. */
  enterDeg: number;
  /** The rise must last this long, so a burst of tracking jitter does not count as a repetition. */
  minMoveMs: number;
  /** Back within this many degrees of rest (or `restFraction` of the excursion, whichever is larger) ends it. */
  exitDeg: number;
  restFraction: number;
  /** Falling this far from the highest angle (or `returnFraction` of the excursion) starts the return. */
  returnFraction: number;
  /** Below this speed (deg/s) a moving joint is holding. */
  holdSpeedDegPerS: number;
  /** Samples within max(plateauBandDeg, plateauBandFraction x excursion) of the top form the hold plateau. */
  plateauBandDeg: number;
  plateauBandFraction: number;
  /** How many resting samples give the start angle (their median). */
  restSamples: number;
  /** How quickly the resting angle follows slow drift, per sample (exponential weight). */
  restDriftWeight: number;
}

// Hysteresis with an enter threshold about twice the exit one is the usual way to keep a noisy signal from
// chattering across a single threshold [common practice]; the values were tuned on the synthetic hand with 2 mm noise.
export const DEFAULT_REP_PARAMS: RepParams = {
  enterDeg: 6,
  minMoveMs: 100,
  exitDeg: 3,
  restFraction: 0.3,
  returnFraction: 0.25,
  holdSpeedDegPerS: 20,
  plateauBandDeg: 4,
  plateauBandFraction: 0.08,
  restSamples: 15,
  restDriftWeight: 0.05,
};

export interface Repetition {
  index: number;
  /** False when the capture ended before the joint came back to rest. */
  complete: boolean;
  startMs: number;
  endMs: number;
  startDeg: number;
  /** Median of the raw angles on the hold plateau: a held peak, not the single noisiest frame. */
  peakDeg: number;
  arcDeg: number;
  timeToPeakMs: number;
  holdMs: number;
  plane: PlaneReading | null;
}

function median(values: number[]): number {
  const sorted = values.slice().sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/**
 * Splits a stream of angles into repetitions (rest, move, hold, return). Fed one usable frame at a time by the live
 * pipeline; the whole-capture analyzer feeds the same object, so both report the same repetitions.
 */
export class RepSegmenter {
  private readonly p: RepParams;
  private phaseNow: RepPhase = "rest";
  private restLevel = Number.NaN;
  private readonly restRing: number[] = [];
  private restRingNext = 0;
  private candidateSinceMs = Number.NaN;
  private repStartMs = 0;
  private repStartDeg = 0;
  private topSmoothed = Number.NEGATIVE_INFINITY;
  private samplesT: number[] = [];
  private samplesRaw: number[] = [];
  private samplesSmooth: number[] = [];
  private plane = new PlaneAccumulator();
  private readonly done: Repetition[] = [];
  private readonly donePlane = new PlaneAccumulator();

  constructor(params: Partial<RepParams> = {}) {
    this.p = { ...DEFAULT_REP_PARAMS, ...params };
  }

  get phase(): RepPhase {
    return this.phaseNow;
  }

  get completed(): readonly Repetition[] {
    return this.done;
  }

  /** Highest smoothed angle of the repetition under way, or null at rest. */
  get currentTopDeg(): number | null {
    return this.phaseNow === "rest" ? null : this.topSmoothed;
  }

  /**
   * One usable sample: time (ms), raw and smoothed angle, smoothed speed (deg/s), and the plane reading of the frame.
   */
  push(tMs: number, rawDeg: number, smoothedDeg: number, speedDegPerS: number, axisDeg: number, travelAlongGravity: number): RepPhase {
    const p = this.p;
    if (Number.isNaN(this.restLevel)) this.restLevel = smoothedDeg;

    if (this.phaseNow === "rest") {
      if (smoothedDeg - this.restLevel > p.enterDeg) {
        if (Number.isNaN(this.candidateSinceMs)) this.beginCandidate(tMs);
        this.record(tMs, rawDeg, smoothedDeg, axisDeg, travelAlongGravity);
        if (tMs - this.candidateSinceMs >= p.minMoveMs) this.phaseNow = "move";
        return this.phaseNow;
      }
      if (!Number.isNaN(this.candidateSinceMs)) this.dropCandidate();
      this.restLevel += p.restDriftWeight * (smoothedDeg - this.restLevel);
      this.remember(rawDeg);
      return this.phaseNow;
    }

    this.record(tMs, rawDeg, smoothedDeg, axisDeg, travelAlongGravity);
    const excursion = this.topSmoothed - this.restLevel;
    if (this.phaseNow === "return") {
      if (smoothedDeg - this.restLevel < Math.max(p.exitDeg, p.restFraction * excursion)) this.close(tMs, true, smoothedDeg);
      return this.phaseNow;
    }
    if (smoothedDeg < this.topSmoothed - Math.max(p.enterDeg, p.returnFraction * excursion)) {
      this.phaseNow = "return";
    } else {
      this.phaseNow = Math.abs(speedDegPerS) < p.holdSpeedDegPerS ? "hold" : "move";
    }
    return this.phaseNow;
  }

  /** The repetitions so far, with the one under way (if it has left rest) closed as incomplete; changes nothing. */
  snapshot(): Repetition[] {
    if (this.phaseNow === "rest" || this.samplesT.length === 0) return this.done.slice();
    const open = this.build(false, this.samplesT[this.samplesT.length - 1]);
    return [...this.done, open];
  }

  /** Plane readings over the outward part of every repetition so far, the open one included (frame-weighted). */
  outwardPlane(): PlaneAccumulator {
    const all = new PlaneAccumulator();
    all.merge(this.donePlane);
    if (this.phaseNow !== "rest") all.merge(this.plane);
    return all;
  }

  private beginCandidate(tMs: number): void {
    this.candidateSinceMs = tMs;
    this.repStartMs = tMs;
    this.repStartDeg = this.restRing.length ? median(this.restRing) : this.restLevel;
    this.topSmoothed = Number.NEGATIVE_INFINITY;
    this.samplesT = [];
    this.samplesRaw = [];
    this.samplesSmooth = [];
    this.plane = new PlaneAccumulator();
  }

  private dropCandidate(): void {
    this.candidateSinceMs = Number.NaN;
    this.samplesT = [];
    this.samplesRaw = [];
    this.samplesSmooth = [];
  }

  private remember(rawDeg: number): void {
    if (this.restRing.length < this.p.restSamples) this.restRing.push(rawDeg);
    else this.restRing[this.restRingNext] = rawDeg;
    this.restRingNext = (this.restRingNext + 1) % this.p.restSamples;
  }

  private record(tMs: number, rawDeg: number, smoothedDeg: number, axisDeg: number, travel: number): void {
    this.samplesT.push(tMs);
    this.samplesRaw.push(rawDeg);
    this.samplesSmooth.push(smoothedDeg);
    if (smoothedDeg > this.topSmoothed) this.topSmoothed = smoothedDeg;
    // Only the outward part of the movement says which way the part works against gravity.
    if (this.phaseNow !== "return") this.plane.add(axisDeg, travel);
  }

  private build(complete: boolean, endMs: number): Repetition {
    const p = this.p;
    const excursion = this.topSmoothed - this.restLevel;
    const floor = this.topSmoothed - Math.max(p.plateauBandDeg, p.plateauBandFraction * excursion);
    const plateau: number[] = [];
    let firstMs = Number.NaN;
    let lastMs = Number.NaN;
    for (let i = 0; i < this.samplesT.length; i++) {
      if (this.samplesSmooth[i] < floor) continue;
      plateau.push(this.samplesRaw[i]);
      if (Number.isNaN(firstMs)) firstMs = this.samplesT[i];
      lastMs = this.samplesT[i];
    }
    const peakDeg = median(plateau);
    return {
      index: this.done.length,
      complete,
      startMs: this.repStartMs,
      endMs,
      startDeg: this.repStartDeg,
      peakDeg,
      arcDeg: peakDeg - this.repStartDeg,
      timeToPeakMs: firstMs - this.repStartMs,
      holdMs: lastMs - firstMs,
      plane: this.plane.result(),
    };
  }

  private close(tMs: number, complete: boolean, smoothedDeg: number): void {
    this.done.push(this.build(complete, tMs));
    this.donePlane.merge(this.plane);
    this.phaseNow = "rest";
    this.candidateSinceMs = Number.NaN;
    this.restLevel = smoothedDeg;
    this.restRing.length = 0;
    this.restRingNext = 0;
    this.samplesT = [];
    this.samplesRaw = [];
    this.samplesSmooth = [];
  }
}
