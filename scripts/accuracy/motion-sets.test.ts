import { describe, expect, it } from "vitest";
import { MOTIONS, type MotionId } from "@/lib/motions/catalog";
import { getPoseAngle, POSE_KEYS } from "./hand-pose";
import { FINGER_FLEXION_SET, FINGER_FLEXION_VIEWS, fingerFlexionFrame, MOTION_SETS, motionFrame } from "./motion-sets";
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
