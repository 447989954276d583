/**
 * Decides which camera frames to process. At most one frame is in flight, so a slow frame makes later ones wait
 * rather than queue up; and the spacing between processed frames grows when frames are costly, so detection on the
 * main thread (the fallback) leaves the page time to draw and respond.
 */
export interface FrameGovernorOptions {
  maxFps: number;
  /** Share of wall time detection may take: 1 in a worker (it has its own thread), less on the main thread. */
  maxBusyShare: number;
}

// The rate cap is a budget of frames that refills at the capped rate, rather than a minimum gap between two frames:
// browsers deliver video frames at uneven spacing (and not always at the camera's rate), and a per-gap rule would drop
// every frame that came a little early, halving the rate. A worker may catch up by a frame; the main thread may not,
// so two costly detections never run back to back there.
const WORKER_BURST_FRAMES = 2;
const MAIN_THREAD_BURST_FRAMES = 1;
// Weight of the newest frame in the running cost average: reacts within a few frames, ignores one slow frame.
const COST_SMOOTHING = 0.2;

export class FrameGovernor {
  private readonly minIntervalMs: number;
  private readonly maxBusyShare: number;
  private readonly burstFrames: number;
  private credit: number;
  private lastRefillMs: number | null = null;
  private inFlight = false;
  private costMs: number | null = null;
  intervalMs: number;
  processed = 0;
  skipped = 0;

  constructor({ maxFps, maxBusyShare }: FrameGovernorOptions) {
    if (!(maxFps > 0)) throw new Error(`maxFps: expected a positive number, got ${maxFps}`);
    if (!(maxBusyShare > 0 && maxBusyShare <= 1)) throw new Error(`maxBusyShare: expected a number in (0, 1], got ${maxBusyShare}`);
    this.minIntervalMs = 1000 / maxFps;
    this.maxBusyShare = maxBusyShare;
    this.intervalMs = this.minIntervalMs;
    this.burstFrames = maxBusyShare < 1 ? MAIN_THREAD_BURST_FRAMES : WORKER_BURST_FRAMES;
    this.credit = this.burstFrames;
  }

  get busy(): boolean {
    return this.inFlight;
  }

  /** Call for every frame that arrives; true means process it now (and call `end` when done). */
  tryBegin(nowMs: number): boolean {
    if (this.lastRefillMs !== null) {
      this.credit = Math.min(this.burstFrames, this.credit + Math.max(0, nowMs - this.lastRefillMs) / this.intervalMs);
    }
    this.lastRefillMs = nowMs;
    if (this.inFlight || this.credit < 1) {
      this.skipped++;
      return false;
    }
    this.credit -= 1;
    this.inFlight = true;
    return true;
  }

  /** `busyMs` is the time the processing thread was occupied by this frame. */
  end(busyMs: number): void {
    this.inFlight = false;
    this.processed++;
    this.costMs = this.costMs === null ? busyMs : this.costMs + COST_SMOOTHING * (busyMs - this.costMs);
    // With a thread of its own, the one-frame-in-flight rule already paces detection; spacing by cost as well would
    // drop every other camera frame as soon as a frame costs a little more than the camera's period.
    this.intervalMs = this.maxBusyShare < 1 ? Math.max(this.minIntervalMs, this.costMs / this.maxBusyShare) : this.minIntervalMs;
  }

  /** A frame that failed or was abandoned frees the slot without counting as processed. */
  abandon(): void {
    this.inFlight = false;
  }
}
