import { describe, expect, it } from "vitest";
import { DIGIT_CHAIN } from "@/vision/landmarks";
import { MOTION_IDS, MOTIONS } from "@/lib/motions/catalog";
import { arcGeometry, arcSpan, contentRect, HAND_BONES, jointLandmarks, toScreen } from "./overlay-geometry";

// object-fit arithmetic as the CSS Images Module Level 3 defines it: contain scales to the smaller of the two box/
// picture ratios, cover to the larger, and the picture is centred (object-position 50% 50%).
describe("content rectangle under object-fit", () => {
  it("contain letterboxes a 4:3 picture in a 16:9 box with bars at the sides", () => {
    expect(contentRect(640, 480, 1280, 720, "contain")).toEqual({ x: 160, y: 0, width: 960, height: 720 });
  });
  it("contain puts bars above and below a 4:3 picture in a portrait phone box", () => {
    expect(contentRect(640, 480, 360, 640, "contain")).toEqual({ x: 0, y: 185, width: 360, height: 270 });
  });
  it("cover crops: the picture overflows the box on both sides", () => {
    const r = contentRect(640, 480, 360, 640, "cover");
    expect(r.height).toBeCloseTo(640, 9);
    expect(r.width).toBeCloseTo(853.333, 3);
    expect(r.x).toBeCloseTo(-246.667, 3);
  });
  it("a video with no size yet fills the box", () => {
    expect(contentRect(0, 0, 300, 200, "contain")).toEqual({ x: 0, y: 0, width: 300, height: 200 });
  });
});

describe("screen points", () => {
  const rect = { x: 160, y: 0, width: 960, height: 720 };
  it("maps normalised points into the picture's rectangle, flipping x when mirrored", () => {
    expect(toScreen([0.25, 0.5, 0], rect, false)).toEqual([400, 360]);
    expect(toScreen([0.25, 0.5, 0], rect, true)).toEqual([880, 360]);
    expect(toScreen([0, 0, 0], rect, true)).toEqual([1120, 0]);
  });
});

describe("joint landmarks", () => {
  it("finger joints follow the 21-point chain: MCP between metacarpal and proximal phalanx, and so on", () => {
    expect(jointLandmarks("mcp.flexion", "index")).toEqual({ from: 0, vertex: 5, to: 6 });
    expect(jointLandmarks("pip.flexion", "middle")).toEqual({ from: 9, vertex: 10, to: 11 });
    expect(jointLandmarks("dip.flexion", "little")).toEqual({ from: 18, vertex: 19, to: 20 });
    expect(jointLandmarks("ip.flexion", "thumb")).toEqual({ from: 2, vertex: 3, to: 4 });
    expect(jointLandmarks("wrist.flexion", null)).toEqual({ from: null, vertex: 0, to: 9 });
  });
  it("every motion and digit the catalog allows has landmarks inside the hand", () => {
    for (const id of MOTION_IDS) {
      const digits = MOTIONS[id].joint === "wrist" ? [null] : MOTIONS[id].digits;
      for (const digit of digits) {
        const j = jointLandmarks(id, digit);
        for (const i of [j.from, j.vertex, j.to]) {
          if (i === null) continue;
          expect(i).toBeGreaterThanOrEqual(0);
          expect(i).toBeLessThan(21);
        }
        if (digit) expect(DIGIT_CHAIN[digit]).toContain(j.vertex);
      }
    }
  });
  it("the skeleton has 21 bones joining all 21 landmarks", () => {
    expect(HAND_BONES).toHaveLength(21);
    expect(new Set(HAND_BONES.flat()).size).toBe(21);
  });
});

describe("angle arc", () => {
  // A finger pointing up the screen, bent 90 degrees at the vertex toward the picture's right.
  const from: [number, number] = [100, 300];
  const vertex: [number, number] = [100, 200];
  const to: [number, number] = [200, 200];

  it("starts on the proximal segment carried on and turns toward the distal one", () => {
    const arc = arcGeometry({ from, vertex, to }, 90);
    expect(arc.startRad).toBeCloseTo(-Math.PI / 2, 9);
    const span = arcSpan(arc, 90);
    // The end of a 90-degree arc lies along the distal segment (screen angle 0).
    expect(Math.cos(span.endRad)).toBeCloseTo(1, 9);
    expect(Math.sin(span.endRad)).toBeCloseTo(0, 9);
  });

  it("a mirrored view turns the arc the other way and still ends on the distal segment", () => {
    const mirror = (p: [number, number]): [number, number] => [400 - p[0], p[1]];
    const arc = arcGeometry({ from: mirror(from), vertex: mirror(vertex), to: mirror(to) }, 90);
    expect(arc.direction).toBe(-1);
    const span = arcSpan(arc, 90);
    expect(Math.cos(span.endRad)).toBeCloseTo(-1, 9);
    expect(span.anticlockwise).toBe(true);
  });

  it("without a proximal landmark the arc ends on the hand's line and spans the angle", () => {
    const arc = arcGeometry({ from: null, vertex, to }, 30);
    const span = arcSpan(arc, 30);
    expect(span.endRad).toBeCloseTo(0, 9);
    expect(span.endRad - span.startRad).toBeCloseTo(Math.PI / 6, 9);
  });
});
