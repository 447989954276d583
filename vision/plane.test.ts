import { describe, expect, it } from "vitest";
import { analyzeCapture } from "./analyze-capture";
import { planeVerdict, readPlane } from "./plane";
import { buildSyntheticCapture, type Placement } from "./testing/synthetic-hand";

describe("test-plane verdict bands (issue 3: vertical at >= 60 deg from gravity, horizontal within 30)", () => {
  it("classifies by the axis-to-gravity angle and, in a vertical plane, by whether the part rises", () => {
    expect(planeVerdict(90, -0.5)).toBe("against_gravity");
    expect(planeVerdict(60, -0.1)).toBe("against_gravity");
    expect(planeVerdict(75, 0.4)).toBe("gravity_assisted");
    expect(planeVerdict(59.9, -1)).toBe("unclear");
    expect(planeVerdict(30.1, -1)).toBe("unclear");
    expect(planeVerdict(30, -1)).toBe("gravity_minimized");
    expect(planeVerdict(0, 1)).toBe("gravity_minimized");
  });

  it("reads the angle between an axis and gravity as a line angle, 0..90", () => {
    expect(readPlane([0, -1, 0], [1, 0, 0], [0, 1, 0]).axisToGravityDeg).toBeCloseTo(0, 9);
    expect(readPlane([1, 1, 0], [0, 0, 1], [0, 1, 0]).axisToGravityDeg).toBeCloseTo(45, 9);
  });
});

describe("test positions from the clinical notes, on the synthetic hand (camera y is down)", () => {
  // Forearm lying level along the camera's x axis. For a right hand the palm faces radial x distal, so the radial
  // axis chooses where the palm faces: toward the camera's -z radial axis puts the palm up.
  const level = (forearmRadial: [number, number, number]): Placement => ({ forearmDistal: [1, 0, 0], forearmRadial, wrist: [0, 0, 0.5] });
  const palmUp = level([0, 0, -1]);
  const palmDown = level([0, 0, 1]);
  const thumbUp = level([0, -1, 0]);

  const verdictOf = (motion: "wrist.flexion" | "wrist.extension" | "pip.flexion", placement: Placement) =>
    analyzeCapture(
      buildSyntheticCapture({
        motion,
        side: "right",
        digit: motion === "pip.flexion" ? "middle" : null,
        condition: "against_gravity",
        placement,
        reps: [{ peakDeg: 60 }],
        noiseMm: 1,
        seed: 3,
      }),
    ).plane;

  it("wrist flexion with the forearm supinated on the table works against gravity (notes: test planes)", () => {
    const plane = verdictOf("wrist.flexion", palmUp)!;
    expect(plane.verdict).toBe("against_gravity");
    expect(plane.axisToGravityDeg).toBeGreaterThan(85);
  });

  it("wrist extension with the forearm pronated works against gravity; flexion in that position is gravity-assisted", () => {
    expect(verdictOf("wrist.extension", palmDown)!.verdict).toBe("against_gravity");
    expect(verdictOf("wrist.flexion", palmDown)!.verdict).toBe("gravity_assisted");
  });

  it("wrist flexion with the forearm resting on its ulnar border (thumb up) is gravity-minimized", () => {
    const plane = verdictOf("wrist.flexion", thumbUp)!;
    expect(plane.verdict).toBe("gravity_minimized");
    expect(plane.axisToGravityDeg).toBeLessThan(5);
  });

  it("finger flexion with the back of the hand on the table works against gravity", () => {
    expect(verdictOf("pip.flexion", palmUp)!.verdict).toBe("against_gravity");
  });
});
