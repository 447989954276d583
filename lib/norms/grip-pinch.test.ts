import { describe, expect, it } from "vitest";
import { ageInYears, compareWithNorm, findNorm, GRIP_NORMS_LB, KG_PER_LB } from "./grip-pinch";

// The published table, typed here independently of the code's table, row by row as printed:
// Mathiowetz et al., Grip and pinch strength: normative data for adults, Arch Phys Med Rehabil 1985;66:69-74,
// grip in pounds, mean (SD). Rows 20-24, 40-44, 60-64 and 75+ are confirmed in shared/notes/clinical-references.md [P];
// the other rows are as reproduced from the paper in the Baseline dynamometer manual's "Norms for Adult Grip Strength".
const PUBLISHED_GRIP: [band: string, age: number, menR: string, menL: string, womenR: string, womenL: string][] = [
  ["20-24", 22, "121.0 ± 20.6", "104.5 ± 21.8", "70.4 ± 14.5", "61.0 ± 13.1"],
  ["25-29", 27, "120.8 ± 23.0", "110.5 ± 16.2", "74.5 ± 13.9", "63.5 ± 12.2"],
  ["30-34", 30, "121.8 ± 22.4", "110.4 ± 21.7", "78.7 ± 19.2", "68.0 ± 17.7"],
  ["35-39", 39, "119.7 ± 24.0", "112.9 ± 21.7", "74.1 ± 10.8", "66.3 ± 11.7"],
  ["40-44", 44, "116.8 ± 20.7", "112.8 ± 18.7", "70.4 ± 13.5", "62.3 ± 13.8"],
  ["45-49", 45, "109.9 ± 23.0", "100.8 ± 22.8", "62.2 ± 15.1", "56.0 ± 12.7"],
  ["50-54", 52, "113.6 ± 18.1", "101.9 ± 17.0", "65.8 ± 11.6", "57.3 ± 10.7"],
  ["55-59", 57, "101.1 ± 26.7", "83.2 ± 23.4", "57.3 ± 12.5", "47.3 ± 11.9"],
  ["60-64", 60, "89.7 ± 20.4", "76.8 ± 20.3", "55.1 ± 10.1", "45.7 ± 10.1"],
  ["65-69", 69, "91.1 ± 20.6", "76.8 ± 19.8", "49.6 ± 9.7", "41.0 ± 8.2"],
  ["70-74", 71, "75.3 ± 21.5", "64.8 ± 18.1", "49.6 ± 11.7", "41.5 ± 10.2"],
  ["75+", 91, "65.7 ± 21.0", "55.0 ± 17.0", "42.6 ± 11.0", "37.6 ± 8.9"],
];

const parse = (cell: string) => {
  const [mean, sd] = cell.split("±").map((s) => Number(s.trim()));
  return { meanLb: mean, sdLb: sd };
};

describe("grip norms (Mathiowetz et al. 1985)", () => {
  it("has the published 12 age bands for each sex", () => {
    expect(GRIP_NORMS_LB.male).toHaveLength(PUBLISHED_GRIP.length);
    expect(GRIP_NORMS_LB.female).toHaveLength(PUBLISHED_GRIP.length);
  });

  for (const [band, age, menR, menL, womenR, womenL] of PUBLISHED_GRIP) {
    it(`equals the published row ${band} and finds it for a ${age}-year-old`, () => {
      const dominantHand = "right" as const;
      expect(findNorm({ test: "grip", sex: "male", side: "right", age, dominantHand })).toMatchObject({ ...parse(menR), band });
      expect(findNorm({ test: "grip", sex: "male", side: "left", age, dominantHand })).toMatchObject({ ...parse(menL), band });
      expect(findNorm({ test: "grip", sex: "female", side: "right", age, dominantHand })).toMatchObject({ ...parse(womenR), band });
      expect(findNorm({ test: "grip", sex: "female", side: "left", age, dominantHand })).toMatchObject({ ...parse(womenL), band });
    });
  }

  it("gives no norm under 20 or without a recorded sex, rather than a guess", () => {
    expect(findNorm({ test: "grip", sex: "male", side: "right", age: 19, dominantHand: "right" })).toBeNull();
    expect(findNorm({ test: "grip", sex: "unknown", side: "right", age: 40, dominantHand: "right" })).toBeNull();
  });

  it("has the published tip pinch of the dominant hand for 20-24 and 75+ (men 18.0 ± 3.0, women 9.6 ± 2.8)", () => {
    // Mathiowetz et al. 1985, tip pinch, as confirmed in shared/notes/clinical-references.md [P].
    expect(findNorm({ test: "tip_pinch", sex: "male", side: "left", age: 23, dominantHand: "left" })).toMatchObject({ meanLb: 18.0, sdLb: 3.0 });
    expect(findNorm({ test: "tip_pinch", sex: "female", side: "right", age: 80, dominantHand: "right" })).toMatchObject({ meanLb: 9.6, sdLb: 2.8 });
    expect(findNorm({ test: "tip_pinch", sex: "female", side: "left", age: 80, dominantHand: "right" })).toBeNull();
    expect(findNorm({ test: "tip_pinch", sex: "female", side: "right", age: 50, dominantHand: "right" })).toBeNull();
  });
});

describe("comparison with the norm", () => {
  it("converts kilograms with the international pound (0.45359237 kg, 1959 agreement) and reports percent and z", () => {
    // A woman of 62 whose right grip reads exactly the published mean (55.1 lb) is at 100% and z = 0;
    // one SD below (45.0 lb) is z = -1 and 45.0/55.1 of the norm.
    const q = { test: "grip" as const, sex: "female" as const, side: "right" as const, age: 62, dominantHand: "right" as const };
    const atMean = compareWithNorm(55.1 * KG_PER_LB, q)!;
    expect(atMean.percentOfNorm).toBeCloseTo(100, 6);
    expect(atMean.zScore).toBeCloseTo(0, 6);
    const oneSdBelow = compareWithNorm((55.1 - 10.1) * KG_PER_LB, q)!;
    expect(oneSdBelow.zScore).toBeCloseTo(-1, 6);
    expect(oneSdBelow.percentOfNorm).toBeCloseTo((45.0 / 55.1) * 100, 6);
    // 1 kg is 2.20462 lb [common practice].
    expect(compareWithNorm(1, q)!.readingLb).toBeCloseTo(2.20462, 4);
  });

  it("counts age in whole years, turning a year older on the birthday", () => {
    expect(ageInYears("1960-03-22", "2025-03-21")).toBe(64);
    expect(ageInYears("1960-03-22", "2025-03-22")).toBe(65);
  });
});
