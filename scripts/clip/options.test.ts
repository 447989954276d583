import { describe, expect, it } from "vitest";
import { captureSchema } from "@/lib/capture/schema";
import { MOTION_IDS } from "@/lib/motions/catalog";
import { captureFromFrames, handednessNote } from "./capture";
import { ClipInputError, DEFAULT_MJPEG_FPS, parseClipArgs } from "./options";

const BASE = ["--motion", "pip.flexion", "--side", "left", "--digit", "index", "--condition", "against_gravity"];

describe("analyze-clip options", () => {
  it("reads the target, the output file and analyze's own flags, and keeps the clip", () => {
    expect(parseClipArgs([...BASE, "--out", "c.json", "--scale", "mrc", "clip.webm"])).toEqual({
      motion: "pip.flexion",
      side: "left",
      digit: "index",
      condition: "against_gravity",
      oneFinger: false,
      out: "c.json",
      mjpegFps: DEFAULT_MJPEG_FPS,
      analyzeArgs: ["--scale", "mrc"],
      clip: "clip.webm",
    });
    expect(parseClipArgs(["--motion", "wrist.flexion", "--side", "right", "--condition", "gravity_minimized", "--fps", "25", "c.mjpeg"])).toMatchObject({ digit: null, mjpegFps: 25 });
  });

  it("names the field and what it expects for each bad flag", () => {
    const refusal = (args: string[]) => {
      try {
        parseClipArgs(args);
      } catch (error) {
        expect(error).toBeInstanceOf(ClipInputError);
        return (error as Error).message;
      }
      throw new Error("accepted");
    };
    expect(refusal(["--side", "left", "--condition", "against_gravity", "c.webm"])).toBe(`--motion: expected one of ${MOTION_IDS.join(", ")}`);
    expect(refusal(["--motion", "pip.bend", ...BASE.slice(2), "c.webm"])).toMatch(/^--motion: expected one of .*, got "pip.bend"$/);
    expect(refusal([...BASE.slice(0, 4), "--condition", "against_gravity", "c.webm"])).toBe("--digit: expected one of index, middle, ring, little for pip.flexion");
    expect(refusal([...BASE, "--fps", "0", "c.mjpeg"])).toBe('--fps: expected frames a second from 1 to 240, got "0"');
    expect(refusal([...BASE, "--out"])).toBe("--out: expected a value");
    expect(refusal([...BASE, "a.webm", "b.webm"])).toBe("CLIP: expected one video file, got 2");
    expect(refusal(["--motion", "wrist.flexion", "--side", "left", "--condition", "against_gravity", "--one-finger", "c.webm"])).toBe(
      "--one-finger: expected a finger's MCP, PIP or DIP motion with --digit index, middle, ring or little, got wrist.flexion",
    );
  });

  it("takes --one-finger for a finger's joint motion", () => {
    expect(parseClipArgs([...BASE, "--one-finger", "clip.webm"])).toMatchObject({ motion: "pip.flexion", digit: "index", oneFinger: true });
  });
});

describe("tracked frames to a capture", () => {
  const hand = Array.from({ length: 21 }, (_, i) => [i * 0.001, 0, 0] as [number, number, number]);
  const frame = (t: number, withHand: boolean, handedness: "left" | "right" | null = withHand ? "right" : null) => ({
    t,
    score: withHand ? 0.9 : 0,
    handedness,
    hand: withHand ? hand : null,
    image: null,
  });
  const target = { motion: "pip.flexion", side: "right", digit: "index", condition: "against_gravity" } as const;

  it("keeps every frame, hand or not, in order", () => {
    const capture = captureFromFrames(target, [frame(0, false), frame(33, true), frame(67, true)], "c.webm");
    expect(capture.frames.map((f) => [f.t, f.hand !== null])).toEqual([[0, false], [33, true], [67, true]]);
  });

  it("keeps the picture landmarks of frames with a hand, to 1e-5 of the picture, for drawing the hand in review", () => {
    const picture = Array.from({ length: 21 }, (_, i) => [0.1 + i * 0.0312345678, 0.5, -0.02] as [number, number, number]);
    const capture = captureFromFrames(target, [{ ...frame(0, true), image: picture }, { ...frame(33, false), image: picture }], "c.webm");
    expect(capture.frames[0].image).toHaveLength(21);
    expect(capture.frames[0].image![3]).toEqual([0.19370, 0.5]);
    // No hand, no drawing: a picture without world landmarks would show a hand the engine never measured.
    expect(capture.frames[1].image).toBeNull();
    // The capture schema accepts what the builder writes.
    expect(captureSchema.parse(capture).frames[0].image).toEqual(capture.frames[0].image);
  });

  it("refuses a clip where no frame holds a hand", () => {
    expect(() => captureFromFrames(target, [frame(0, false), frame(33, false)], "c.webm")).toThrow(new ClipInputError("CLIP: no hand in view in any of the 2 frames of c.webm"));
  });

  it("takes a wrist clip's straight-wrist reading from its still start, and notes a start that is not still", () => {
    const wrist = { motion: "wrist.flexion", side: "right", digit: null, condition: "against_gravity" } as const;
    // A hand drawn as a fan of points, turned by `deg` about the camera's z axis: still when `deg` is constant.
    const turned = (deg: number) => {
      const r = (deg * Math.PI) / 180;
      return Array.from({ length: 21 }, (_, i) => {
        const along = 0.004 * i;
        const across = 0.01 * ((i % 4) - 1.5);
        return [along * Math.cos(r) - across * Math.sin(r), along * Math.sin(r) + across * Math.cos(r), 0.002 * (i % 3)] as [number, number, number];
      });
    };
    const clip = (degAt: (t: number) => number) => Array.from({ length: 121 }, (_, i) => ({ t: (i * 1000) / 30, score: 0.9, handedness: "right" as const, hand: turned(degAt((i * 1000) / 30)), image: null }));
    const notes: string[] = [];
    const still = captureFromFrames(wrist, clip(() => 10), "c.webm", (n) => notes.push(n));
    // 3 s at 30 fps, both ends included.
    expect(still.neutral?.frames).toHaveLength(91);
    expect(notes).toEqual([]);
    const swinging = captureFromFrames(wrist, clip((t) => 40 * Math.sin((2 * Math.PI * t) / 1000)), "c.webm", (n) => notes.push(n));
    expect(swinging.neutral).toBeUndefined();
    expect(notes).toHaveLength(1);
    expect(notes[0]).toMatch(/^no straight-wrist reading: the first 5 seconds of the clip did not show a still, straight wrist: .* The wrist is read from how the hand started\.$/);
    // Finger clips take no reading and say nothing about it.
    expect(captureFromFrames(target, [frame(0, true)], "c.webm", (n) => notes.push(n)).neutral).toBeUndefined();
    expect(notes).toHaveLength(1);
  });

  it("notes a --side the tracker disagrees with in most frames, and only then", () => {
    expect(handednessNote([frame(0, true, "left"), frame(33, true, "left"), frame(67, true, "right")], "right")).toBe(
      "the tracker saw a left hand in 2 of 3 frames with a hand, but --side is right",
    );
    expect(handednessNote([frame(0, true, "left"), frame(33, true, "right")], "right")).toBeNull();
    expect(handednessNote([frame(0, false)], "left")).toBeNull();
  });
});
