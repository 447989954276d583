import { describe, expect, it } from "vitest";
import { getPoseAngle, POSE_KEYS } from "./hand-pose";
import { loadHandRig } from "./rig-files";
import { CAMERA_VIEWS, frameSeeds, IMAGE_HEIGHT_PX, IMAGE_WIDTH_PX, randomFrame, VERTICAL_FOV_DEG } from "./scene";
import { buildSweepFrames, sweepAnglesDeg, sweptAnglesOf, turnInOffsetsDeg, validateSweepOptions, type SweepOptions } from "./sweep";

const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };

// Landmark indices in the hand landmark model's order (Zhang et al. 2020, arXiv:2006.10214, fig. 2).
const WRIST = 0;
const THUMB_CMC = 1;
const INDEX_MCP = 5;
const MIDDLE_MCP = 9;
const LITTLE_MCP = 17;

describe("seeded sampling", () => {
  it("gives the same frames for the same seed and different ones for another", () => {
    const first = frameSeeds(7, 20).map((seed) => randomFrame(rigs, seed));
    const again = frameSeeds(7, 20).map((seed) => randomFrame(rigs, seed));
    expect(JSON.stringify(again)).toBe(JSON.stringify(first));
    const other = frameSeeds(8, 20).map((seed) => randomFrame(rigs, seed));
    const differing = other.filter(
      (frame, i) => getPoseAngle(frame.truth.commandedDeg, "index.pipFlexionDeg") !== getPoseAngle(first[i].truth.commandedDeg, "index.pipFlexionDeg"),
    );
    expect(differing.length).toBe(20);
  });

  it("covers every view, both sides, 0.3-1.0 m, several skins, lights and backgrounds", () => {
    const truths = frameSeeds(3, 300).map((seed) => randomFrame(rigs, seed).truth);
    expect(new Set(truths.map((t) => t.view))).toEqual(new Set(CAMERA_VIEWS));
    expect(new Set(truths.map((t) => t.side))).toEqual(new Set(["left", "right"]));
    expect(new Set(truths.map((t) => t.lightingKind))).toEqual(new Set(["normal", "dim", "flat"]));
    expect(new Set(truths.map((t) => t.skinHex)).size).toBeGreaterThanOrEqual(6);
    expect(new Set(truths.map((t) => t.background)).size).toBeGreaterThanOrEqual(6);
    const distances = truths.map((t) => t.distanceM);
    expect(Math.min(...distances)).toBeGreaterThanOrEqual(0.3);
    expect(Math.max(...distances)).toBeLessThanOrEqual(1.0);
    expect(Math.max(...distances) - Math.min(...distances)).toBeGreaterThan(0.6);
  });

  it("rejects a seed that is not an integer, naming the field", () => {
    expect(() => randomFrame(rigs, 1.5)).toThrow(/seed: expected an integer/);
  });
});

describe("camera and projection", () => {
  it("projects landmarks as an ideal pinhole camera would (Hartley & Zisserman, Multiple View Geometry, eq. 6.1)", () => {
    // Independent of three's projection: x_px = cx + f * X / Z with f = (H/2) / tan(fov/2), y likewise (y down).
    const focalPx = IMAGE_HEIGHT_PX / 2 / Math.tan((VERTICAL_FOV_DEG * Math.PI) / 360);
    for (const seed of frameSeeds(11, 30)) {
      const { truth } = randomFrame(rigs, seed);
      truth.landmarksCameraM.forEach(([x, y, z], i) => {
        expect(z).toBeGreaterThan(0.1);
        expect(IMAGE_WIDTH_PX / 2 + (focalPx * x) / z).toBeCloseTo(truth.landmarksImagePx[i][0], 0);
        expect(IMAGE_HEIGHT_PX / 2 + (focalPx * y) / z).toBeCloseTo(truth.landmarksImagePx[i][1], 0);
      });
    }
  });

  it("places the wrist at the commanded distance from the camera, within the hand's own size", () => {
    for (const seed of frameSeeds(12, 40)) {
      const { truth } = randomFrame(rigs, seed);
      const depth = Math.hypot(...truth.landmarksCameraM[WRIST]);
      expect(Math.abs(depth - truth.distanceM)).toBeLessThan(0.15);
    }
  });

  it("sees the side each view names", () => {
    // Depth (z, away from the camera) of landmarks tells which side faces the camera.
    for (const seed of frameSeeds(13, 120)) {
      const { truth } = randomFrame(rigs, seed, { views: ["radial", "ulnar", "palm", "back"] });
      const z = (i: number) => truth.landmarksCameraM[i][2];
      if (truth.view === "radial") expect(z(INDEX_MCP)).toBeLessThan(z(LITTLE_MCP));
      if (truth.view === "ulnar") expect(z(LITTLE_MCP)).toBeLessThan(z(INDEX_MCP));
      if (truth.view === "palm" || truth.view === "back") {
        // The palm's normal (right-handed order wrist, index MCP, little MCP; flipped for the left hand) faces
        // the camera in a palm view and away from it in a back view.
        const p = truth.landmarksCameraM;
        const a = p[INDEX_MCP].map((v, k) => v - p[WRIST][k]);
        const b = p[LITTLE_MCP].map((v, k) => v - p[WRIST][k]);
        const normalZ = (a[0] * b[1] - a[1] * b[0]) * (truth.side === "right" ? 1 : -1);
        if (truth.view === "palm") expect(normalZ).toBeLessThan(0);
        else expect(normalZ).toBeGreaterThan(0);
      }
      expect(truth.landmarksCameraM[THUMB_CMC]).toHaveLength(3);
    }
  });

  it("keeps the hand in the picture", () => {
    for (const seed of frameSeeds(14, 200)) {
      const { truth } = randomFrame(rigs, seed);
      const [x, y] = truth.landmarksImagePx[MIDDLE_MCP];
      expect(x).toBeGreaterThan(0);
      expect(x).toBeLessThan(IMAGE_WIDTH_PX);
      expect(y).toBeGreaterThan(0);
      expect(y).toBeLessThan(IMAGE_HEIGHT_PX);
    }
  });
});

describe("sweeps", () => {
  const options: SweepOptions = {
    joints: ["index.pipFlexionDeg"],
    fromDeg: 0,
    toDeg: 80,
    cycles: 3,
    cycleSeconds: 2,
    fps: 30,
    view: "radial",
    side: "right",
    seed: 5,
    distanceM: 0.45,
  };

  it("goes 0 -> 80 -> 0 three times with one peak per cycle", () => {
    const angles = sweepAnglesDeg(0, 80, 3, 60);
    expect(angles).toHaveLength(181);
    expect(angles[0]).toBeCloseTo(0, 9);
    expect(angles[180]).toBeCloseTo(0, 9);
    const peaks = angles.filter((a, i) => i > 0 && i < angles.length - 1 && a > angles[i - 1] && a >= angles[i + 1]);
    expect(peaks).toHaveLength(3);
    for (const peak of peaks) expect(peak).toBeCloseTo(80, 9);
  });

  it("moves only the named joint, with a still camera", () => {
    const frames = buildSweepFrames(rigs.right, options);
    expect(sweptAnglesOf(frames, "index.pipFlexionDeg")).toEqual(sweepAnglesDeg(0, 80, 3, 60));
    for (const frame of frames) {
      expect(frame.spec.camera.matrixWorld).toEqual(frames[0].spec.camera.matrixWorld);
      for (const key of POSE_KEYS) if (key !== "index.pipFlexionDeg") expect(getPoseAngle(frame.truth.commandedDeg, key)).toBe(0);
    }
    // The wrist and MCPs do not move in the image while only the PIP turns.
    expect(frames[30].truth.landmarksImagePx[INDEX_MCP]).toEqual(frames[0].truth.landmarksImagePx[INDEX_MCP]);
    expect(frames[30].truth.landmarksImagePx[INDEX_MCP + 2]).not.toEqual(frames[0].truth.landmarksImagePx[INDEX_MCP + 2]);
  });

  it("moves several joints through the same angles together, the others still", () => {
    const together = ["index.pipFlexionDeg", "middle.pipFlexionDeg", "ring.pipFlexionDeg", "little.pipFlexionDeg"] as const;
    const frames = buildSweepFrames(rigs.right, { ...options, joints: together, cycles: 1 });
    for (const joint of together) expect(sweptAnglesOf(frames, joint)).toEqual(sweepAnglesDeg(0, 80, 1, 60));
    for (const frame of frames) {
      for (const key of POSE_KEYS) if (!(together as readonly string[]).includes(key)) expect(getPoseAngle(frame.truth.commandedDeg, key)).toBe(0);
    }
  });

  it("holds still at the start angle for the hold, then sweeps", () => {
    const frames = buildSweepFrames(rigs.right, { ...options, cycles: 1, holdSeconds: 1 });
    const angles = sweptAnglesOf(frames, "index.pipFlexionDeg");
    expect(angles).toHaveLength(30 + 61);
    expect(angles.slice(0, 31).every((a) => a === 0)).toBe(true);
    expect(angles.slice(30)).toEqual(sweepAnglesDeg(0, 80, 1, 60));
    expect(frames[45].timeMs).toBeCloseTo(1500, 9);
  });

  it("can open turned palm-first toward the camera, then turn back and play the same clip", () => {
    const offsets = turnInOffsetsDeg(30, 45);
    expect(offsets).toHaveLength(45);
    expect(offsets[0]).toBe(30);
    expect(offsets.every((o, i) => i === 0 || o < offsets[i - 1])).toBe(true);
    expect(offsets[44]).toBeGreaterThan(0);
    expect(offsets[44]).toBeLessThan(0.1);
    for (const side of ["right", "left"] as const) {
      const plain = buildSweepFrames(rigs[side], { ...options, side, cycles: 1, holdSeconds: 1 });
      const turned = buildSweepFrames(rigs[side], { ...options, side, cycles: 1, holdSeconds: 1, turnInDeg: 30, turnInSeconds: 1.5 });
      expect(turned).toHaveLength(45 + plain.length);
      expect(sweptAnglesOf(turned, "index.pipFlexionDeg").slice(0, 45).every((a) => a === 0)).toBe(true);
      expect(JSON.stringify(turned.slice(45).map((f) => f.truth))).toBe(JSON.stringify(plain.map((f) => f.truth)));
      // From the thumb side the knuckle row is seen end-on; turned toward the palm it opens out in the picture.
      const knuckleRow = (frame: (typeof plain)[number]) => {
        const [a, b] = [frame.truth.landmarksImagePx[INDEX_MCP], frame.truth.landmarksImagePx[LITTLE_MCP]];
        return Math.hypot(a[0] - b[0], a[1] - b[1]);
      };
      expect(knuckleRow(turned[0])).toBeGreaterThan(knuckleRow(plain[0]) + 10);
      // And it is the palm that turns toward the camera: the palm's normal in camera space moves toward a palm view's.
      const palmNormal = (frame: (typeof plain)[number]) => {
        const p = frame.truth.landmarksCameraM;
        const u = [0, 1, 2].map((k) => p[INDEX_MCP][k] - p[WRIST][k]);
        const v = [0, 1, 2].map((k) => p[LITTLE_MCP][k] - p[WRIST][k]);
        const n = [u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]];
        const length = Math.hypot(...n);
        return n.map((c) => c / length);
      };
      const facing = buildSweepFrames(rigs[side], { ...options, side, view: "palm", cycles: 1 })[0];
      const angleTo = (frame: (typeof plain)[number]) => (Math.acos(palmNormal(frame).reduce((sum, c, k) => sum + c * palmNormal(facing)[k], 0)) * 180) / Math.PI;
      expect(angleTo(plain[0]) - angleTo(turned[0])).toBeGreaterThan(20);
      expect(turned[0].truth.camera.azimuthJitterDeg - plain[0].truth.camera.azimuthJitterDeg).toBeCloseTo(30 * Math.sign(turned[0].truth.camera.azimuthJitterDeg - plain[0].truth.camera.azimuthJitterDeg), 9);
    }
  });

  it("names the bad field when options are wrong", () => {
    expect(() => validateSweepOptions({ ...options, turnInDeg: 120, turnInSeconds: 1 })).toThrow(/^turnInDeg: expected degrees above 0 and at most 90/);
    expect(() => validateSweepOptions({ ...options, turnInDeg: 30 })).toThrow(/^turnInSeconds: expected a positive number of seconds/);
    expect(() => validateSweepOptions({ ...options, holdSeconds: -1 })).toThrow(/^holdSeconds: expected zero or more seconds/);
    expect(() => validateSweepOptions({ ...options, joints: ["index.pip" as never] })).toThrow(/^joints: expected some of .*got 'index\.pip'/);
    expect(() => validateSweepOptions({ ...options, joints: [] })).toThrow(/^joints: expected at least one/);
    expect(() => validateSweepOptions({ ...options, joints: ["index.pipFlexionDeg", "index.pipFlexionDeg"] })).toThrow(/^joints: expected each joint once/);
    expect(() => validateSweepOptions({ ...options, fps: 0 })).toThrow(/^fps: expected a positive number/);
    expect(() => validateSweepOptions({ ...options, view: "top" as never })).toThrow(/^view: expected one of/);
    expect(() => validateSweepOptions({ ...options, cycles: 1.5 })).toThrow(/^cycles: expected a whole number/);
  });
});
