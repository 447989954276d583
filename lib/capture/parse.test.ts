import { describe, expect, it } from "vitest";
import { buildSyntheticCapture, type SyntheticCapture } from "@/vision/testing/synthetic-hand";
import { CaptureFormatError, formatPath, parseCaptureText } from "./parse";

function fixture(): SyntheticCapture {
  return buildSyntheticCapture({
    motion: "pip.flexion",
    side: "right",
    digit: "index",
    condition: "against_gravity",
    placement: { forearmDistal: [1, 0, 0], forearmRadial: [0, 0, -1], wrist: [0, 0, 0.5] },
    reps: [{ peakDeg: 80 }],
    noHandRate: 0.1,
    seed: 2,
  });
}

function errorOf(text: string): CaptureFormatError {
  try {
    parseCaptureText(text, "attempt.json");
  } catch (error) {
    if (error instanceof CaptureFormatError) return error;
    throw error;
  }
  throw new Error("expected the capture to be rejected");
}

describe("capture file v1", () => {
  it("accepts a capture written by the synthetic recorder, frames without a hand included", () => {
    const capture = fixture();
    const parsed = parseCaptureText(JSON.stringify(capture), "attempt.json");
    expect(parsed.frames).toHaveLength(capture.frames.length);
    expect(parsed.frames.some((f) => f.hand === null)).toBe(true);
    expect(parsed.motion).toBe("pip.flexion");
  });

  it("names the file, the frame and the field of a frame with 20 landmarks", () => {
    const capture = fixture();
    const index = capture.frames.findIndex((f, i) => i > 5 && f.hand);
    capture.frames[index].hand = capture.frames[index].hand!.slice(0, 20);
    const error = errorOf(JSON.stringify(capture));
    expect(error.file).toBe("attempt.json");
    expect(error.frame).toBe(index);
    expect(error.field).toBe(`frames[${index}].hand`);
    expect(error.message).toBe(`attempt.json: frames[${index}].hand: expected 21 landmarks [x, y, z], got an array of 20`);
  });

  it("names the frame and coordinate that hold a NaN, though NaN is not JSON", () => {
    const capture = fixture();
    const text = JSON.stringify(capture).replace(/("hand":\[\[)([-0-9.e]+)/, (_m, head) => `${head}NaN`);
    const error = errorOf(text);
    expect(error.field).toMatch(/^frames\[\d+\]\.hand\[0\]\[0\]$/);
    expect(error.message).toMatch(/expected a finite number, got NaN or Infinity/);
  });

  it("rejects text that is not JSON, a wrong version, a wrong digit for the motion and time going backwards", () => {
    expect(errorOf("{ not json").message).toMatch(/^attempt\.json: not valid JSON/);
    expect(errorOf(JSON.stringify({ ...fixture(), version: 2 })).message).toBe("attempt.json: version: expected version 1, got 2");
    expect(errorOf(JSON.stringify({ ...fixture(), digit: null })).field).toBe("digit");
    expect(errorOf(JSON.stringify({ ...fixture(), motion: "wrist.flexion", digit: "index" })).message).toMatch(/digit: expected null for wrist\.flexion/);
    const capture = fixture();
    capture.frames[4].t = capture.frames[2].t - 1;
    const error = errorOf(JSON.stringify(capture));
    expect(error.frame).toBe(4);
    expect(error.field).toBe("frames[4].t");
  });

  it("accepts a finger tested on its own and names the field when it is claimed for a wrist or thumb motion", () => {
    expect(parseCaptureText(JSON.stringify({ ...fixture(), oneFinger: true }), "attempt.json").oneFinger).toBe(true);
    expect(errorOf(JSON.stringify({ ...fixture(), oneFinger: "yes" })).field).toBe("oneFinger");
    const wrist = { ...fixture(), motion: "wrist.flexion", digit: null, oneFinger: true };
    const error = errorOf(JSON.stringify(wrist));
    expect(error.field).toBe("oneFinger");
    expect(error.message).toMatch(/expected true only for a finger's \(not the thumb's\) MCP, PIP or DIP motion/);
    expect(errorOf(JSON.stringify({ ...fixture(), motion: "ip.flexion", digit: "thumb", oneFinger: true })).field).toBe("oneFinger");
  });

  it("rejects a score outside 0..1 and a zero gravity vector", () => {
    const capture = fixture();
    capture.frames[1].score = 1.5;
    expect(errorOf(JSON.stringify(capture)).message).toMatch(/frames\[1\]\.score: expected a score from 0 to 1, got 1\.5/);
    expect(errorOf(JSON.stringify({ ...fixture(), gravity: [0, 0, 0] })).field).toBe("gravity");
  });

  it("names a picture aspect that is not a width/height ratio", () => {
    expect(errorOf(JSON.stringify({ ...fixture(), imageAspect: 0 })).message).toMatch(/imageAspect: expected a width\/height ratio above 0\.1/);
    expect(errorOf(JSON.stringify({ ...fixture(), imageAspect: "4:3" })).message).toMatch(/imageAspect: expected the picture's width over its height/);
    expect(parseCaptureText(JSON.stringify({ ...fixture(), imageAspect: 16 / 9 }), "ok").imageAspect).toBeCloseTo(16 / 9, 12);
  });

  it("accepts the full model's frames of the same clip and names the field when they are not the same frames", () => {
    const capture = fixture();
    const fullModel = { frames: capture.frames.map((f) => ({ ...f })) };
    expect(parseCaptureText(JSON.stringify({ ...capture, fullModel }), "attempt.json").fullModel?.frames).toHaveLength(capture.frames.length);
    const short = errorOf(JSON.stringify({ ...capture, fullModel: { frames: fullModel.frames.slice(1) } }));
    expect(short.field).toBe("fullModel.frames");
    expect(short.message).toContain(`expected the same ${capture.frames.length} frames as frames, got ${capture.frames.length - 1}`);
    const shifted = { frames: fullModel.frames.map((f, i) => (i === 4 ? { ...f, t: f.t + 1 } : f)) };
    const moved = errorOf(JSON.stringify({ ...capture, fullModel: shifted }));
    expect(moved.field).toBe("fullModel.frames[4].t");
    expect(moved.message).toContain(`expected the time of frames[4] (${capture.frames[4].t})`);
  });

  it("formats paths the way the error lines show them", () => {
    expect(formatPath(["frames", 3, "hand", 7, 2])).toBe("frames[3].hand[7][2]");
  });
});
