import { describe, expect, it } from "vitest";
import { parseCapture } from "@/lib/capture/parse";
import { SIDES, type Side } from "@/lib/motions/catalog";
import { CaptureRecorder } from "@/lib/tracking/capture-recorder";
import { analyzeCapture } from "./analyze-capture";
import { createLivePipeline } from "./pipeline";
import { pictureMcpFlexion, readsInPicture } from "./picture-angles";
import { neutralPose, poseHand, SeededRandom, withMotionAngle, type Placement } from "./testing/synthetic-hand";
import type { Vec3 } from "./vec";
import { WRIST } from "./landmarks";
import { baseUncertaintyDeg, trackingFactor, UNCERTAINTY_TABLE } from "./uncertainty";

// Exact synthetic hands (vision/testing): these check the picture geometry and the engine's choice, not the tracker.
// Hand on its little-finger edge, camera above looking down at the thumb side (camera axes: x right, y down, z away).
const THUMB_SIDE_UP: Placement = { forearmDistal: [1, 0, 0], forearmRadial: [0, 0, -1], wrist: [0, 0.02, 0.45] };
// Hand flat, palm down, seen from above its back: its width lies in the picture.
const backUp = (side: Side): Placement => ({ forearmDistal: [1, 0, 0], forearmRadial: [0, side === "right" ? -1 : 1, 0], wrist: [0, 0.02, 0.45] });

/** The picture points of a camera-axes hand under a 600-pixel pinhole, as fractions of a 640 x 480 picture. */
function picture(hand: readonly Vec3[]): [number, number][] {
  return hand.map((p) => [(320 + (600 * p[0]) / p[2]) / 640, (240 + (600 * p[1]) / p[2]) / 480]);
}
const ASPECT = 640 / 480;

/** The landmarks with their depth about the wrist squeezed to `keep` plus Gaussian depth noise (mm): a tracker unsure of depth. */
function depthBlurred(hand: readonly Vec3[], keep: number, noiseMm: number, random: SeededRandom): Vec3[] {
  const z0 = hand[WRIST][2];
  return hand.map((p): Vec3 => [p[0], p[1], z0 + keep * (p[2] - z0) + (noiseMm / 1000) * random.normal()]);
}

describe("MCP flexion read in the picture", () => {
  it("is the engine's reading only for MCP flexion with gravity minimized", () => {
    expect(readsInPicture("mcp.flexion", "gravity_minimized")).toBe(true);
    expect(readsInPicture("mcp.flexion", "against_gravity")).toBe(false);
    expect(readsInPicture("pip.flexion", "gravity_minimized")).toBe(false);
  });

  it("reads each finger's commanded MCP flexion from a side-on hand, for either hand, toward the palm positive", () => {
    for (const side of SIDES) {
      for (const digit of ["index", "middle", "ring", "little"] as const) {
        for (const deg of [0, 30, 75, -20]) {
          const hand = poseHand(withMotionAngle(neutralPose(), "mcp.flexion", digit, deg), side, THUMB_SIDE_UP).landmarks;
          const reading = pictureMcpFlexion(hand, picture(hand), ASPECT, digit);
          // The middle finger bends exactly in the picture. The ring and little metacarpals splay from the hand's line,
          // which tilts their bending plane out of the picture (up to 2 degrees at these angles, orthographic), and the
          // pinhole at 45 cm sees the fingers farther from the camera smaller (up to 2 more for the little finger).
          const bound = { index: 1, middle: 0.5, ring: 2, little: 4.5 }[digit];
          expect(reading, `${side} ${digit} ${deg}`).not.toBeNull();
          expect(Math.abs(reading!.deg - deg), `${side} ${digit} ${deg}`).toBeLessThan(bound);
        }
      }
    }
  });

  it("declines the thumb, a hand whose width shows, and a picture without its points", () => {
    const hand = poseHand(withMotionAngle(neutralPose(), "mcp.flexion", "index", 40), "right", backUp("right")).landmarks;
    expect(pictureMcpFlexion(hand, picture(hand), ASPECT, "index")).toBeNull();
    const sideOn = poseHand(neutralPose(), "right", THUMB_SIDE_UP).landmarks;
    expect(pictureMcpFlexion(sideOn, picture(sideOn), ASPECT, "thumb")).toBeNull();
    expect(pictureMcpFlexion(sideOn, picture(sideOn).slice(0, 20), ASPECT, "index")).toBeNull();
  });

  it("the engine uses it with gravity minimized when the capture has picture points, and the server reads it from the file", () => {
    const side: Side = "left";
    const random = new SeededRandom(5);
    const target = { motion: "mcp.flexion", side, digit: "ring", condition: "gravity_minimized" } as const;
    // A live attempt records picture points for this motion (and the picture's aspect), so the server can read them.
    const recorder = new CaptureRecorder(target);
    for (let i = 0; i <= 120; i++) {
      const t = (i * 1000) / 30;
      const deg = i < 20 ? 0 : 70 * Math.sin((Math.PI * (i - 20)) / 100) ** 2;
      const exact = poseHand(withMotionAngle(neutralPose(), "mcp.flexion", "ring", deg), side, THUMB_SIDE_UP).landmarks;
      // The tracker's depth is unsure; its picture points are not.
      const hand = depthBlurred(exact, 0.05, 3, random);
      recorder.push({ t, score: 0.95, hand: hand.map((p): [number, number, number] => [p[0], p[1], p[2]]), image: picture(exact).map(([x, y]) => [x, y, 0]), imageAspect: ASPECT });
    }
    const capture = parseCapture(JSON.parse(JSON.stringify(recorder.finish())), "recorded");
    expect(capture.imageAspect).toBeCloseTo(ASPECT, 12);
    expect(capture.frames.every((f) => f.hand === null || f.image?.length === 21)).toBe(true);
    const analysis = analyzeCapture(capture);
    expect(analysis.method).toBe("image_plane");
    // Every usable frame was read in the picture: the interval is the cell's engine figure (the clips' error measured
    // that way, vision/uncertainty-table.json), not the raw 3-D one.
    const engine = baseUncertaintyDeg(UNCERTAINTY_TABLE, "MCP flexion", "lite", analysis.view, "engine")!;
    const raw = baseUncertaintyDeg(UNCERTAINTY_TABLE, "MCP flexion", "lite", analysis.view, "raw")!;
    expect(trackingFactor(0.95)).toBe(1);
    expect(analysis.uncertaintyDeg).toBe(engine);
    expect(engine).toBeLessThan(raw);
    expect(Math.abs(analysis.peakDeg! - 70)).toBeLessThan(2);
    // Against gravity the same file is read in 3-D as before.
    const upright = analyzeCapture({ ...capture, condition: "against_gravity" });
    expect(upright.method).not.toBe("image_plane");
    // Without the aspect (older files) the picture points are not read.
    expect(analyzeCapture({ ...capture, imageAspect: undefined }).method).not.toBe("image_plane");
    // Frame by frame the live pipeline agrees.
    const live = createLivePipeline({ ...target, imageAspect: ASPECT });
    const last = capture.frames.map((f) => live.push(f)).at(-1)!;
    expect(last.method).toBe("image_plane");
  });
});
