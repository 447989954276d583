import { describe, expect, it } from "vitest";
import { MIN_PAIRED_FPS, PAIRED_WINDOW_MS, pairingTooSlow } from "./pairing";

/** Arrival times of frames at `fps` over the `ms` before `now`. */
function before(now: number, fps: number, ms = PAIRED_WINDOW_MS): number[] {
  const count = Math.round((fps * ms) / 1000);
  return Array.from({ length: count }, (_, i) => now - ms + ((i + 0.5) * ms) / count);
}

describe("when reading with both models is too slow", () => {
  const now = 20_000;
  const long = now - 10_000;

  it("judges the frame rate over the last few seconds", () => {
    expect(pairingTooSlow(before(now, MIN_PAIRED_FPS - 1), now, long)).toBe(true);
    expect(pairingTooSlow(before(now, MIN_PAIRED_FPS), now, long)).toBe(false);
    expect(pairingTooSlow(before(now, 20), now, long)).toBe(false);
    // Frames from before the window do not count.
    expect(pairingTooSlow([...before(now - PAIRED_WINDOW_MS, 30), ...before(now, 3)], now, long)).toBe(true);
  });

  it("one slow second inside a good stretch is not enough", () => {
    // Two seconds at 12 frames a second, then one at 2.
    const frames = [...before(now - 1000, 12, 2000), ...before(now, 2, 1000)];
    expect(pairingTooSlow(frames, now, long)).toBe(false);
  });

  it("does not judge the first moments, which carry the second model's start-up", () => {
    expect(pairingTooSlow([], now, now - PAIRED_WINDOW_MS + 1)).toBe(false);
    expect(pairingTooSlow([], now, now - PAIRED_WINDOW_MS)).toBe(true);
  });
});
