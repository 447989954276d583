import { describe, expect, it } from "vitest";
import { parseCapture } from "@/lib/capture/parse";
import { analyzeCapture } from "@/vision/analyze-capture";
import { buildSyntheticCapture, type SyntheticCaptureSpec } from "@/vision/testing/synthetic-hand";
import { FULL_MODEL_BUDGET_BYTES } from "@/lib/captures/upload";
import type { LandmarkXYZ, TrackedFrame } from "@/vision/live/types";
import { analyzeCaptureFile, type PairAnalysis } from "@/vision/model-pair";
import { CaptureRecorder, MIN_PAIRED_SHARE, newCaptureUid, VISIT_KEEP_LAST_MS } from "./capture-recorder";

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
    const recorder = new CaptureRecorder({ motion: "mcp.flexion", side: "left", digit: "index", condition: "gravity_minimized" }, { gravity: [0, 0, 1] });
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

  describe("both hand models on one attempt", () => {
    // Two synthetic readings of the same PIP bends at the same times, as the lite and the full model might give them
    // (different landmark noise); the tracker hands the second in `fullModel`.
    const target = { motion: "pip.flexion", side: "right", digit: "middle", condition: "against_gravity" } as const;
    const spec: Omit<SyntheticCaptureSpec, "seed"> = {
      ...target,
      placement: { forearmDistal: [0, -1, 0], forearmRadial: [-1, 0, 0], wrist: [0, 0.1, 0.45] },
      reps: [{ peakDeg: 70 }, { peakDeg: 70 }],
      noiseMm: 1,
    };
    const lite = buildSyntheticCapture({ ...spec, seed: 5 });
    const full = buildSyntheticCapture({ ...spec, seed: 6 });
    const tracked = (f: (typeof lite.frames)[number]): TrackedFrame => ({
      t: f.t,
      score: f.score,
      handedness: f.hand ? "right" : null,
      hand: f.hand as LandmarkXYZ[] | null,
      image: f.image ? f.image.map(([x, y]): LandmarkXYZ => [x, y, 0]) : null,
    });
    const record = (pairedFrom: number, fullFrames = full.frames) => {
      const recorder = new CaptureRecorder(target, { pairModel: true });
      lite.frames.forEach((f, i) => recorder.push({ ...tracked(f), t: 5000 + f.t, ...(i >= pairedFrom ? { fullModel: { ...tracked(fullFrames[i]), t: 5000 + f.t } } : {}) }));
      return { recorder, capture: parseCapture(JSON.parse(JSON.stringify(recorder.finish())), "recorded") };
    };

    it("keeps the second model's frames beside the first's, same times, and the engine reads both", () => {
      expect(full.frames.map((f) => f.t)).toEqual(lite.frames.map((f) => f.t));
      // Pairing switched on a frame late, as when it starts with a frame already on its way to the tracker.
      const { recorder, capture } = record(1);
      expect(recorder.pairedFrameCount).toBe(lite.frames.length - 1);
      expect(capture.fullModel?.frames.map((f) => f.t)).toEqual(capture.frames.map((f) => f.t));
      // The frame the second model did not read counts as one where it found no hand.
      expect(capture.fullModel?.frames[0]).toMatchObject({ hand: null, score: 0 });
      expect(capture.fullModel?.frames[1].hand).not.toBeNull();
      const analysis = analyzeCaptureFile(capture) as PairAnalysis;
      expect(analysis.handModels).toEqual(["lite", "full"]);
      expect(analysis.reps).toBe(2);
      expect(analysis.bothFrames).toBeGreaterThan(0.8 * capture.frames.length);
      // The attempt's notes say it was read by both, wherever they are shown.
      expect(analysis.warnings).toContain(`read by both hand models (lite and full) together: ${analysis.bothFrames} of ${capture.frames.length} frames seen by both`);
    });

    it("keeps one model's reading when the second read too few frames, found no hand, or would pass the size limit", () => {
      const late = Math.ceil(lite.frames.length * (1 - MIN_PAIRED_SHARE)) + 1;
      expect(record(late).capture.fullModel).toBeUndefined();
      expect(record(0, full.frames.map((f) => ({ ...f, score: 0, hand: null, image: null }))).capture.fullModel).toBeUndefined();
      expect(new CaptureRecorder(target, { pairModel: false }).finish()).toBeNull();

      const long = new CaptureRecorder(target, { pairModel: true });
      const frame = tracked(lite.frames.find((f) => f.hand)!);
      let t = 0;
      let lastKept = 0;
      // About 2 KB a frame for each model with picture points: add frames until the second model's are let go.
      for (let batch = 0; batch < 100; batch++) {
        for (let i = 0; i < 250; i++) long.push({ ...frame, t: (t += 33), fullModel: { ...frame, t } });
        const now = long.finish()!;
        if (!now.fullModel) break;
        lastKept = JSON.stringify(now).length;
      }
      const capture = long.finish()!;
      expect(capture.fullModel).toBeUndefined();
      expect(lastKept).toBeGreaterThan(0);
      expect(lastKept).toBeLessThanOrEqual(FULL_MODEL_BUDGET_BYTES);
      expect(JSON.stringify({ ...capture, fullModel: { frames: capture.frames } }).length).toBeGreaterThan(FULL_MODEL_BUDGET_BYTES);
    });
  });

  it("a recording that keeps its last minute drops older frames, both models alike, with times from 0", () => {
    const target = { motion: "pip.flexion", side: "right", digit: "middle", condition: "against_gravity" } as const;
    const recorder = new CaptureRecorder(target, { pairModel: true, keepLastMs: VISIT_KEEP_LAST_MS });
    const hand = source.frames.find((f) => f.hand)!.hand as LandmarkXYZ[];
    // 90 s at 30 frames a second; the second model reads from 20 s on, and each frame's score tells its time.
    const frames = Array.from({ length: 2700 }, (_, i) => 1000 + (i * 1000) / 30);
    for (const t of frames) {
      const score = Math.min(1, (t - 1000) / 100_000);
      recorder.push({ t, score, hand, ...(t - 1000 >= 20_000 ? { fullModel: { t, score, handedness: "right", hand, image: null } } : {}) });
    }
    const capture = parseCapture(JSON.parse(JSON.stringify(recorder.finish())), "recorded");
    expect(capture.frames[0].t).toBe(0);
    expect(capture.frames.at(-1)!.t).toBeLessThanOrEqual(VISIT_KEEP_LAST_MS);
    expect(capture.frames.at(-1)!.t).toBeGreaterThan(VISIT_KEEP_LAST_MS - 40);
    expect(recorder.frameCount).toBe(capture.frames.length);
    // The kept frames are the last ones pushed: the last frame's score is that of 90 s in.
    expect(capture.frames.at(-1)!.score).toBeCloseTo((frames.at(-1)! - 1000) / 100_000, 5);
    expect(capture.frames[0].score).toBeCloseTo((frames.at(-1)! - 1000 - capture.frames.at(-1)!.t) / 100_000, 5);
    // Every kept frame was read by both: the second model's frames are kept, at the same times.
    expect(capture.fullModel?.frames.map((f) => f.t)).toEqual(capture.frames.map((f) => f.t));
    expect(() => new CaptureRecorder(target, { keepLastMs: 0 })).toThrow(/keepLastMs: expected a positive number/);
  });
});
