import { describe, expect, it } from "vitest";
import { FrameGovernor } from "./frame-governor";

/**
 * Simulates frames arriving every `period` ms (or cycling through a list of gaps), each costing `costMs` of
 * processing on one thread, driven as the tracker drives the governor: a frame that arrives while another is in
 * flight is taken as soon as that one is done (in a worker), if the rate cap allows.
 */
function simulate(governor: FrameGovernor, cameraFps: number | number[], costMs: number, seconds: number, catchUp = true) {
  const gaps = Array.isArray(cameraFps) ? cameraFps : [1000 / cameraFps];
  let busyUntil = -Infinity;
  let busyMs = 0;
  let missed = false;
  const begin = (at: number) => {
    if (governor.tryBegin(at)) {
      busyUntil = at + costMs;
      busyMs += costMs;
      missed = false;
    } else if (governor.busy) {
      missed = true;
    }
  };
  for (let now = 0, i = 0; now < seconds * 1000; now += gaps[i++ % gaps.length]) {
    while (governor.busy && busyUntil <= now) {
      governor.end(costMs);
      if (catchUp && missed) begin(busyUntil);
      else break;
    }
    begin(now);
  }
  return { busyShare: busyMs / (seconds * 1000) };
}

describe("FrameGovernor", () => {
  it("takes every frame of a 30 fps camera when a frame costs less than the frame period", () => {
    const governor = new FrameGovernor({ maxFps: 30, maxBusyShare: 1 });
    simulate(governor, 30, 20, 10);
    expect(governor.skipped).toBe(0);
    expect(governor.processed).toBeGreaterThanOrEqual(298);
  });

  it("keeps the capped rate when frames arrive unevenly and faster than the cap", () => {
    const governor = new FrameGovernor({ maxFps: 30, maxBusyShare: 1 });
    // Gaps of 17 and 30 ms: about 43 frames a second, as browsers deliver some camera streams.
    simulate(governor, [17, 30], 20, 10);
    expect(governor.processed).toBeGreaterThanOrEqual(280);
    expect(governor.processed).toBeLessThanOrEqual(302);
  });

  it("skips frames while one is in flight instead of queueing them", () => {
    const governor = new FrameGovernor({ maxFps: 30, maxBusyShare: 1 });
    expect(governor.tryBegin(0)).toBe(true);
    expect(governor.tryBegin(34)).toBe(false);
    expect(governor.tryBegin(67)).toBe(false);
    expect(governor.skipped).toBe(2);
    governor.end(70);
    expect(governor.tryBegin(100)).toBe(true);
  });

  it("in a worker, takes the next frame as soon as the previous one is done, whatever it cost", () => {
    const governor = new FrameGovernor({ maxFps: 30, maxBusyShare: 1 });
    expect(governor.tryBegin(0)).toBe(true);
    governor.end(45);
    expect(governor.intervalMs).toBeCloseTo(1000 / 30, 6);
    expect(governor.tryBegin(45)).toBe(true);
  });

  it("caps the frame rate for a faster camera", () => {
    const governor = new FrameGovernor({ maxFps: 15, maxBusyShare: 1 });
    simulate(governor, 60, 5, 10);
    // 15 fps over 10 s, give or take the camera's frame grid.
    expect(governor.processed).toBeGreaterThanOrEqual(140);
    expect(governor.processed).toBeLessThanOrEqual(160);
  });

  it("on the main thread keeps detection to about its share of the time when frames are costly", () => {
    const governor = new FrameGovernor({ maxFps: 30, maxBusyShare: 0.5 });
    const { busyShare } = simulate(governor, 30, 40, 20, false);
    expect(governor.intervalMs).toBeCloseTo(80, 0);
    // The camera's 33 ms grid rounds the 80 ms spacing up to 100 ms: 40 % busy; never above the 50 % share.
    expect(busyShare).toBeLessThanOrEqual(0.5);
    expect(busyShare).toBeGreaterThan(0.3);
  });

  it("names a bad option", () => {
    expect(() => new FrameGovernor({ maxFps: 0, maxBusyShare: 1 })).toThrow(/maxFps: expected a positive number/);
    expect(() => new FrameGovernor({ maxFps: 30, maxBusyShare: 1.5 })).toThrow(/maxBusyShare/);
  });
});
