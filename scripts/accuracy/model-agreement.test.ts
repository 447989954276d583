import { describe, expect, it } from "vitest";
import { agreementRow } from "./model-agreement";

describe("a reading's row", () => {
  it("reports detection, MAE, the share inside the stated interval and the worst peak error", () => {
    const reading = {
      samples: [
        { truthDeg: 0, estimateDeg: 2 },
        { truthDeg: 40, estimateDeg: 36 },
        { truthDeg: 80, estimateDeg: 50 },
        { truthDeg: 40, estimateDeg: null },
      ],
      uncertaintiesDeg: [5, 5, 10, null],
      truthPeakDeg: 80,
      peakDeg: 52,
      peakUncertaintyDeg: 10,
    };
    const row = agreementRow("lite", [reading, { ...reading, peakDeg: 84 }]);
    expect(row.detected).toBeCloseTo(0.75, 12);
    expect(row.maeDeg).toBeCloseTo((2 + 4 + 30) / 3, 9);
    // Errors 2 and 4 lie inside ± 5, 30 does not inside ± 10.
    expect(row.within).toBeCloseTo(2 / 3, 9);
    expect(row.peakMaeDeg).toBeCloseTo((28 + 4) / 2, 9);
    expect(row.worstPeakErrorDeg).toBe(-28);
    // Peak errors -28 (outside ± 10) and +4 (inside).
    expect(row.peakWithin).toBeCloseTo(0.5, 12);
  });
});
