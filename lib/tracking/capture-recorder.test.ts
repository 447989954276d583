import { describe, expect, it } from "vitest";
import { parseCapture } from "@/lib/capture/parse";
import { analyzeCapture } from "@/vision/analyze-capture";
import { buildSyntheticCapture } from "@/vision/testing/synthetic-hand";
import { CaptureRecorder, newCaptureUid } from "./capture-recorder";

// The synthetic hand (vision/testing) bends the index MCP to a known 80 degrees twice; recording its frames as the
// live tracker delivers them (camera clock times, no image landmarks kept) must give a file the engine's own schema
// accepts and whose analysis matches analyzing the source frames directly.
const source = buildSyntheticCapture({
  motion: "mcp.flexion",
  side: "left",
  digit: "index",
  condition: "gravity_minimized",
  placement: { forearmDistal: [0, -1, 0], forearmRadial: [1, 0, 0], wrist: [0, 0.1, 0.45] },
  reps: [{ peakDeg: 80 }, { peakDeg: 80 }],
  noHandRate: 0.05,
  seed: 3,
});

describe("capture recorder", () => {
  it("writes a capture file the engine's schema accepts, times from zero, and analyzes the same", () => {
    const recorder = new CaptureRecorder({ motion: "mcp.flexion", side: "left", digit: "index", condition: "gravity_minimized" }, [0, 0, 1]);
    const cameraClockMs = 123_456.5;
    for (const f of source.frames) recorder.push({ t: cameraClockMs + f.t, score: f.score, hand: f.hand as never, forearm: f.forearm as never });
    const capture = parseCapture(JSON.parse(JSON.stringify(recorder.finish())), "recorded");
    expect(capture.frames[0].t).toBe(0);
    expect(capture.frames).toHaveLength(source.frames.length);
    expect(capture.gravity).toEqual([0, 0, 1]);
    // Exact synthetic landmarks: the angle correction (fitted to the tracker's bias) is off so the geometry is checked.
    const direct = analyzeCapture({ ...source, gravity: [0, 0, 1] }, { correction: "off" });
    const recorded = analyzeCapture(capture, { correction: "off" });
    expect(recorded.reps).toBe(2);
    expect(recorded.peakDeg).toBeCloseTo(direct.peakDeg!, 6);
    expect(Math.abs(recorded.peakDeg! - 80)).toBeLessThanOrEqual(3);
  });

  it("writes a finger tested on its own into the file only when it was", () => {
    const record = (oneFinger?: boolean) => {
      const recorder = new CaptureRecorder({ motion: "mcp.flexion", side: "left", digit: "index", condition: "gravity_minimized", ...(oneFinger === undefined ? {} : { oneFinger }) });
      for (const f of source.frames.slice(0, 5)) recorder.push({ t: f.t, score: f.score, hand: f.hand as never });
      return parseCapture(JSON.parse(JSON.stringify(recorder.finish())), "recorded");
    };
    expect(record(true).oneFinger).toBe(true);
    expect("oneFinger" in record(false)).toBe(false);
    expect("oneFinger" in record()).toBe(false);
  });

  it("keeps broken frames as frames without a hand and never lets time run backwards", () => {
    const recorder = new CaptureRecorder({ motion: "pip.flexion", side: "right", digit: "middle", condition: "against_gravity" });
    const hand = source.frames.find((f) => f.hand)!.hand!;
    recorder.push({ t: 1000, score: 0.9, hand: hand as never });
    recorder.push({ t: 1033, score: Number.NaN, hand: hand.map((p, i) => (i === 4 ? [Number.NaN, 0, 0] : p)) as never });
    recorder.push({ t: 1020, score: 1.2, hand: null, forearm: [0, 0, 0] });
    const capture = parseCapture(recorder.finish(), "recorded");
    expect(capture.frames.map((f) => f.t)).toEqual([0, 33, 33]);
    expect(capture.frames[1]).toMatchObject({ hand: null, score: 0 });
    // A finger flexion capture keeps picture points (the correction reads them); a frame without a hand has none.
    expect(capture.frames[2]).toEqual({ t: 33, score: 1, hand: null, image: null });
    expect(capture.gravity).toBeUndefined();
  });

  it("an empty recording gives no file; capture ids are unique and pass the upload's pattern", () => {
    expect(new CaptureRecorder({ motion: "wrist.flexion", side: "right", digit: null, condition: "against_gravity" }).finish()).toBeNull();
    const ids = new Set(Array.from({ length: 100 }, newCaptureUid));
    expect(ids.size).toBe(100);
    for (const id of ids) expect(id).toMatch(/^[A-Za-z0-9_-]{16,64}$/);
  });
});
