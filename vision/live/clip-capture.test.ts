import { Vector3 } from "three";
import { describe, expect, it } from "vitest";
import { parseCapture } from "@/lib/capture/parse";
import type { MotionId, Side } from "@/lib/motions/catalog";
import { analyzeCapture } from "@/vision/analyze-capture";
import { MIDDLE_MCP, WRIST } from "@/vision/landmarks";
import { neutralPose, poseHand, SeededRandom, withMotionAngle, type Placement } from "@/vision/testing/synthetic-hand";
import type { Vec3 } from "@/vision/vec";
import { CLIP_NEUTRAL, clipCapture, clipStartNeutral, withFullModelFrames } from "./clip-capture";
import type { TrackedFrame } from "./types";

// Forearm resting on the table, seen obliquely from above and the little-finger side (camera axes: x right, y down, z away).
const FOREARM: Vec3 = [0.8, 0.35, 0.3];
const placement = (side: Side): Placement => ({ forearmDistal: FOREARM, forearmRadial: [0, -0.3, side === "right" ? -1 : 1], wrist: [0, 0.02, 0.45] });

/** A clip built by code: the wrist at `angleAt(t)` degrees of `motion`, 30 frames a second, 1 mm landmark jitter. */
function clipFrames(side: Side, motion: MotionId, durationMs: number, angleAt: (t: number) => number | null, seed = 7): TrackedFrame[] {
  const random = new SeededRandom(seed);
  const frames: TrackedFrame[] = [];
  for (let i = 0; (i * 1000) / 30 <= durationMs; i++) {
    const t = (i * 1000) / 30;
    const deg = angleAt(t);
    if (deg === null) {
      frames.push({ t, score: 0, handedness: null, hand: null, image: null });
      continue;
    }
    const hand = poseHand(withMotionAngle(neutralPose(), motion, null, deg), side, placement(side)).landmarks.map(
      (p): [number, number, number] => [p[0] + 0.001 * random.normal(), p[1] + 0.001 * random.normal(), p[2] + 0.001 * random.normal()],
    );
    frames.push({ t, score: 0.95, handedness: side, hand, image: hand.map((p): [number, number, number] => [0.5 + p[0], 0.5 + p[1], p[2]]) });
  }
  return frames;
}

/** Still for `stillMs`, then one repetition to `peakDeg` and back (rise 1.5 s, hold 1 s, return 1.5 s). */
const stillThenRep = (stillMs: number, peakDeg: number) => (t: number) => {
  const s = t - stillMs;
  if (s <= 0) return 0;
  if (s < 1500) return (peakDeg * s) / 1500;
  if (s < 2500) return peakDeg;
  if (s < 4000) return peakDeg * (1 - (s - 2500) / 1500);
  return 0;
};

// Angle between the reading's forearm line and the true one, by three.js (a general-purpose 3-D library).
const offTrueDeg = (axis: Vec3) => (new Vector3(...axis).angleTo(new Vector3(...FOREARM).normalize()) * 180) / Math.PI;

describe("straight-wrist reading from a clip's start", () => {
  it("finds the still start of a wrist clip, for either hand, with the forearm line within a degree", () => {
    for (const side of ["left", "right"] as const) {
      const outcome = clipStartNeutral(clipFrames(side, "wrist.flexion", 8000, stillThenRep(3500, 60)), side);
      expect(outcome.ok, side).toBe(true);
      if (!outcome.ok) continue;
      expect(outcome.startMs).toBe(0);
      // Times start at 0 and span the requested hold (91 frames at 30 fps over 3 s).
      expect(outcome.frames[0].t).toBe(0);
      expect(outcome.frames[outcome.frames.length - 1].t).toBeCloseTo(CLIP_NEUTRAL.holdMs, 0);
      expect(outcome.frames).toHaveLength(91);
      expect(offTrueDeg(outcome.reading.longAxis)).toBeLessThan(1);
    }
  });

  it("skips frames without a hand at the start and begins the stretch at the first tracked frame", () => {
    const outcome = clipStartNeutral(clipFrames("right", "wrist.extension", 8000, (t) => (t < 1000 ? null : stillThenRep(4500, 50)(t))), "right");
    expect(outcome.ok).toBe(true);
    if (outcome.ok) {
      // The first tracked frame is at 1000 ms (frame 30 at 30 fps).
      expect(outcome.startMs).toBeCloseTo(1000, 0);
      expect(offTrueDeg(outcome.reading.longAxis)).toBeLessThan(1);
    }
  });

  it("refuses a clip that moves from the start, or is still only after the search window, saying why", () => {
    const moving = clipStartNeutral(clipFrames("right", "wrist.flexion", 9000, (t) => 30 * Math.sin((2 * Math.PI * t) / 2000)), "right");
    expect(moving).toMatchObject({ ok: false, problem: expect.stringMatching(/first 5 seconds of the clip did not show a still, straight wrist: the hand moved \d+ degrees/) });
    // Moving for 6 s, then still: the still stretch starts after the first 5 s, so it is not taken as straight.
    const late = clipStartNeutral(clipFrames("right", "wrist.flexion", 10_000, (t) => (t < 6000 ? 30 * Math.sin((2 * Math.PI * t) / 2000) : 0)), "right");
    expect(late.ok).toBe(false);
    expect(clipStartNeutral([], "right")).toMatchObject({ ok: false, problem: "the clip has no frames." });
  });
});

describe("clip capture with the reading", () => {
  const RAW = { correction: "off" } as const;

  it("puts the reading's frames in the capture; the server reads the wrist against it and finds the commanded peak", () => {
    const target = { motion: "wrist.flexion", side: "right", digit: null, condition: "gravity_minimized" } as const;
    const { capture, neutral } = clipCapture(target, clipFrames("right", "wrist.flexion", 9000, stillThenRep(3500, 60)), "c.webm");
    expect(neutral?.ok).toBe(true);
    expect(capture.neutral?.frames).toHaveLength(91);
    // The file round-trips through the format's own parser, as the server receives it.
    const analysis = analyzeCapture(parseCapture(JSON.parse(JSON.stringify(capture)), "c.webm"), RAW);
    expect(analysis.forearmSource).toBe("neutral-reading");
    expect(analysis.neutral?.usableFrames).toBe(91);
    expect(analysis.reps).toBe(1);
    // The hand is seen nearly side-on (its width about 25 degrees off the line of sight), so the engine reads the wrist in
    // the picture (vision/wrist-axis.ts sideOnWristFlexion): what a protractor held to the screen shows. That is the
    // turn of the wrist-to-middle-knuckle line between the noise-free straight and 60-degree hands, projected; the tilt
    // stretches 60 degrees by a few. With 1 mm jitter the peak is that angle within 2.
    expect(analysis.method).toBe("image_plane");
    const line = (deg: number) => {
      const hand = poseHand(withMotionAngle(neutralPose(), "wrist.flexion", null, deg), "right", placement("right")).landmarks;
      return Math.atan2(hand[MIDDLE_MCP][1] - hand[WRIST][1], hand[MIDDLE_MCP][0] - hand[WRIST][0]);
    };
    const pictureDeg = Math.abs(((line(60) - line(0)) * 180) / Math.PI);
    expect(pictureDeg).toBeGreaterThan(60);
    expect(pictureDeg).toBeLessThan(66);
    expect(Math.abs(analysis.peakDeg! - pictureDeg)).toBeLessThan(2);
  });

  it("falls back to the capture's start when the clip starts moving, and leaves finger clips alone", () => {
    const target = { motion: "wrist.flexion", side: "right", digit: null, condition: "gravity_minimized" } as const;
    const { capture, neutral } = clipCapture(target, clipFrames("right", "wrist.flexion", 9000, (t) => 30 * Math.sin((2 * Math.PI * t) / 2000)), "c.webm");
    expect(neutral?.ok).toBe(false);
    expect(capture.neutral).toBeUndefined();
    expect(analyzeCapture(capture, RAW).forearmSource).toBe("capture-start");

    const finger = clipCapture({ motion: "mcp.flexion", side: "right", digit: "index", condition: "gravity_minimized" }, clipFrames("right", "wrist.flexion", 4000, () => 0), "c.webm");
    expect(finger.neutral).toBeNull();
    expect(finger.capture.neutral).toBeUndefined();
  });
});

describe("a second hand model's tracking of the same clip", () => {
  const target = { motion: "wrist.flexion" as const, side: "right" as const, digit: null, condition: "against_gravity" as const };
  const first = clipFrames("right", "wrist.flexion", 6000, stillThenRep(3000, 60));
  const capture = clipCapture(target, first, "clip.webm").capture;

  it("is kept as fullModel when it holds the same frames at the same times, and the file stays valid", () => {
    const second = clipFrames("right", "wrist.flexion", 6000, stillThenRep(3000, 60), 8);
    const both = withFullModelFrames(capture, target, second, "clip.webm");
    expect(both.fullModel?.frames.map((f) => f.t)).toEqual(capture.frames.map((f) => f.t));
    expect(both.frames).toBe(capture.frames);
    expect(parseCapture(JSON.parse(JSON.stringify(both)), "clip.json").fullModel?.frames).toHaveLength(capture.frames.length);
  });

  it("is left out when that model found no hand, or stepped other frames", () => {
    const none = first.map((f) => ({ ...f, score: 0, handedness: null, hand: null, image: null }));
    expect(withFullModelFrames(capture, target, none, "clip.webm")).toBe(capture);
    expect(withFullModelFrames(capture, target, first.slice(1), "clip.webm")).toBe(capture);
  });
});
