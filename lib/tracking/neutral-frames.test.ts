import { describe, expect, it } from "vitest";
import { parseCapture } from "@/lib/capture/parse";
import { analyzeCapture } from "@/vision/analyze-capture";
import { buildSyntheticCapture, neutralPose, poseHand, SeededRandom, type Placement } from "@/vision/testing/synthetic-hand";
import type { Vec3 } from "@/vision/vec";
import type { NeutralFrame } from "@/vision/wrist-axis";
import { withNeutralFrames } from "./neutral-frames";

// Forearm resting along the camera's x axis, little-finger side toward the camera (the recommended wrist view).
const placement: Placement = { forearmDistal: [1, 0, 0], forearmRadial: [0, 0, -1], wrist: [0, 0.02, 0.45] };

function neutralFrames(count: number): NeutralFrame[] {
  const random = new SeededRandom(5);
  return Array.from({ length: count }, (_, i) => ({
    t: i * 33,
    score: 0.93,
    hand: poseHand(neutralPose(), "right", placement).landmarks.map((p): Vec3 => [p[0] + 0.0005 * random.normal(), p[1] + 0.0005 * random.normal(), p[2]]),
  }));
}

describe("neutral frames in the capture file", () => {
  it("travel with the attempt, parse as capture format v1 and give the server the same forearm line", () => {
    const capture = parseCapture(
      buildSyntheticCapture({ motion: "wrist.extension", side: "right", digit: null, condition: "against_gravity", placement, includeForearm: false, restDeg: 15, reps: [{ peakDeg: 55 }] }),
      "attempt.json",
    );
    const file = withNeutralFrames(capture, neutralFrames(90));
    const parsed = parseCapture(JSON.parse(JSON.stringify(file)), "sent.json");
    expect(parsed.neutral?.frames).toHaveLength(90);
    const analysis = analyzeCapture(parsed, { correction: "off" });
    expect(analysis.forearmSource).toBe("neutral-reading");
    // Started 15 degrees extended: against the neutral reading the peak is the commanded 55, not 55 - 15.
    expect(Math.abs(analysis.peakDeg! - 55)).toBeLessThan(1);
  });

  it("keeps a broken landmark or score from spoiling the file, and never lets time run backwards", () => {
    const capture = parseCapture(
      buildSyntheticCapture({ motion: "wrist.flexion", side: "right", digit: null, condition: "against_gravity", placement, reps: [{ peakDeg: 30 }] }),
      "attempt.json",
    );
    const frames = neutralFrames(4);
    frames[1] = { ...frames[1], hand: frames[1].hand!.map((p, i) => (i === 7 ? ([Number.NaN, p[1], p[2]] as Vec3) : p)) };
    frames[2] = { ...frames[2], score: Number.NaN, t: 10 };
    const file = withNeutralFrames(capture, frames);
    expect(file.neutral!.frames.map((f) => f.hand === null)).toEqual([false, true, false, false]);
    expect(file.neutral!.frames.map((f) => f.t)).toEqual([0, 33, 33, 99]);
    expect(file.neutral!.frames[2].score).toBe(0);
    expect(() => parseCapture(JSON.parse(JSON.stringify(file)), "sent.json")).not.toThrow();
    expect(withNeutralFrames(capture, [])).toBe(capture);
  });
});
