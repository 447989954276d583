import { describe, expect, it } from "vitest";
import { OneEuroFilter } from "./one-euro";
import { RepSegmenter } from "./reps";

// Hand-built angle signals (no hand model): a trapezoid movement sampled at 30 Hz, to check the hysteresis and the
// hold-plateau peak on their own.

function feed(signal: (tMs: number) => number, durationMs: number, segmenter = new RepSegmenter(), fps = 30) {
  const filter = new OneEuroFilter();
  for (let t = 0; t <= durationMs; t += 1000 / fps) {
    const raw = signal(t);
    const smoothed = filter.filter(raw, t / 1000);
    // As the pipeline does: every frame's time, then the usable sample.
    segmenter.frame(t);
    segmenter.push(t, raw, smoothed, filter.speed, 90, -1);
  }
  return segmenter;
}

/** Rest at 0, rise to `peak` over 0.5 s, hold 1 s, back over 0.5 s, rest; one every 3 s starting at 1 s. */
function trapezoid(peak: number, count: number) {
  return (t: number) => {
    const k = Math.floor((t - 1000) / 3000);
    if (t < 1000 || k >= count) return 0;
    const x = (t - 1000) % 3000;
    if (x < 500) return (peak * x) / 500;
    if (x < 1500) return peak;
    if (x < 2000) return peak * (1 - (x - 1500) / 500);
    return 0;
  };
}

describe("repetition segmentation", () => {
  it("counts each rise-hold-return once and reads the held peak", () => {
    const reps = feed(trapezoid(60, 4), 14_000).snapshot();
    expect(reps).toHaveLength(4);
    for (const rep of reps) {
      expect(rep.complete).toBe(true);
      expect(rep.peakDeg).toBeCloseTo(60, 6);
      expect(rep.startDeg).toBeCloseTo(0, 6);
      // The plateau is found on a half-second running mean, which rounds off about a tenth of a second at each edge.
      expect(rep.holdMs).toBeGreaterThan(800);
      expect(rep.holdMs).toBeLessThanOrEqual(1000);
    }
  });

  it("reads the same peak whatever the frame rate: the plateau is found over half a second, not a count of frames", () => {
    // A bend with no hold, as in the rendered clips: rest, then a raised cosine up to 70° and back over 2 s, twice.
    const bend = (t: number) => {
      const x = (t - 1000) % 3000;
      return t < 1000 || t >= 7000 || x >= 2000 ? 0 : 35 * (1 - Math.cos((Math.PI * x) / 1000));
    };
    const peaks = [30, 20, 15, 10].map((fps) => feed(bend, 8000, new RepSegmenter(), fps).snapshot());
    for (const reps of peaks) expect(reps).toHaveLength(2);
    const at30 = peaks[0][0].peakDeg;
    // Half a second around the top of this cosine averages to about 62° (the plateau mean's own rounding of a bend).
    expect(at30).toBeGreaterThan(60);
    for (const reps of peaks) for (const r of reps) expect(Math.abs(r.peakDeg - at30)).toBeLessThan(2);
  });

  it("a movement that begins soon after recording starts keeps its start angle at any frame rate", () => {
    // Rest for 0.3 s only, then three 60° trapezoids (0.5 s up, 1 s hold, 0.5 s down, 1 s rest).
    const early = (t: number) => {
      const x = (t - 300) % 3000;
      if (t < 300 || t >= 9300) return 0;
      return x < 500 ? (60 * x) / 500 : x < 1500 ? 60 : x < 2000 ? 60 * (1 - (x - 1500) / 500) : 0;
    };
    for (const fps of [30, 15, 10]) {
      const reps = feed(early, 10_000, new RepSegmenter(), fps).snapshot();
      expect(reps).toHaveLength(3);
      expect(Math.abs(reps[0].startDeg)).toBeLessThan(1);
      expect(reps[0].arcDeg).toBeCloseTo(60, 0);
    }
  });

  it("the resting angle follows slow drift over the same seconds at any frame rate, so drift starts no repetition", () => {
    // Still for 1 s, then a slow creep of 1.5 deg/s for 8 s (a hand relaxing into flexion): no repetition at any rate.
    // Per sample, the drift weight's time constant stretched from 3.3 s at 30 fps to 10 s at 10 fps, and the resting
    // angle lagged the creep by more than the enter threshold.
    const creep = (t: number) => (t < 1000 ? 0 : (1.5 * (t - 1000)) / 1000);
    for (const fps of [30, 15, 10]) expect(feed(creep, 9000, new RepSegmenter(), fps).snapshot()).toHaveLength(0);
  });

  it("a client who settles lower just before the bend starts from where they settled, at any frame rate", () => {
    // Resting at 10 deg for 2 s, settling to 0 over 0.2 s, still for 0.8 s, then a 60 deg trapezoid. The start angle
    // comes from the last two thirds of a second of rest; a count of 20 samples reached back 2 s at 10 fps and read the
    // start 7.2 deg, the arc 52.8 deg.
    const settle = (t: number) => {
      if (t < 2000) return 10;
      if (t < 2200) return 10 * (1 - (t - 2000) / 200);
      const x = t - 3000;
      return x < 0 ? 0 : x < 500 ? (60 * x) / 500 : x < 1500 ? 60 : x < 2000 ? 60 * (1 - (x - 1500) / 500) : 0;
    };
    for (const fps of [30, 15, 10]) {
      const reps = feed(settle, 7000, new RepSegmenter(), fps).snapshot();
      expect(reps).toHaveLength(1);
      expect(Math.abs(reps[0].startDeg)).toBeLessThan(1);
      expect(reps[0].arcDeg).toBeCloseTo(60, 0);
    }
  });

  it("does not chatter: a signal wobbling around the enter threshold gives no repetition", () => {
    // 6 deg is the default enter threshold; +/- 2 deg of wobble around 5 deg must not cross in and out repeatedly.
    const reps = feed((t) => 5 + 2 * Math.sin(t / 50), 10_000).snapshot();
    expect(reps).toHaveLength(0);
  });

  it("a single wild frame on the hold neither splits the repetition nor sets its peak", () => {
    const base = trapezoid(50, 1);
    const reps = feed((t) => (Math.abs(t - 2000) < 20 ? 120 : base(t)), 5000).snapshot();
    expect(reps).toHaveLength(1);
    expect(reps[0].peakDeg).toBeCloseTo(50, 0);
  });

  it("a movement smaller than the enter threshold is no repetition; a brief blip shorter than the debounce neither", () => {
    expect(feed(trapezoid(4, 2), 8000).snapshot()).toHaveLength(0);
    expect(feed((t) => (t > 2000 && t < 2060 ? 30 : 0), 4000).snapshot()).toHaveLength(0);
  });
});
