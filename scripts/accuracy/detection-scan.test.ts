import Color from "color";
import { describe, expect, it } from "vitest";
import { contrastRatio, handContrast, summarizeScan } from "./detection-scan";

describe("contrastRatio", () => {
  // WCAG 2.1, "contrast ratio": (L1 + 0.05) / (L2 + 0.05) with L1 the lighter relative luminance; white on black is 21:1.
  it("gives WCAG's 21:1 for white on black and 1:1 for a colour on itself, either order", () => {
    expect(contrastRatio(1, 0)).toBeCloseTo(21, 9);
    expect(contrastRatio(0, 1)).toBeCloseTo(21, 9);
    expect(contrastRatio(0.3, 0.3)).toBe(1);
  });
  it("gives 4.48:1 for #777777 on white, the grey commonly quoted as just under WCAG's 4.5:1 [from memory]", () => {
    expect(contrastRatio(Color("#777777").luminosity(), Color("#ffffff").luminosity())).toBeCloseTo(4.48, 2);
  });
});

/** A 100x100 RGB24 picture of `background` with a filled rectangle of `skin` from (20, 20) to (60, 80). */
function picture(skin: [number, number, number], background: [number, number, number]): Uint8Array {
  const rgb = new Uint8Array(100 * 100 * 3);
  for (let y = 0; y < 100; y++) {
    for (let x = 0; x < 100; x++) {
      const c = x >= 20 && x <= 60 && y >= 20 && y <= 80 ? skin : background;
      rgb.set(c, (y * 100 + x) * 3);
    }
  }
  return rgb;
}

/** 21 landmarks inside the rectangle: wrist at the bottom, four fingers toward the top. */
const LANDMARKS: number[][] = Array.from({ length: 21 }, (_, i) => (i === 0 ? [40, 78] : [22 + ((i - 1) % 5) * 9, 75 - Math.floor((i - 1) / 5) * 13]));

describe("handContrast", () => {
  it("reads the skin on the hand's bones and the background around its box", () => {
    const { skin, background, ratio } = handContrast(picture([0, 0, 0], [255, 255, 255]), 100, 100, LANDMARKS);
    expect(skin).toBeCloseTo(0, 9);
    expect(background).toBeCloseTo(1, 9);
    expect(ratio).toBeCloseTo(21, 9);
  });
  it("is 1 where hand and background are one colour", () => {
    expect(handContrast(picture([200, 150, 120], [200, 150, 120]), 100, 100, LANDMARKS).ratio).toBeCloseTo(1, 9);
  });
  it("names what it expected of bad input", () => {
    expect(() => handContrast(picture([0, 0, 0], [1, 1, 1]), 100, 100, LANDMARKS.slice(1))).toThrow(/landmarksPx: expected 21 landmarks, got 20/);
    expect(() => handContrast(new Uint8Array(10), 100, 100, LANDMARKS)).toThrow(/rgb: expected 30000 bytes/);
  });
});

describe("summarizeScan", () => {
  it("counts clips per band, those neither model found, and the mean share each found", () => {
    const clips = [
      { name: "a", span: 0.45, ratio: 2, lite: 1, full: 0.5, either: 1 },
      { name: "b", span: 0.48, ratio: 2, lite: 0, full: 0, either: 0 },
      { name: "c", span: 0.75, ratio: 2, lite: 0.5, full: null, either: null },
    ];
    const lines = summarizeScan(clips, "span", [0, 0.4, 0.5, 0.7]);
    expect(lines).toHaveLength(3);
    expect(lines[2]).toBe("| 0.4-0.5 | 2 | 1 | 50% | 25% | 50% |");
  });
});
