import type { StrengthTest } from "@/db/schema";
import type { Side } from "@/lib/motions/catalog";

// Grip and pinch norms for adults. Source: Mathiowetz V, Kashman N, Volland G, Weber K, Dowe M, Rogers S. Grip and
// pinch strength: normative data for adults. Arch Phys Med Rehabil 1985;66(2):69-74. Hand-held dynamometer at handle
// position 2 (grip) and a pinch gauge; mean of three trials; seated, shoulder adducted, elbow at 90°, forearm neutral.
// Values are pounds (force), mean and standard deviation, per age band, sex and hand (right/left, not dominant/other).

export const MATHIOWETZ_1985 = "Mathiowetz et al., Arch Phys Med Rehabil 1985;66:69-74";

/** One pound-force in kilograms-force: the international pound, 0.45359237 kg exactly (1959 agreement). */
export const KG_PER_LB = 0.45359237;

export interface NormValue {
  meanLb: number;
  sdLb: number;
}

export interface AgeBand {
  /** Inclusive lower age in whole years. */
  fromAge: number;
  /** Inclusive upper age, or null for the open top band (75+). */
  toAge: number | null;
}

export const AGE_BANDS: readonly AgeBand[] = [
  { fromAge: 20, toAge: 24 },
  { fromAge: 25, toAge: 29 },
  { fromAge: 30, toAge: 34 },
  { fromAge: 35, toAge: 39 },
  { fromAge: 40, toAge: 44 },
  { fromAge: 45, toAge: 49 },
  { fromAge: 50, toAge: 54 },
  { fromAge: 55, toAge: 59 },
  { fromAge: 60, toAge: 64 },
  { fromAge: 65, toAge: 69 },
  { fromAge: 70, toAge: 74 },
  { fromAge: 75, toAge: null },
];

type Row = [rightMean: number, rightSd: number, leftMean: number, leftSd: number];

// Rows follow AGE_BANDS. Table of grip strength, Mathiowetz et al. 1985.
const GRIP_MEN: readonly Row[] = [
  [121.0, 20.6, 104.5, 21.8],
  [120.8, 23.0, 110.5, 16.2],
  [121.8, 22.4, 110.4, 21.7],
  [119.7, 24.0, 112.9, 21.7],
  [116.8, 20.7, 112.8, 18.7],
  [109.9, 23.0, 100.8, 22.8],
  [113.6, 18.1, 101.9, 17.0],
  [101.1, 26.7, 83.2, 23.4],
  [89.7, 20.4, 76.8, 20.3],
  [91.1, 20.6, 76.8, 19.8],
  [75.3, 21.5, 64.8, 18.1],
  [65.7, 21.0, 55.0, 17.0],
];
const GRIP_WOMEN: readonly Row[] = [
  [70.4, 14.5, 61.0, 13.1],
  [74.5, 13.9, 63.5, 12.2],
  [78.7, 19.2, 68.0, 17.7],
  [74.1, 10.8, 66.3, 11.7],
  [70.4, 13.5, 62.3, 13.8],
  [62.2, 15.1, 56.0, 12.7],
  [65.8, 11.6, 57.3, 10.7],
  [57.3, 12.5, 47.3, 11.9],
  [55.1, 10.1, 45.7, 10.1],
  [49.6, 9.7, 41.0, 8.2],
  [49.6, 11.7, 41.5, 10.2],
  [42.6, 11.0, 37.6, 8.9],
];

/** Grip norms as a table keyed by sex, band index and side, for tests and the report. */
export const GRIP_NORMS_LB: Record<"male" | "female", readonly Record<Side, NormValue>[]> = {
  male: GRIP_MEN.map(toSides),
  female: GRIP_WOMEN.map(toSides),
};

function toSides([rm, rs, lm, ls]: Row): Record<Side, NormValue> {
  return { right: { meanLb: rm, sdLb: rs }, left: { meanLb: lm, sdLb: ls } };
}

// Tip pinch is carried only for the bands checked against the published paper so far (20-24 and 75+, dominant hand);
// other bands return no norm rather than a remembered number.
const TIP_PINCH_DOMINANT: Record<"male" | "female", Partial<Record<number, NormValue>>> = {
  male: { 0: { meanLb: 18.0, sdLb: 3.0 }, 11: { meanLb: 14.0, sdLb: 3.4 } },
  female: { 0: { meanLb: 11.1, sdLb: 2.1 }, 11: { meanLb: 9.6, sdLb: 2.8 } },
};

/** Whole years of age on `onDate` (both YYYY-MM-DD). */
export function ageInYears(dateOfBirth: string, onDate: string): number {
  const [by, bm, bd] = dateOfBirth.split("-").map(Number);
  const [y, m, d] = onDate.split("-").map(Number);
  return y - by - (m < bm || (m === bm && d < bd) ? 1 : 0);
}

export function ageBandIndex(age: number): number | null {
  if (age < AGE_BANDS[0].fromAge) return null;
  const i = AGE_BANDS.findIndex((b) => age >= b.fromAge && (b.toAge === null || age <= b.toAge));
  return i < 0 ? null : i;
}

export function bandLabel(i: number): string {
  const b = AGE_BANDS[i];
  return b.toAge === null ? `${b.fromAge}+` : `${b.fromAge}-${b.toAge}`;
}

export interface NormMatch extends NormValue {
  band: string;
  source: string;
  /** What the norm is for, in words (e.g. "women 60-64, right hand"). */
  group: string;
}

export interface NormQuery {
  test: StrengthTest;
  side: Side;
  sex: "female" | "male" | "other" | "unknown";
  age: number;
  dominantHand: Side;
}

/** The matching published norm, or null with no guess when the table has none (age under 20, sex not recorded, …). */
export function findNorm(q: NormQuery): NormMatch | null {
  if (q.sex !== "male" && q.sex !== "female") return null;
  const band = ageBandIndex(q.age);
  if (band === null) return null;
  const who = `${q.sex === "male" ? "men" : "women"} ${bandLabel(band)}`;
  if (q.test === "grip") {
    const v = GRIP_NORMS_LB[q.sex][band][q.side];
    return { ...v, band: bandLabel(band), source: MATHIOWETZ_1985, group: `${who}, ${q.side} hand` };
  }
  if (q.test === "tip_pinch" && q.side === q.dominantHand) {
    const v = TIP_PINCH_DOMINANT[q.sex][band];
    return v ? { ...v, band: bandLabel(band), source: MATHIOWETZ_1985, group: `${who}, dominant hand` } : null;
  }
  return null;
}

export interface NormComparison {
  norm: NormMatch;
  readingLb: number;
  /** The reading as a percentage of the norm's mean. */
  percentOfNorm: number;
  /** Standard deviations from the norm's mean (negative = weaker). */
  zScore: number;
}

export function compareWithNorm(meanKg: number, q: NormQuery): NormComparison | null {
  const norm = findNorm(q);
  if (!norm) return null;
  const readingLb = meanKg / KG_PER_LB;
  return { norm, readingLb, percentOfNorm: (readingLb / norm.meanLb) * 100, zScore: (readingLb - norm.meanLb) / norm.sdLb };
}

export const STRENGTH_TEST_LABELS: Record<StrengthTest, string> = {
  grip: "Grip (dynamometer, handle position 2)",
  tip_pinch: "Tip pinch",
  key_pinch: "Key (lateral) pinch",
  palmar_pinch: "Palmar (three-point) pinch",
};
