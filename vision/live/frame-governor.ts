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

// Camera frames arrive with jitter around their nominal spacing; without slack a 30 fps camera capped at 30 fps
// would lose every frame that came a millisecond early.
const ARRIVAL_SLACK = 0.85;
// Weight of the newest frame in the running cost average: reacts within a few frames, ignores one slow frame.
const COST_SMOOTHING = 0.2;

export class FrameGovernor {
  private readonly minIntervalMs: number;
  private readonly maxBusyShare: number;
  private lastStartMs = -Infinity;
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
  }

  get busy(): boolean {
    return this.inFlight;
  }

  /** Call for every frame that arrives; true means process it now (and call `end` when done). */
  tryBegin(nowMs: number): boolean {
    if (this.inFlight || nowMs - this.lastStartMs < this.intervalMs * ARRIVAL_SLACK) {
      this.skipped++;
      return false;
    }
    this.inFlight = true;
    this.lastStartMs = nowMs;
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
