import { describe, expect, it } from "vitest";
import { parseCapture } from "@/lib/capture/parse";
import { CaptureRecorder } from "@/lib/tracking/capture-recorder";
import { analyzeCapture } from "./analyze-capture";
import { CORRECTION_MODEL, CORRECTION_VERSION, readsPicturePoints } from "./correction";
import {
  ESTIMATOR_FEATURES,
  estimateFingerJointDeg,
  FINGER_FEATURES,
  fingerPictureFeatures,
  modelFingerFeatures,
  PICTURE_FEATURES,
  usesPicture,
} from "./estimator";
import { BONES_MM, neutralPose, PINHOLE_ASPECT, pinholeFingerPicture, pinholePicture, poseHand, type Placement } from "./testing/synthetic-hand";
import { UNCERTAINTY_TABLE, type UncertaintyTable } from "./uncertainty";

// Exact synthetic hands (vision/testing) under a pinhole: these check the picture geometry and the engine's plumbing,
// not the tracker. A right hand held up, little-finger side toward the camera (ulnar view), z pointing away.
const ULNAR_VIEW: Placement = { forearmDistal: [0, -1, 0], forearmRadial: [0, 0, 1], wrist: [0, 0, 0.5] };
// The same hand seen from the palm: the fingers bend toward the camera, along its line of sight.
const PALM_VIEW: Placement = { forearmDistal: [0, -1, 0], forearmRadial: [1, 0, 0], wrist: [0, 0, 0.5] };

function middleFinger(mcp: number, pip: number, dip: number, placement: Placement) {
  const pose = neutralPose();
  pose.fingers.middle = { mcpFlexionDeg: mcp, radialAbductionDeg: 0, pipFlexionDeg: pip, dipFlexionDeg: dip };
  return poseHand(pose, "right", placement).landmarks;
}

const pictureOf = pinholeFingerPicture;
const named = (values: number[], name: (typeof PICTURE_FEATURES)[number]) => values[PICTURE_FEATURES.indexOf(name)];

describe("finger features read in the picture", () => {
  it("reads the joint angles of a finger bending square to the camera exactly", () => {
    // Seen from the side, the middle finger bends in a plane at one depth; a pinhole maps such a plane to the picture
    // by a similarity, which keeps angles and length ratios [projective geometry, common practice].
    for (const [mcp, pip, dip] of [
      [0, 0, 0],
      [30, 60, 20],
      [70, 95, 60],
    ]) {
      const f = fingerPictureFeatures(pictureOf(middleFinger(mcp, pip, dip, ULNAR_VIEW)), "middle")!;
      expect(named(f, "mcpPictureDeg")).toBeCloseTo(mcp, 6);
      expect(named(f, "pipPictureDeg")).toBeCloseTo(pip, 6);
      expect(named(f, "dipPictureDeg")).toBeCloseTo(dip, 6);
    }
  });

  it("gives the tip's reach by the law of cosines and the distal-to-middle length ratio of the bones", () => {
    const [a, b, c] = BONES_MM.middle.phalanges;
    for (const pip of [0, 45, 90]) {
      const f = fingerPictureFeatures(pictureOf(middleFinger(0, pip, 0, ULNAR_VIEW)), "middle")!;
      // Only the PIP bends: the tip lies sqrt(a^2 + d^2 + 2ad cos(pip)) from the MCP, d the middle and distal in line.
      const d = b + c;
      expect(named(f, "tipToMcpPicture")).toBeCloseTo(Math.sqrt(a * a + d * d + 2 * a * d * Math.cos((pip * Math.PI) / 180)) / (a + b + c), 6);
      expect(named(f, "distalOverMiddlePicture")).toBeCloseTo(c / b, 6);
    }
  });

  it("sees no turn where the finger bends along the line of sight: the 3-D features carry that", () => {
    const hand = middleFinger(0, 60, 0, PALM_VIEW);
    const f = fingerPictureFeatures(pictureOf(hand), "middle")!;
    expect(named(f, "pipPictureDeg")).toBeLessThan(1e-6);
    // The world landmarks still read the bend.
    const world = modelFingerFeatures({ features: FINGER_FEATURES }, hand, "right", "middle", null, null)!;
    expect(world[FINGER_FEATURES.indexOf("pipDeg")]).toBeCloseTo(60, 6);
  });

  it("declines a picture without all 21 points or without its aspect", () => {
    const picture = pictureOf(middleFinger(0, 30, 0, ULNAR_VIEW));
    expect(fingerPictureFeatures({ ...picture, image: picture.image.slice(0, 20) }, "middle")).toBeNull();
    expect(fingerPictureFeatures({ ...picture, aspect: 0 }, "middle")).toBeNull();
  });
});

describe("the committed estimator reads the picture (since kinarc-correction-6)", () => {
  const estimator = CORRECTION_MODEL.fingerEstimator!;
  const hand = middleFinger(0, 50, 25, ULNAR_VIEW);

  it("lists the world features then the picture features, and needs a frame's picture to read it", () => {
    expect(CORRECTION_VERSION).toBe("kinarc-correction-11");
    expect(estimator.features).toEqual([...ESTIMATOR_FEATURES]);
    expect(ESTIMATOR_FEATURES).toEqual([...FINGER_FEATURES, ...PICTURE_FEATURES]);
    expect(usesPicture(estimator)).toBe(true);
    const withPicture = estimateFingerJointDeg(estimator, "lite", "pip", hand, "right", "middle", undefined, pictureOf(hand));
    expect(withPicture).not.toBeNull();
    // Without the picture it declines (the raw angle then stands) rather than guess the missing features.
    expect(estimateFingerJointDeg(estimator, "lite", "pip", hand, "right", "middle")).toBeNull();
    expect(modelFingerFeatures(estimator, hand, "right", "middle", null, null)).toBeNull();
  });

  it("is kept for finger flexion captures and not for the wrist or the thumb", () => {
    expect(readsPicturePoints(CORRECTION_MODEL, "pip.flexion", "ring")).toBe(true);
    expect(readsPicturePoints(CORRECTION_MODEL, "mcp.flexion", "index")).toBe(true);
    expect(readsPicturePoints(CORRECTION_MODEL, "dip.flexion", "little")).toBe(true);
    expect(readsPicturePoints(CORRECTION_MODEL, "wrist.flexion", null)).toBe(false);
    expect(readsPicturePoints(CORRECTION_MODEL, "mcp.flexion", "thumb")).toBe(false);
    expect(readsPicturePoints(CORRECTION_MODEL, "finger.abduction", "index")).toBe(false);
  });

  it("a live attempt records the picture, and the server's reading of the file is the estimator's on those points", () => {
    // The cell's policy comes from the report; here it is set to "helps" so the check is of the engine's path.
    const table: UncertaintyTable = {
      ...UNCERTAINTY_TABLE,
      cells: UNCERTAINTY_TABLE.cells.map((c) => (c.group === "PIP flexion" ? { ...c, correctionHelps: true, correctedMaeDeg: c.correctedMaeDeg ?? c.rawMaeDeg } : c)),
    };
    const target = { motion: "pip.flexion", side: "right", digit: "middle", condition: "against_gravity" } as const;
    const recorder = new CaptureRecorder(target);
    const hands: ReturnType<typeof middleFinger>[] = [];
    for (let i = 0; i <= 90; i++) {
      const pip = 70 * Math.sin((Math.PI * i) / 90) ** 2;
      const frameHand = middleFinger(0, pip, pip / 2, ULNAR_VIEW);
      hands.push(frameHand);
      recorder.push({ t: (i * 1000) / 30, score: 0.95, hand: frameHand.map((p): [number, number, number] => [p[0], p[1], p[2]]), image: pinholePicture(frameHand), imageAspect: PINHOLE_ASPECT });
    }
    const capture = parseCapture(JSON.parse(JSON.stringify(recorder.finish())), "recorded");
    expect(capture.imageAspect).toBeCloseTo(PINHOLE_ASPECT, 12);
    expect(capture.frames.every((f) => f.image?.length === 21)).toBe(true);

    const angles: (number | null)[] = [];
    const analysis = analyzeCapture(capture, { uncertaintyTable: table, onUpdate: (u) => angles.push(u.angleDeg) });
    expect(analysis.method).toBe(`world3d+${CORRECTION_VERSION}`);
    // Independently, frame by frame: the estimator on the file's own points (rounded to 1e-5 of the picture).
    let compared = 0;
    capture.frames.forEach((frame, i) => {
      const expected = estimateFingerJointDeg(estimator, "lite", "pip", hands[i], "right", "middle", undefined, { image: frame.image!, aspect: capture.imageAspect! });
      if (expected === null) return;
      expect(angles[i]).toBeCloseTo(expected, 6);
      compared++;
    });
    expect(compared).toBeGreaterThan(capture.frames.length / 2);

    // An older file without the picture's aspect: the estimator declines and the raw 3-D angles stand.
    const older = analyzeCapture({ ...capture, imageAspect: undefined }, { uncertaintyTable: table });
    expect(older.method).toBe("world3d");
    expect(older.correctionVersion).toBeNull();
  });
});
