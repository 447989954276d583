import { PlaneAccumulator, type PlaneReading } from "./plane";

export type RepPhase = "rest" | "move" | "hold" | "return";

export interface RepParams {
  /** Rise above the resting angle that starts a repetition. */
  enterDeg: number;
  /**
   * The enter threshold also grows with the jitter of the resting angle: at least this many times its estimated
   * standard deviation per sample, so noisy tracking of a short bone does not start repetitions by itself.
   */
  enterNoiseFactor: number;
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
  /**
   * How many of the latest resting samples give the start angle (their trimmed mean), at 30 frames a second; at a
   * lower frame rate the same span of time (fewer samples, at least MIN_REST_WINDOW).
   */
  restSamples: number;
  /**
   * How quickly the resting angle follows slow upward drift, per sample at 30 frames a second (exponential weight); at
   * other frame rates the weight giving the same time constant.
   */
  restDriftWeight: number;
  /** How quickly it follows the angle settling lower, per sample at 30 frames a second (likewise). */
  restSettleWeight: number;
}

// Hysteresis with an enter threshold about twice the exit one is the usual way to keep a noisy signal from
// chattering across a single threshold [common practice]; the values were tuned on the synthetic hand with 2 mm noise.
export const DEFAULT_REP_PARAMS: RepParams = {
  enterDeg: 6,
  enterNoiseFactor: 1.5,
  minMoveMs: 150,
  exitDeg: 3,
  restFraction: 0.2,
  returnFraction: 0.25,
  holdSpeedDegPerS: 20,
  plateauBandDeg: 4,
  plateauBandFraction: 0.08,
  restSamples: 20,
  restDriftWeight: 0.01,
  restSettleWeight: 0.1,
};

const JITTER_SAMPLES = 45;
/** The frame spacing the per-sample settings (`restSamples`, the rest weights) were set at: 30 frames a second. */
const REFERENCE_GAP_MS = 1000 / 30;
/** Fewest resting samples the start angle is taken from, however low the frame rate. */
const MIN_REST_WINDOW = 5;
/**
 * Resting samples needed before the first repetition may start: as many as the capture's frames in a third of a
 * second (10 at 30 fps), between 3 and 10. Counted from the frame rate, not fixed: 10 samples spanned a whole second
 * at 10 fps, so a client who began to move 0.3 s into the recording had the start of the bend taken as rest (start
 * 12°, arc 48° of a 60° movement; a unit test holds it). Not from the time since the first usable sample either: where
 * the tracker finds the hand in only a few early frames, that let a handful of them set the resting angle (tried;
 * held-out clips read worse).
 */
const MIN_REST_MS = 1000 / 3;
const MIN_REST_SAMPLES = { least: 3, most: 10 } as const;
/** Frame spacings kept to judge the frame rate: the first second at 30 fps. */
const FRAME_GAPS_KEPT = 30;
/**
 * The running mean that finds the hold plateau spans half a second. In time, not in samples: a fixed 15 samples (half a
 * second at 30 fps) spanned 1.5 s at 10 fps and smeared the top of a bend, so peaks read 3-13° low on held-out clips
 * read at 10 frames a second (scripts/accuracy/README.md, "Two hand models on one clip").
 */
const PLATEAU_WINDOW_MS = 500;

/** Samples in PLATEAU_WINDOW_MS at the repetition's median frame spacing (at least one). */
function plateauWindow(times: readonly number[]): number {
  const gaps: number[] = [];
  for (let i = 1; i < times.length; i++) if (times[i] > times[i - 1]) gaps.push(times[i] - times[i - 1]);
  return gaps.length ? Math.max(1, Math.round(PLATEAU_WINDOW_MS / median(gaps))) : 1;
}

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

/** The middle value (the mean of the two middle ones for an even count); NaN for none. */
export function median(values: readonly number[]): number {
  const sorted = values.slice().sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/** First and last index whose value reaches `floor` (the whole range if none does). */
function spanAtLeast(values: number[], floor: number): [number, number] {
  let first = -1;
  let last = -1;
  for (let i = 0; i < values.length; i++) {
    if (values[i] < floor) continue;
    if (first < 0) first = i;
    last = i;
  }
  return first < 0 ? [0, values.length - 1] : [first, last];
}

/** Centred running mean; the window shrinks at the ends. Low-score frames are already gated out upstream. */
function runningMean(values: number[], window: number): number[] {
  const half = window >> 1;
  const out = new Array<number>(values.length);
  for (let i = 0; i < values.length; i++) {
    const lo = Math.max(0, i - half);
    const hi = Math.min(values.length, i + half + 1);
    let sum = 0;
    for (let j = lo; j < hi; j++) sum += values[j];
    out[i] = sum / (hi - lo);
  }
  return out;
}

/** Jitter per sample from successive differences of a moving signal (see `restJitterDeg`); motion adds a little. */
function successiveJitter(values: number[]): number {
  if (values.length < 3) return 0;
  const jumps: number[] = [];
  for (let i = 1; i < values.length; i++) jumps.push(Math.abs(values[i] - values[i - 1]));
  return median(jumps) / 0.954;
}

/**
 * Mean of the middle 60% of the values: nearly as steady as the mean under Gaussian jitter and, like the median,
 * unmoved by a few wild frames [common practice: the 20% trimmed mean of robust statistics].
 */
function trimmedMean(values: number[]): number {
  const sorted = values.slice().sort((a, b) => a - b);
  const cut = Math.floor(sorted.length * 0.2);
  const kept = sorted.length - 2 * cut;
  let sum = 0;
  for (let i = cut; i < sorted.length - cut; i++) sum += sorted[i];
  return sum / kept;
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
  private readonly jitterRing: number[] = [];
  private jitterRingNext = 0;
  private lastRestRaw = Number.NaN;
  private readonly frameGaps: number[] = [];
  private lastFrameMs = Number.NaN;
  private gapMsCache = Number.NaN;
  private candidateSinceMs = Number.NaN;
  private repStartMs = 0;
  private repStartDeg = 0;
  private topSmoothed = Number.NEGATIVE_INFINITY;
  private lastSmoothed = Number.NaN;
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
    // Until enough resting samples are in, the resting angle is their median (a single first frame may be noisy)
    // and no repetition can start.
    if (this.phaseNow === "rest" && this.done.length === 0 && this.restRing.length < this.minRestSamples()) {
      this.remember(rawDeg);
      this.restLevel = median(this.restRing);
      return this.phaseNow;
    }

    if (this.phaseNow === "rest") {
      if (smoothedDeg - this.restLevel > p.enterDeg && smoothedDeg - this.restLevel > p.enterNoiseFactor * this.restJitterDeg()) {
        if (Number.isNaN(this.candidateSinceMs)) this.beginCandidate(tMs);
        this.record(tMs, rawDeg, smoothedDeg, axisDeg, travelAlongGravity);
        if (tMs - this.candidateSinceMs >= p.minMoveMs) this.phaseNow = "move";
        return this.phaseNow;
      }
      if (!Number.isNaN(this.candidateSinceMs)) this.dropCandidate();
      // Follow the resting angle down quickly but up slowly: repetitions go up, and a slow start of one must not
      // lift the resting angle along with it.
      const weight = this.perFrame(smoothedDeg < this.restLevel ? p.restSettleWeight : p.restDriftWeight);
      this.restLevel += weight * (smoothedDeg - this.restLevel);
      this.lastSmoothed = smoothedDeg;
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

  /**
   * Notes the time of every frame of the capture, with a usable angle or not, so the segmenter knows the frame rate.
   * Optional: without it the rate is taken as 30 fps.
   */
  frame(tMs: number): void {
    if (this.frameGaps.length < FRAME_GAPS_KEPT && tMs > this.lastFrameMs) {
      this.frameGaps.push(tMs - this.lastFrameMs);
      this.gapMsCache = Number.NaN;
    }
    this.lastFrameMs = tMs;
  }

  /** The capture's median frame spacing so far (30 frames a second until `frame` has been called). */
  private frameGapMs(): number {
    if (this.frameGaps.length === 0) return REFERENCE_GAP_MS;
    if (Number.isNaN(this.gapMsCache)) this.gapMsCache = median(this.frameGaps);
    return this.gapMsCache;
  }

  private minRestSamples(): number {
    if (this.frameGaps.length === 0) return MIN_REST_SAMPLES.most;
    const samples = Math.round(MIN_REST_MS / this.frameGapMs());
    return Math.min(MIN_REST_SAMPLES.most, Math.max(MIN_REST_SAMPLES.least, samples));
  }

  /**
   * A weight set per sample at 30 frames a second, as the weight per sample at this capture's frame rate with the same
   * time constant: 1 - (1 - w)^(gap / 33.3 ms). At 10 frames a second 0.01 becomes 0.030, so the resting angle follows
   * drift over the same seconds instead of three times as many. From the frame rate, not each sample's own gap: a
   * second with the hand lost must not let the first frames back pull the resting angle most of the way up.
   */
  private perFrame(weightAt30: number): number {
    const ratio = this.frameGapMs() / REFERENCE_GAP_MS;
    return ratio === 1 ? weightAt30 : 1 - Math.pow(1 - weightAt30, ratio);
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
    this.repStartDeg = this.restRing.length ? trimmedMean(this.settledRest()) : this.restLevel;
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

  /**
   * Per-sample jitter of the resting angle from successive differences: their median absolute value is 0.954 sigma
   * for Gaussian noise (the difference of two samples has sigma x sqrt 2, and a half-normal's median is 0.6745 sigma),
   * and slow drift barely moves it.
   */
  private restJitterDeg(): number {
    if (this.jitterRing.length < 5) return 0;
    return median(this.jitterRing) / 0.954;
  }

  /**
   * The latest resting samples (`restSamples`' span of time) without the newest quarter: the smoother's lag lets the
   * first frames of a rise in as resting ones, and those would read the start high.
   */
  private settledRest(): number[] {
    const n = this.restRing.length;
    const ordered: number[] = [];
    // The ring's oldest entry sits at restRingNext once it is full.
    for (let i = 0; i < n; i++) ordered.push(this.restRing[(this.restRingNext - n + i + n * 2) % Math.max(n, 1)]);
    const window = Math.round((this.p.restSamples * REFERENCE_GAP_MS) / this.frameGapMs());
    const latest = ordered.slice(-Math.min(n, Math.max(MIN_REST_WINDOW, window)));
    const keep = latest.length - Math.floor(latest.length / 4);
    return latest.slice(0, Math.max(1, keep));
  }

  private remember(rawDeg: number): void {
    if (!Number.isNaN(this.lastRestRaw)) {
      const jump = Math.abs(rawDeg - this.lastRestRaw);
      if (this.jitterRing.length < JITTER_SAMPLES) this.jitterRing.push(jump);
      else this.jitterRing[this.jitterRingNext] = jump;
      this.jitterRingNext = (this.jitterRingNext + 1) % JITTER_SAMPLES;
    }
    this.lastRestRaw = rawDeg;
    if (this.restRing.length < this.p.restSamples) this.restRing.push(rawDeg);
    else this.restRing[this.restRingNext] = rawDeg;
    this.restRingNext = (this.restRingNext + 1) % this.p.restSamples;
  }

  private record(tMs: number, rawDeg: number, smoothedDeg: number, axisDeg: number, travel: number): void {
    this.samplesT.push(tMs);
    this.samplesRaw.push(rawDeg);
    this.samplesSmooth.push(smoothedDeg);
    // Only the outward arc says which way the part works against gravity, each frame weighted by how far the angle
    // rose: an integral over the arc, so a long hold at the top does not outvote the movement itself.
    const rise = smoothedDeg - this.lastSmoothed;
    if (this.phaseNow !== "return" && rise > 0 && !Number.isNaN(this.lastSmoothed)) this.plane.add(axisDeg, travel, rise);
    this.lastSmoothed = smoothedDeg;
    if (smoothedDeg > this.topSmoothed) this.topSmoothed = smoothedDeg;
  }

  private build(complete: boolean, endMs: number): Repetition {
    const p = this.p;
    const excursion = this.topSmoothed - this.restLevel;
    // The plateau is found on a centred running mean of the raw angle (zero lag, unlike the live smoother), with a
    // band wide enough for the jitter left in that mean; the peak is then the trimmed mean of every raw sample from
    // the plateau's first to its last frame. Choosing samples by how high they read would pick the ones noise pushed
    // up and read the peak high.
    const raw = this.samplesRaw;
    const window = plateauWindow(this.samplesT);
    const rolling = runningMean(raw, window);
    let top = Number.NEGATIVE_INFINITY;
    for (const v of rolling) if (v > top) top = v;
    const jitter = this.restJitterDeg() || successiveJitter(raw);
    const rollingJitter = jitter / Math.sqrt(window);
    const band = Math.max(p.plateauBandDeg, p.plateauBandFraction * excursion, 2.5 * rollingJitter);
    // The top of the running mean is itself lifted by noise; re-centre the band on the plateau's level a few times so
    // the span widens to the whole hold instead of the stretch that noise happened to push up.
    let level = top;
    let span: [number, number] = [0, raw.length - 1];
    for (let pass = 0; pass < 3; pass++) {
      span = spanAtLeast(rolling, Math.min(level, top) - band);
      level = trimmedMean(raw.slice(span[0], span[1] + 1));
    }
    const [first, last] = span;
    const peakDeg = level;
    const firstMs = this.samplesT[first];
    const lastMs = this.samplesT[last];
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
    this.lastRestRaw = Number.NaN;
    this.samplesT = [];
    this.samplesRaw = [];
    this.samplesSmooth = [];
  }
}
