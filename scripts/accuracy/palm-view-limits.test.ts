import { describe, expect, it } from "vitest";
import { DIGIT_CHAIN, MIDDLE_MCP, WRIST } from "@/vision/landmarks";
import { ANGLE_BANDS, bandSpreads, pictureLengthRatio, shortening } from "./palm-view-limits";

/** 21 picture points with the palm from (0.5, 0.9) to (0.5, 0.5) and the index MCP-PIP segment bent `bendDeg` toward the camera. */
function palmView(bendDeg: number, segment = 0.2): number[][] {
  const points = Array.from({ length: 21 }, () => [0.5, 0.5, 0]);
  points[WRIST] = [0.5, 0.9, 0];
  points[MIDDLE_MCP] = [0.5, 0.5, 0];
  const [mcp, pip] = DIGIT_CHAIN.index;
  points[mcp] = [0.45, 0.5, 0];
  // Orthographic camera looking at the palm: the part of the segment toward the camera is lost, cos θ is left.
  points[pip] = [0.45, 0.5 - segment * Math.cos((bendDeg * Math.PI) / 180), -segment * Math.sin((bendDeg * Math.PI) / 180)];
  return points;
}

describe("a segment's picture length over the palm's", () => {
  it("shortens by the cosine of a bend toward the camera (plane geometry)", () => {
    const [mcp, pip] = DIGIT_CHAIN.index;
    expect(pictureLengthRatio(palmView(0), mcp, pip, 1)).toBeCloseTo(0.5, 9);
    expect(pictureLengthRatio(palmView(60), mcp, pip, 1)).toBeCloseTo(0.25, 9);
    expect(pictureLengthRatio(palmView(20), mcp, pip, 1)).toBeCloseTo(0.5 * Math.cos(Math.PI / 9), 9);
  });

  it("puts x in y's unit with the picture's aspect, and is null without a palm or a point", () => {
    const points = palmView(0);
    // A palm lying across a 4:3 picture: 0.3 of the width is 0.4 of the height.
    points[WRIST] = [0.2, 0.5, 0];
    points[MIDDLE_MCP] = [0.5, 0.5, 0];
    expect(pictureLengthRatio(points, WRIST, MIDDLE_MCP, 4 / 3)).toBeCloseTo(1, 9);
    const [mcp, pip] = DIGIT_CHAIN.index;
    expect(pictureLengthRatio(points, mcp, pip, 4 / 3)).toBeCloseTo(0.2 / 0.4, 9);
    points[MIDDLE_MCP] = [0.2, 0.5, 0];
    expect(pictureLengthRatio(points, mcp, pip, 1)).toBeNull();
    expect(pictureLengthRatio(palmView(0).slice(0, 5), mcp, pip, 1)).toBeNull();
  });
});

describe("shortening against the commanded angle", () => {
  it("gives the change per 90 degrees and r = -1 for a straight-line fall", () => {
    const truth = [0, 15, 30, 45, 60, 75, 90];
    const s = shortening(truth, truth.map((t) => 1 - t / 90));
    expect(s.per90).toBeCloseTo(-1, 9);
    expect(s.r).toBeCloseTo(-1, 9);
    expect(s.samples).toBe(7);
  });

  it("is flatter where the points show only part of the bend", () => {
    const truth = [0, 10, 20, 30, 40, 50, 60, 70, 80];
    const full = shortening(truth, truth.map((t) => 0.5 * Math.cos((t * Math.PI) / 180)));
    const partial = shortening(truth, truth.map((t) => 0.5 * Math.cos((0.3 * t * Math.PI) / 180)));
    expect(full.per90!).toBeLessThan(0);
    expect(partial.per90! / full.per90!).toBeLessThan(0.3);
  });
});

describe("spread by band of the truth", () => {
  it("takes nearest-rank percentiles of the values in each band, upper bound exclusive", () => {
    const rows = [
      ...Array.from({ length: 10 }, (_, i) => ({ truthDeg: 2, value: i + 1 })),
      { truthDeg: 5, value: 100 },
    ];
    const [first, second] = bandSpreads(rows);
    expect(first).toMatchObject({ band: ANGLE_BANDS[0], samples: 10, p10: 1, median: 5, p90: 9 });
    expect(second).toMatchObject({ samples: 1, median: 100 });
    expect(bandSpreads(rows).at(-1)).toMatchObject({ samples: 0, median: null });
  });
});
