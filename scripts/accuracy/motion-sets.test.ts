import { describe, expect, it } from "vitest";
import { MOTIONS, type MotionId } from "@/lib/motions/catalog";
import { getPoseAngle, POSE_KEYS } from "./hand-pose";
import {
  FINGER_FLEXION_SET,
  FINGER_FLEXION_VIEWS,
  fingerFlexionFrame,
  HAND_SHAPE_NAMES,
  HAND_SHAPE_SET,
  HAND_SHAPE_DOWN_VIEWS,
  HAND_SHAPE_VIEWS,
  handShapeFrame,
  MOTION_SETS,
  motionFrame,
} from "./motion-sets";
import { loadHandRig } from "./rig-files";
import { frameSeeds } from "./scene";

const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };
const VIEWS_FOR_CATALOG_VIEW = { side: ["radial", "ulnar"], overhead: ["down"], front: ["palm", "back"] } as const;

describe("motion sets", () => {
  it.each(MOTION_SETS.map((set) => [set.id, set] as const))("%s is seen from the view the motion catalog recommends", (id, set) => {
    const recommended = VIEWS_FOR_CATALOG_VIEW[MOTIONS[id as MotionId].cameraView];
    for (const view of set.views) expect(recommended).toContain(view);
  });

  it.each(MOTION_SETS.map((set) => [set.id, set] as const))("%s spans its range on the tested joints and keeps the others near rest", (_, set) => {
    const frames = frameSeeds(9, 60).map((seed) => motionFrame(rigs, seed, set));
    const tested = frames.flatMap((f) => set.keys.map((key) => getPoseAngle(f.truth.commandedDeg, key)));
    const span = set.rangeDeg[1] - set.rangeDeg[0];
    expect(Math.min(...tested)).toBeLessThan(set.rangeDeg[0] + 0.1 * span);
    expect(Math.max(...tested)).toBeGreaterThan(set.rangeDeg[1] - 0.1 * span);
    for (const frame of frames) {
      for (const key of POSE_KEYS) {
        if (!set.keys.includes(key)) expect(Math.abs(getPoseAngle(frame.truth.commandedDeg, key))).toBeLessThanOrEqual(5);
      }
      expect(set.views).toContain(frame.truth.view);
      expect(frame.truth.distanceM).toBeLessThanOrEqual(0.7);
    }
    expect(new Set(frames.map((f) => f.truth.side))).toEqual(new Set(["left", "right"]));
  });

  it("is reproducible from its seed", () => {
    const set = MOTION_SETS[1];
    expect(JSON.stringify(motionFrame(rigs, 5, set))).toBe(JSON.stringify(motionFrame(rigs, 5, set)));
  });
});

describe("the fingers-flexed-together training set", () => {
  const frames = frameSeeds(11, 70).map((seed, i) => fingerFlexionFrame(rigs, seed, i));
  const joint = (f: (typeof frames)[number], key: string) => getPoseAngle(f.truth.commandedDeg, key as (typeof POSE_KEYS)[number]);

  it("flexes MCP, PIP and DIP of every finger across their ranges, sometimes together like a fist and sometimes apart", () => {
    for (const key of ["index.mcpFlexionDeg", "ring.pipFlexionDeg", "little.dipFlexionDeg"]) {
      const values = frames.map((f) => joint(f, key));
      expect(Math.min(...values)).toBeLessThan(15);
      expect(Math.max(...values)).toBeGreaterThan(65);
    }
    const fistLike = frames.filter((f) => joint(f, "middle.mcpFlexionDeg") > 60 && joint(f, "middle.pipFlexionDeg") > 60);
    const apart = frames.filter((f) => Math.abs(joint(f, "middle.mcpFlexionDeg") / 90 - joint(f, "middle.pipFlexionDeg") / 100) > 0.5);
    expect(fistLike.length).toBeGreaterThan(3);
    expect(apart.length).toBeGreaterThan(3);
    for (const f of frames) {
      expect(f.motion).toBe(FINGER_FLEXION_SET);
      expect(f.truth.view).toBe(FINGER_FLEXION_VIEWS[frames.indexOf(f) % FINGER_FLEXION_VIEWS.length]);
      expect(Math.abs(joint(f, "wrist.flexionDeg"))).toBeLessThanOrEqual(5);
    }
  });

  it("is reproducible from its seed", () => {
    expect(JSON.stringify(fingerFlexionFrame(rigs, 5, 2))).toBe(JSON.stringify(fingerFlexionFrame(rigs, 5, 2)));
  });
});

describe("the whole-hand-shape stills (palm, back and oblique views)", () => {
  const frames = frameSeeds(13, 140).map((seed, i) => handShapeFrame(rigs, seed, i));
  const fingers = ["index", "middle", "ring", "little"] as const;
  const joint = (f: (typeof frames)[number], finger: string, dof: string) => getPoseAngle(f.truth.commandedDeg, `${finger}.${dof}` as (typeof POSE_KEYS)[number]);

  it("takes the views it is given: the second fit's stills are all seen from above the back of the hand", () => {
    const down = frameSeeds(13, 12).map((seed, i) => handShapeFrame(rigs, seed, i, HAND_SHAPE_DOWN_VIEWS));
    for (const f of down) expect(f.truth.view).toBe("down");
    // The same seed and index draw the same shape whatever the view list (only the camera differs).
    expect(down.map((f) => f.shape)).toEqual(frames.slice(0, 12).map((f) => f.shape));
  });

  it("takes the views in turn and bends all four fingers alike", () => {
    frames.forEach((f, i) => {
      expect(f.truth.view).toBe(HAND_SHAPE_VIEWS[i % HAND_SHAPE_VIEWS.length]);
      expect(f.motion).toBe(HAND_SHAPE_SET);
      for (const dof of ["mcpFlexionDeg", "pipFlexionDeg", "dipFlexionDeg"]) {
        const values = fingers.map((finger) => joint(f, finger, dof));
        // One shared level per joint, each finger within FINGER_SPREAD_DEG (4) of it.
        expect(Math.max(...values) - Math.min(...values)).toBeLessThanOrEqual(8 + 1e-9);
      }
    });
  });

  it("draws every named shape with its tendon-gliding joint pattern [common practice]", () => {
    const byShape = (name: string) => frames.filter((f) => f.shape === name);
    for (const name of HAND_SHAPE_NAMES) expect(byShape(name).length).toBeGreaterThan(5);
    const each = (name: string, check: (mcp: number, pip: number, dip: number) => boolean) => {
      for (const f of byShape(name)) for (const finger of fingers) {
        expect(check(joint(f, finger, "mcpFlexionDeg"), joint(f, finger, "pipFlexionDeg"), joint(f, finger, "dipFlexionDeg"))).toBe(true);
      }
    };
    // Open hand: straight fingers; full fist: every joint well bent; straight fist: DIP straight; hook: MCP straight,
    // PIP and DIP bent; tabletop: MCP bent, PIP and DIP straight.
    each("open", (m, p, d) => m <= 15 && p <= 15 && d <= 15);
    each("fist", (m, p, d) => m >= 60 && p >= 80 && d >= 40);
    each("straight fist", (m, p, d) => m >= 60 && p >= 80 && d <= 20);
    each("hook", (m, p, d) => m <= 20 && p >= 65 && d >= 40);
    each("tabletop", (m, p, d) => m >= 60 && p <= 15 && d <= 15);
  });

  it("brings the thumb in as the hand closes", () => {
    const thumb = (f: (typeof frames)[number]) => getPoseAngle(f.truth.commandedDeg, "thumb.mcpFlexionDeg");
    const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
    expect(mean(frames.filter((f) => f.shape === "fist").map(thumb))).toBeGreaterThan(mean(frames.filter((f) => f.shape === "open").map(thumb)) + 20);
  });

  it("is reproducible from its seed", () => {
    expect(JSON.stringify(handShapeFrame(rigs, 5, 1))).toBe(JSON.stringify(handShapeFrame(rigs, 5, 1)));
  });
});
