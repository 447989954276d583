import { describe, expect, it } from "vitest";
import { handAxes, readMotion } from "./angles";
import { CORRECTION_MODEL, correctGroupAngle, correctGroupReading, HAND_SHAPE_DOWN_MODEL, HAND_SHAPE_MODEL, HAND_SHAPE_SIDE_MODEL } from "./correction";
import { estimateHandShapeJointDeg, HAND_SHAPE_VIEWS, handShapeFeatureRows, handShapeUsesPicture, isWholeHandShape } from "./correction-hand-shape";
import { viewFromHand, viewOfHand } from "./correction-views";
import { applyFingerFit, estimateFingerJointDeg, FINGER_FEATURES, type FingerJoint, PICTURE_FEATURES } from "./estimator";
import type { HandLandmarks } from "./landmarks";
import { neutralPose, pinholeFingerPicture, poseHand, type Placement, type HandPose } from "./testing/synthetic-hand";

// A right hand held up, fingers toward the top of the picture (z points away from the camera): palm toward the camera,
// back toward it, or thumb side toward it. Palm and back are tilted a little, as a held hand is: seen exactly square,
// a bend lies wholly in depth and its image-plane angle is undefined (the estimator then declines).
const PALM_VIEW: Placement = { forearmDistal: [0, -1, 0.2], forearmRadial: [1, 0, 0.15], wrist: [0, 0, 0.5] };
const BACK_VIEW: Placement = { forearmDistal: [0, -1, -0.2], forearmRadial: [-1, 0, 0.15], wrist: [0, 0, 0.5] };
const RADIAL_VIEW: Placement = { forearmDistal: [0, -1, 0], forearmRadial: [0, 0, -1], wrist: [0, 0, 0.5] };
const ULNAR_VIEW: Placement = { forearmDistal: [0, -1, 0], forearmRadial: [0, 0, 1], wrist: [0, 0, 0.5] };
// A right hand lying flat on a table, the camera above its back in front of the fingertips, tilted 55 degrees down
// (scripts/accuracy/scene.ts `down`): the fingers point down the picture and partly toward the camera.
const DOWN_TILT = (55 * Math.PI) / 180;
const DOWN_VIEW: Placement = { forearmDistal: [0, Math.sin(DOWN_TILT), -Math.cos(DOWN_TILT)], forearmRadial: [1, 0, 0], wrist: [0, -0.05, 0.5] };
const FINGERS = ["index", "middle", "ring", "little"] as const;

/** All four fingers in one shape, as the app asks a client to bend them. */
function handShape(mcpDeg: number, pipDeg: number, dipDeg: number): HandPose {
  const pose = neutralPose();
  for (const finger of FINGERS) pose.fingers[finger] = { ...pose.fingers[finger], mcpFlexionDeg: mcpDeg, pipFlexionDeg: pipDeg, dipFlexionDeg: dipDeg };
  return pose;
}

function viewOf(hand: HandLandmarks) {
  const axes = handAxes(hand, "right")!;
  return viewFromHand(-axes.palmarNormal[2], -axes.radialAxis[2], -axes.longAxis[2]);
}

const features = (hand: HandLandmarks, motion: "mcp.flexion" | "pip.flexion") => {
  const axes = handAxes(hand, "right")!;
  const raw = readMotion(motion, "middle", hand, axes, null)!;
  return { deg: raw.deg, imagePlaneDeg: raw.imagePlaneDeg, planeFacing: 1, radialTowardCamera: -axes.radialAxis[2], palmTowardCamera: -axes.palmarNormal[2], hand, side: "right" as const, axes, picture: pinholeFingerPicture(hand) };
};

describe("the whole-hand-shape estimator (vision/correction-hand-shape.json)", () => {
  it("is fitted for both hand models and every finger joint, on training seeds only, for the palm, back and oblique views", () => {
    expect(Object.keys(HAND_SHAPE_MODEL.fits).sort()).toEqual(["full", "lite"]);
    for (const fits of Object.values(HAND_SHAPE_MODEL.fits)) expect(Object.keys(fits).sort()).toEqual(["dip", "mcp", "pip"]);
    expect([...HAND_SHAPE_MODEL.views]).toEqual([...HAND_SHAPE_VIEWS]);
    expect(HAND_SHAPE_MODEL.trainingSets.length).toBeGreaterThan(0);
    // Training seeds are 77000xxx; 2026120x and 2026121x are held out (scripts/accuracy/hand-shape-fit.ts assertTrainingSet).
    for (const name of HAND_SHAPE_MODEL.trainingSets) expect(name).toMatch(/-77000\d{3}-/);
    expect(HAND_SHAPE_MODEL.features.slice(0, FINGER_FEATURES.length)).toEqual([...FINGER_FEATURES]);
  });

  it("synthetic hands are seen from the view they were placed for", () => {
    expect(viewOf(poseHand(handShape(0, 0, 0), "right", PALM_VIEW).landmarks)).toBe("palm");
    expect(viewOf(poseHand(handShape(0, 0, 0), "right", BACK_VIEW).landmarks)).toBe("back");
    expect(viewOf(poseHand(handShape(0, 0, 0), "right", RADIAL_VIEW).landmarks)).toBe("radial");
  });

  it("both committed fits read the picture features too (since kinarc-correction-7): without a frame's picture the raw angle stands", () => {
    for (const model of [HAND_SHAPE_MODEL, HAND_SHAPE_DOWN_MODEL]) {
      expect(handShapeUsesPicture(model)).toBe(true);
      expect(model.features.slice(FINGER_FEATURES.length + 4)).toEqual([...PICTURE_FEATURES]);
    }
    const hand = poseHand(handShape(20, 30, 20), "right", PALM_VIEW).landmarks;
    const withPicture = estimateHandShapeJointDeg(HAND_SHAPE_MODEL, "lite", "pip", hand, "right", "middle", undefined, pinholeFingerPicture(hand));
    expect(withPicture).not.toBeNull();
    expect(estimateHandShapeJointDeg(HAND_SHAPE_MODEL, "lite", "pip", hand, "right", "middle")).toBeNull();
    expect(estimateHandShapeJointDeg(HAND_SHAPE_MODEL, "lite", "pip", hand, "right", "middle", undefined, null)).toBeNull();
  });

  it("reads only in its own views: from the thumb side the side-view estimator answers, unchanged", () => {
    const hand = poseHand(handShape(10, 60, 30), "right", RADIAL_VIEW).landmarks;
    for (const joint of ["mcp", "pip", "dip"] as FingerJoint[]) {
      expect(estimateHandShapeJointDeg(HAND_SHAPE_MODEL, "lite", joint, hand, "right", "middle", undefined, pinholeFingerPicture(hand))).toBeNull();
    }
    const sideView = estimateFingerJointDeg(CORRECTION_MODEL.fingerEstimator!, "lite", "pip", hand, "right", "middle", undefined, pinholeFingerPicture(hand));
    expect(correctGroupAngle(CORRECTION_MODEL, "lite", "PIP flexion", features(hand, "pip.flexion"), "middle")).toBe(sideView);
  });

  it("in the palm and back views the group API gives the hand-shape estimate (or the raw angle's null), never the side-view fit", () => {
    let read = 0;
    for (const placement of [PALM_VIEW, BACK_VIEW]) {
      for (const [mcp, pip, dip] of [[0, 0, 0], [20, 30, 20], [45, 60, 40]]) {
        const hand = poseHand(handShape(mcp, pip, dip), "right", placement).landmarks;
        const own = estimateHandShapeJointDeg(HAND_SHAPE_MODEL, "lite", "pip", hand, "right", "middle", undefined, pinholeFingerPicture(hand));
        expect(correctGroupAngle(CORRECTION_MODEL, "lite", "PIP flexion", features(hand, "pip.flexion"), "middle")).toBe(own);
        if (own !== null) {
          read += 1;
          // Independently: the fit applied by hand to this finger's feature row.
          const rows = handShapeFeatureRows(hand, "right", handAxes(hand, "right")!, HAND_SHAPE_MODEL.wholeHandFeatures, pinholeFingerPicture(hand))!;
          expect(own).toBeCloseTo(applyFingerFit(HAND_SHAPE_MODEL.fits.lite!.pip!, rows.middle), 9);
        }
      }
    }
    // Exact synthetic geometry is not the tracker's, but some of these plain shapes must lie in the fit's domain.
    expect(read).toBeGreaterThan(0);
  });

  it("declines the whole hand when one finger lies outside what training saw (not a whole-hand shape)", () => {
    const hand = poseHand(handShape(0, 0, 0), "right", PALM_VIEW).landmarks.map((p) => [...p] as [number, number, number]);
    // The index fingertip thrown 20 cm off, a gross misreading no training still holds.
    hand[8] = [hand[8][0] + 0.2, hand[8][1] - 0.2, hand[8][2] - 0.1];
    for (const finger of FINGERS) expect(estimateHandShapeJointDeg(HAND_SHAPE_MODEL, "lite", "mcp", hand, "right", finger, undefined, pinholeFingerPicture(hand))).toBeNull();
  });

  it("reads four fingers curled together but declines one finger curled beside straight ones (not a whole-hand shape)", () => {
    for (const [mcp, pip, dip] of [[90, 100, 80], [0, 100, 80], [60, 90, 60]]) {
      const together = poseHand(handShape(mcp, pip, dip), "right", PALM_VIEW).landmarks;
      const alone = neutralPose();
      alone.fingers.ring = { ...alone.fingers.ring, mcpFlexionDeg: mcp, pipFlexionDeg: pip, dipFlexionDeg: dip };
      const oneFinger = poseHand(alone, "right", PALM_VIEW).landmarks;
      for (const handModel of ["lite", "full"]) {
        const rows = (hand: HandLandmarks) => handShapeFeatureRows(hand, "right", handAxes(hand, "right")!, HAND_SHAPE_MODEL.wholeHandFeatures, pinholeFingerPicture(hand))!;
        expect(isWholeHandShape(HAND_SHAPE_MODEL.handSpread[handModel], rows(together))).toBe(true);
        expect(isWholeHandShape(HAND_SHAPE_MODEL.handSpread[handModel], rows(oneFinger))).toBe(false);
        expect(estimateHandShapeJointDeg(HAND_SHAPE_MODEL, handModel, "pip", oneFinger, "right", "ring", undefined, pinholeFingerPicture(oneFinger))).toBeNull();
      }
      // A curled hand reads as curled: PIP well past the halfway mark of its 0-100 degree range [common practice: PIP AROM 0-100].
      expect(estimateHandShapeJointDeg(HAND_SHAPE_MODEL, "lite", "pip", together, "right", "middle", undefined, pinholeFingerPicture(together))!).toBeGreaterThan(50);
    }
  });

  it("adds the four fingers' mean curl when the fit asks for whole-hand features", () => {
    const hand = poseHand(handShape(30, 40, 20), "right", PALM_VIEW).landmarks;
    const axes = handAxes(hand, "right")!;
    const own = handShapeFeatureRows(hand, "right", axes, false)!;
    const whole = handShapeFeatureRows(hand, "right", axes, true)!;
    expect(whole.index).toHaveLength(FINGER_FEATURES.length + 4);
    const tipToWrist = FINGER_FEATURES.indexOf("tipToWrist");
    const mean = FINGERS.reduce((sum, f) => sum + own[f][tipToWrist], 0) / 4;
    expect(whole.ring[FINGER_FEATURES.length + 2]).toBeCloseTo(mean, 12);
    expect(whole.ring.slice(0, FINGER_FEATURES.length)).toEqual(own.ring);
  });
});

describe("the whole-hand-shape estimator's second fit, from above the back of a hand (vision/correction-hand-shape-down.json)", () => {
  it("is fitted for both hand models and every finger joint, on training seeds only, for the down view alone", () => {
    expect(Object.keys(HAND_SHAPE_DOWN_MODEL.fits).sort()).toEqual(["full", "lite"]);
    for (const fits of Object.values(HAND_SHAPE_DOWN_MODEL.fits)) expect(Object.keys(fits).sort()).toEqual(["dip", "mcp", "pip"]);
    expect([...HAND_SHAPE_DOWN_MODEL.views]).toEqual(["down"]);
    for (const name of HAND_SHAPE_DOWN_MODEL.trainingSets) expect(name).toMatch(/-77000\d{3}-/);
    // The two fits share no view, so which one reads a frame never depends on their order.
    expect(HAND_SHAPE_DOWN_MODEL.views.some((v) => HAND_SHAPE_MODEL.views.includes(v))).toBe(false);
  });

  it("a hand seen from above its back reads through the second fit (or the raw angle's null), never the first or the side-view fit", () => {
    expect(viewOf(poseHand(handShape(0, 0, 0), "right", DOWN_VIEW).landmarks)).toBe("down");
    let read = 0;
    for (const [mcp, pip, dip] of [[0, 0, 0], [20, 30, 20], [45, 60, 40], [80, 90, 60]]) {
      const hand = poseHand(handShape(mcp, pip, dip), "right", DOWN_VIEW).landmarks;
      expect(estimateHandShapeJointDeg(HAND_SHAPE_MODEL, "lite", "pip", hand, "right", "middle", undefined, pinholeFingerPicture(hand))).toBeNull();
      const own = estimateHandShapeJointDeg(HAND_SHAPE_DOWN_MODEL, "lite", "pip", hand, "right", "middle", undefined, pinholeFingerPicture(hand));
      expect(correctGroupAngle(CORRECTION_MODEL, "lite", "PIP flexion", features(hand, "pip.flexion"), "middle")).toBe(own);
      if (own !== null) {
        read += 1;
        const rows = handShapeFeatureRows(hand, "right", handAxes(hand, "right")!, HAND_SHAPE_DOWN_MODEL.wholeHandFeatures, pinholeFingerPicture(hand))!;
        expect(own).toBeCloseTo(applyFingerFit(HAND_SHAPE_DOWN_MODEL.fits.lite!.pip!, rows.middle), 9);
      }
    }
    expect(read).toBeGreaterThan(0);
  });
});

describe("the side-on whole-hand-shape fit, read where the side-view estimator declines (vision/correction-hand-shape-side.json)", () => {
  it("is fitted for both hand models and every finger joint, on training seeds only, for the two side views, and reads only declined frames", () => {
    expect(Object.keys(HAND_SHAPE_SIDE_MODEL.fits).sort()).toEqual(["full", "lite"]);
    for (const fits of Object.values(HAND_SHAPE_SIDE_MODEL.fits)) expect(Object.keys(fits).sort()).toEqual(["dip", "mcp", "pip"]);
    expect([...HAND_SHAPE_SIDE_MODEL.views].sort()).toEqual(["radial", "ulnar"]);
    expect(HAND_SHAPE_SIDE_MODEL.onlyWhereSideFitDeclines).toBe(true);
    for (const name of HAND_SHAPE_SIDE_MODEL.trainingSets) expect(name).toMatch(/-77000\d{3}-/);
    expect(handShapeUsesPicture(HAND_SHAPE_SIDE_MODEL)).toBe(true);
    // No other fit reads these views on its own, so the side-view estimator keeps every frame it accepts.
    for (const other of [HAND_SHAPE_MODEL, HAND_SHAPE_DOWN_MODEL]) expect(other.views.some((v) => HAND_SHAPE_SIDE_MODEL.views.includes(v))).toBe(false);
  });

  it("leaves every frame the side-view estimator reads to it, and reads the ones it declines (a fist among them)", () => {
    const readers = new Set<string>();
    for (const placement of [RADIAL_VIEW, ULNAR_VIEW]) {
      for (const [mcp, pip, dip] of [[0, 0, 0], [20, 30, 20], [45, 60, 40], [70, 90, 60], [90, 100, 80], [0, 90, 70]]) {
        const hand = poseHand(handShape(mcp, pip, dip), "right", placement).landmarks;
        const axes = handAxes(hand, "right")!;
        const view = viewOfHand(hand, axes, "right");
        expect(["radial", "ulnar"]).toContain(view);
        for (const [joint, group, motion] of [["mcp", "MCP flexion", "mcp.flexion"], ["pip", "PIP flexion", "pip.flexion"]] as const) {
          const picture = pinholeFingerPicture(hand);
          const sideView = estimateFingerJointDeg(CORRECTION_MODEL.fingerEstimator!, "lite", joint, hand, "right", "middle", axes, picture, view);
          const sideOn = estimateHandShapeJointDeg(HAND_SHAPE_SIDE_MODEL, "lite", joint, hand, "right", "middle", axes, picture, view);
          const reading = correctGroupReading(CORRECTION_MODEL, "lite", group, features(hand, motion), "middle");
          if (sideView !== null) expect(reading).toEqual({ deg: sideView, reader: "finger" });
          else if (sideOn !== null) expect(reading).toEqual({ deg: sideOn, reader: "side-on hand shape" });
          else expect(reading).toBeNull();
          if (reading) readers.add(reading.reader);
        }
      }
    }
    expect([...readers].sort()).toEqual(["finger", "side-on hand shape"]);
  });

  it("reads a full fist seen side-on as curled, where the side-view estimator declines it", () => {
    for (const placement of [RADIAL_VIEW, ULNAR_VIEW]) {
      const hand = poseHand(handShape(90, 100, 80), "right", placement).landmarks;
      const axes = handAxes(hand, "right")!;
      const view = viewOfHand(hand, axes, "right");
      expect(estimateFingerJointDeg(CORRECTION_MODEL.fingerEstimator!, "lite", "pip", hand, "right", "middle", axes, pinholeFingerPicture(hand), view)).toBeNull();
      // Past the halfway mark of MCP 0-90 and PIP 0-100 [common practice: AROM norms, from memory].
      expect(correctGroupReading(CORRECTION_MODEL, "lite", "MCP flexion", features(hand, "mcp.flexion"), "middle")!.deg).toBeGreaterThan(45);
      expect(correctGroupReading(CORRECTION_MODEL, "lite", "PIP flexion", features(hand, "pip.flexion"), "middle")!.deg).toBeGreaterThan(50);
    }
  });
});
