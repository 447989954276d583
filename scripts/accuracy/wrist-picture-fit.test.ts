import { describe, expect, it } from "vitest";
import GAIN_FILE from "@/vision/wrist-picture-gain.json";
import { fitPictureGain } from "./wrist-picture-fit";

describe("the picture-read wrist's gain", () => {
  it("inverts a calibration line: reading = a + b * truth gives gain 1 / b (ISO 11095:1996, linear calibration used inversely)", () => {
    // A reader that over-reads by 8% with a 0.5° offset and ±1° of alternating noise, over -60..80°.
    const samples = Array.from({ length: 141 }, (_, i) => {
      const truthDeg = -60 + i;
      return { truthDeg, readingDeg: 0.5 + 1.08 * truthDeg + (i % 2 === 0 ? 1 : -1) };
    });
    const fit = fitPictureGain(samples)!;
    expect(fit.slope).toBeCloseTo(1.08, 2);
    expect(fit.interceptDeg).toBeCloseTo(0.5, 0);
    expect(fit.gain).toBeCloseTo(1 / 1.08, 3);
    expect(fit.frames).toBe(141);
    // Scaled by the gain, the readings' slope on the truth is 1.
    const scaled = fitPictureGain(samples.map((s) => ({ truthDeg: s.truthDeg, readingDeg: s.readingDeg * fit.gain })))!;
    expect(scaled.slope).toBeCloseTo(1, 3);
  });

  it("gives no gain where the truth does not vary or the reading runs backwards", () => {
    expect(fitPictureGain([{ truthDeg: 10, readingDeg: 11 }, { truthDeg: 10, readingDeg: 12 }])).toBeNull();
    expect(fitPictureGain([{ truthDeg: 0, readingDeg: 5 }, { truthDeg: 10, readingDeg: -5 }])).toBeNull();
  });

  it("the committed gains were fitted on training seeds only, and each undoes an over-read of under 15%", () => {
    expect(GAIN_FILE.fittedOn.seeds.length).toBeGreaterThan(0);
    for (const seed of GAIN_FILE.fittedOn.seeds) expect(String(seed)).toMatch(/^77000\d{3}$/);
    const fits = Object.values(GAIN_FILE.gains as Record<string, { gain: number; frames: number }>);
    expect(Object.keys(GAIN_FILE.gains).sort()).toEqual(["full", "lite"]);
    for (const fit of fits) {
      expect(fit.gain).toBeGreaterThan(0.85);
      expect(fit.gain).toBeLessThan(1);
      expect(fit.frames).toBeGreaterThan(1000);
    }
  });
});
