import { Matrix4, Object3D, Quaternion, Vector3 } from "three";
import { describe, expect, it } from "vitest";
import {
  FINGERS,
  fingerJointName,
  getPoseAngle,
  JOINT_CHAIN,
  landmarkAnglesDeg,
  landmarkPositions,
  POSE_KEYS,
  POSE_RANGES_DEG,
  poseHand,
  proportionedRig,
  recoverPoseFromPositions,
  restHandAxes,
  restPose,
  setPoseAngle,
  type HandPose,
  type HandProportions,
} from "./hand-pose";
import { RIG_JOINT_NAMES, type HandRig, type RigJointName } from "./rig";
import { loadHandRig } from "./rig-files";
import { buildFrame, makeRng, placeCamera, PROPORTION_RANGES, sampleCamera, sampleLook, sampleProportions, samplePose } from "./scene";

const rigs = { left: loadHandRig("left"), right: loadHandRig("right") } as const;
const SIDES = ["left", "right"] as const;

/** Poses with only flexion set (abduction and deviation zero), drawn within the sampling ranges. */
function flexionOnlyPose(seed: number): HandPose {
  const pose = samplePose(makeRng(seed));
  for (const key of POSE_KEYS) if (/Abduction|Deviation/.test(key)) setPoseAngle(pose, key, 0);
  return pose;
}

/**
 * An independent forward kinematics: three.js's own scene graph with each joint as a child of its parent, every
 * flexion a turn about the joint's local X axis, negative for flexion (the rig fact in
 * ../shared/notes/rendered-hands.md, seen on the rig, for both the right and the mirrored left mesh).
 */
function sceneGraphPositions(rig: HandRig, pose: HandPose): Record<RigJointName, Vector3> {
  const root = new Object3D();
  const nodes = new Map<RigJointName, Object3D>();
  const restWorld = (joint: RigJointName) =>
    new Matrix4().compose(rig.joints[joint].position, rig.joints[joint].quaternion, new Vector3(1, 1, 1));
  for (const spec of JOINT_CHAIN) {
    const node = new Object3D();
    const local = spec.parent ? restWorld(spec.parent).invert().multiply(restWorld(spec.joint)) : restWorld(spec.joint);
    local.decompose(node.position, node.quaternion, node.scale);
    const flexion = spec.dofs.find((dof) => dof.axis === "x");
    if (flexion) {
      const angleRad = (getPoseAngle(pose, flexion.key) * Math.PI) / 180;
      node.quaternion.multiply(new Quaternion().setFromAxisAngle(new Vector3(1, 0, 0), -angleRad));
    }
    (spec.parent ? nodes.get(spec.parent)! : root).add(node);
    nodes.set(spec.joint, node);
  }
  root.updateMatrixWorld(true);
  return Object.fromEntries([...nodes].map(([joint, node]) => [joint, node.getWorldPosition(new Vector3())])) as Record<
    RigJointName,
    Vector3
  >;
}

describe("rig", () => {
  it.each(SIDES)("reads all 25 WebXR hand joints of the %s mesh (WebXR Hand Input, XRHandJoint list)", (side) => {
    const rig = rigs[side];
    expect(Object.keys(rig.joints)).toHaveLength(25);
    expect(RIG_JOINT_NAMES).toHaveLength(25);
  });

  it.each(SIDES)("has the %s palm where the pose model says: index x little MCP lines point palmward", (side) => {
    // For a right hand, with the fingers distal and the thumb radial, (wrist->index MCP) x (wrist->little MCP)
    // points out of the palm; a mirrored (left) hand flips a cross product [common practice: vector algebra].
    const j = rigs[side].joints;
    const toIndex = j["index-finger-phalanx-proximal"].position.clone().sub(j.wrist.position);
    const toLittle = j["pinky-finger-phalanx-proximal"].position.clone().sub(j.wrist.position);
    const normal = toIndex.cross(toLittle).multiplyScalar(side === "right" ? 1 : -1).normalize();
    expect(normal.dot(restHandAxes(side).palm)).toBeGreaterThan(0.9);
    const thumbSide = j["thumb-metacarpal"].position.clone().sub(j["pinky-finger-metacarpal"].position);
    expect(thumbSide.dot(restHandAxes(side).ulnar)).toBeLessThan(0);
  });
});

describe("forward kinematics", () => {
  it.each(SIDES)("matches three.js's scene graph on random flexion poses of the %s hand", (side) => {
    for (let seed = 1; seed <= 40; seed += 1) {
      const pose = flexionOnlyPose(seed);
      const ours = poseHand(rigs[side], pose).positions;
      const theirs = sceneGraphPositions(rigs[side], pose);
      for (const joint of RIG_JOINT_NAMES) expect(ours[joint].distanceTo(theirs[joint])).toBeLessThan(1e-9);
    }
  });

  it.each(SIDES)("keeps every bone's length on the %s hand (a pose is a rigid motion per bone)", (side) => {
    const rig = rigs[side];
    const posed = poseHand(rig, samplePose(makeRng(99)));
    for (const spec of JOINT_CHAIN) {
      const restLength = rig.joints[spec.child].position.distanceTo(rig.joints[spec.joint].position);
      expect(posed.positions[spec.child].distanceTo(posed.positions[spec.joint])).toBeCloseTo(restLength, 12);
    }
  });

  it.each(SIDES)("moves each %s digit the named way: flexion to the palm, abduction away from the middle finger", (side) => {
    const rig = rigs[side];
    const axes = restHandAxes(side);
    const rest = poseHand(rig, restPose()).positions;
    const tipMove = (key: (typeof POSE_KEYS)[number], tip: RigJointName) => {
      const pose = restPose();
      setPoseAngle(pose, key, 20);
      return poseHand(rig, pose).positions[tip].clone().sub(rest[tip]);
    };
    expect(tipMove("index.pipFlexionDeg", "index-finger-tip").dot(axes.palm)).toBeGreaterThan(0);
    expect(tipMove("little.mcpFlexionDeg", "pinky-finger-tip").dot(axes.palm)).toBeGreaterThan(0);
    expect(tipMove("index.mcpAbductionDeg", "index-finger-tip").dot(axes.ulnar)).toBeLessThan(0);
    expect(tipMove("little.mcpAbductionDeg", "pinky-finger-tip").dot(axes.ulnar)).toBeGreaterThan(0);
    expect(tipMove("thumb.ipFlexionDeg", "thumb-tip").dot(axes.ulnar)).toBeGreaterThan(0);
    expect(tipMove("wrist.flexionDeg", "middle-finger-tip").dot(axes.palm)).toBeGreaterThan(0);
    expect(tipMove("wrist.radialDeviationDeg", "middle-finger-tip").dot(axes.ulnar)).toBeLessThan(0);
  });
});

describe("truth recovered from posed joint positions", () => {
  it.each(SIDES)("gives back every commanded angle of random %s-hand poses", (side) => {
    for (let seed = 1; seed <= 100; seed += 1) {
      const pose = samplePose(makeRng(seed));
      const recovered = recoverPoseFromPositions(rigs[side], poseHand(rigs[side], pose).positions);
      for (const key of POSE_KEYS) expect(getPoseAngle(recovered, key)).toBeCloseTo(getPoseAngle(pose, key), 6);
    }
  });

  it.each(SIDES)("reads the %s wrist by the landmark formula as rest offset plus the commanded angle", (side) => {
    // The wrist turns about its own local axes, which lie along the armature's axes, so the projected angle of the
    // wrist->middle MCP line changes by exactly the commanded angle [plane geometry: a rotation about the normal
    // of a plane turns every direction in it by the same angle]. The rig stores its rotations as 32-bit floats, so
    // its axes match the armature's to about 1e-7 rad: hence three decimals.
    const rig = rigs[side];
    const rest = landmarkAnglesDeg(rig, poseHand(rig, restPose()));
    for (const flexionDeg of [-60, 25, 75]) {
      const pose = restPose();
      pose.wrist.flexionDeg = flexionDeg;
      const read = landmarkAnglesDeg(rig, poseHand(rig, pose));
      expect(read["wrist.flexionDeg"]! - rest["wrist.flexionDeg"]!).toBeCloseTo(flexionDeg, 3);
    }
    for (const deviationDeg of [-25, 15]) {
      const pose = restPose();
      pose.wrist.radialDeviationDeg = deviationDeg;
      const read = landmarkAnglesDeg(rig, poseHand(rig, pose));
      expect(read["wrist.radialDeviationDeg"]! - rest["wrist.radialDeviationDeg"]!).toBeCloseTo(deviationDeg, 3);
    }
  });

  it("finds the rest pose bent by the landmark formula as measured before on this rig", () => {
    // ../shared/notes/rendered-hands.md: index MCP about 17, PIP 2, DIP 9 degrees at rest.
    const rest = landmarkAnglesDeg(rigs.right, poseHand(rigs.right, restPose()));
    expect(rest["index.mcpFlexionDeg"]).toBeGreaterThan(15);
    expect(rest["index.mcpFlexionDeg"]).toBeLessThan(19);
    expect(rest["index.pipFlexionDeg"]).toBeLessThan(3.5);
    expect(rest["index.dipFlexionDeg"]).toBeGreaterThan(7.5);
    expect(rest["index.dipFlexionDeg"]).toBeLessThan(10.5);
  });

  it("reads a lone PIP or DIP flexion by the landmark formula within the rest bend of the commanded angle", () => {
    // With only one interphalangeal joint turning, its bone lines stay near one plane, so the unsigned 3-D angle
    // is the commanded angle plus at most the joint's small rest bend (triangle inequality on directions).
    const rig = rigs.right;
    const rest = landmarkAnglesDeg(rig, poseHand(rig, restPose()));
    for (const finger of FINGERS) {
      for (const joint of ["pipFlexionDeg", "dipFlexionDeg"] as const) {
        const key = `${finger}.${joint}` as const;
        const pose = restPose();
        setPoseAngle(pose, key, 60);
        const read = landmarkAnglesDeg(rig, poseHand(rig, pose))[key]!;
        expect(Math.abs(read - 60)).toBeLessThanOrEqual(rest[key]! + 1e-9);
      }
    }
  });

  it("lists 21 landmarks in the hand landmark model's order, wrist first and fingertips last of each digit", () => {
    const points = landmarkPositions(poseHand(rigs.right, restPose()));
    expect(points).toHaveLength(21);
    // MediaPipe Hands (Zhang et al. 2020, arXiv:2006.10214, fig. 2): 0 wrist, 4 thumb tip, 8 index tip, 20 little tip.
    const wrist = points[0];
    for (const tip of [4, 8, 12, 16, 20]) {
      expect(points[tip].distanceTo(wrist)).toBeGreaterThan(points[tip - 1].distanceTo(wrist));
    }
  });
});

describe("sampled poses", () => {
  it("stay within the anatomical ranges and reach both ends of each", () => {
    const seen = new Map(POSE_KEYS.map((key) => [key, { low: Infinity, high: -Infinity }]));
    for (let seed = 0; seed < 400; seed += 1) {
      const pose = samplePose(makeRng(seed));
      for (const key of POSE_KEYS) {
        const value = getPoseAngle(pose, key);
        const [low, high] = POSE_RANGES_DEG[key];
        expect(value).toBeGreaterThanOrEqual(low);
        expect(value).toBeLessThanOrEqual(high);
        const range = seen.get(key)!;
        range.low = Math.min(range.low, value);
        range.high = Math.max(range.high, value);
      }
    }
    for (const key of POSE_KEYS) {
      const [low, high] = POSE_RANGES_DEG[key];
      const span = high - low;
      expect(seen.get(key)!.low).toBeLessThan(low + 0.05 * span);
      expect(seen.get(key)!.high).toBeGreaterThan(high - 0.05 * span);
    }
  });
});

describe("hands built unlike the mesh", () => {
  const ones: HandProportions = {
    palm: 1,
    girth: 1,
    digits: { thumb: 1, index: 1, middle: 1, ring: 1, little: 1 },
    phalanges: { thumb: [1, 1, 1], index: [1, 1, 1], middle: [1, 1, 1], ring: [1, 1, 1], little: [1, 1, 1] },
  };

  it.each(SIDES)("keep the %s mesh's own skeleton when every factor is 1", (side) => {
    const rebuilt = proportionedRig(rigs[side], ones);
    for (const joint of RIG_JOINT_NAMES) expect(rebuilt.joints[joint].position.distanceTo(rigs[side].joints[joint].position)).toBeLessThan(1e-12);
  });

  it.each(SIDES)("lengthen each %s bone by its factor and keep every commanded angle recoverable", (side) => {
    for (let seed = 1; seed <= 20; seed += 1) {
      const proportions = sampleProportions(makeRng(seed));
      const rig = proportionedRig(rigs[side], proportions);
      const pose = samplePose(makeRng(1000 + seed));
      const posed = poseHand(rig, pose);
      for (const finger of FINGERS) {
        const name = (part: Parameters<typeof fingerJointName>[1]) => fingerJointName(finger, part);
        const bones = [
          [name("metacarpal"), name("phalanx-proximal"), proportions.palm],
          [name("phalanx-proximal"), name("phalanx-intermediate"), proportions.digits[finger] * proportions.phalanges[finger][0]],
          [name("phalanx-intermediate"), name("phalanx-distal"), proportions.digits[finger] * proportions.phalanges[finger][1]],
          [name("phalanx-distal"), name("tip"), proportions.digits[finger] * proportions.phalanges[finger][2]],
        ] as const;
        for (const [from, to, factor] of bones) {
          const meshLength = rigs[side].joints[to].position.distanceTo(rigs[side].joints[from].position);
          // Every rig bone runs within 6 degrees of its joint's local -Z, and only that axis takes the length factor.
          expect(posed.positions[to].distanceTo(posed.positions[from]) / meshLength).toBeCloseTo(factor, 2);
        }
      }
      // Angles keep their meaning: the rest orientations are the mesh's, so the truth is still the commanded pose.
      const recovered = recoverPoseFromPositions(rig, posed.positions);
      for (const key of POSE_KEYS) expect(getPoseAngle(recovered, key)).toBeCloseTo(getPoseAngle(pose, key), 6);
    }
  });

  it.each(SIDES)("move the %s skin with the skeleton: each scaled bone's skin transform carries its child joint to the landmark", (side) => {
    // Linear blend skinning (glTF 2.0 spec, "Skins"): a point bound to a bone moves by jointMatrix * inverseBindMatrix,
    // where the bind pose is the mesh's rest. The page gets jointMatrix from spec.boneMatrices.
    const rig = proportionedRig(rigs[side], sampleProportions(makeRng(7)));
    const pose = samplePose(makeRng(8));
    const rng = makeRng(9);
    const placement = sampleCamera(rng, "ulnar");
    const camera = placeCamera(side, placement, new Vector3());
    const { spec } = buildFrame(rig, pose, camera, placement, sampleLook(rng));
    const posed = poseHand(rig, pose);
    for (const chain of JOINT_CHAIN) {
      if (chain.child === chain.joint || chain.joint === "wrist") continue;
      const mesh = rigs[side].joints;
      const inverseBind = new Matrix4().compose(mesh[chain.joint].position, mesh[chain.joint].quaternion, new Vector3(1, 1, 1)).invert();
      const moved = mesh[chain.child].position.clone().applyMatrix4(inverseBind).applyMatrix4(new Matrix4().fromArray(spec.boneMatrices[chain.joint]));
      expect(moved.distanceTo(posed.positions[chain.child])).toBeLessThan(1e-9);
    }
  });

  it("are drawn within the stated ranges, the same from the same seed, and a factor outside 0.5-1.5 is refused by name", () => {
    const seen: number[] = [];
    for (let seed = 0; seed < 200; seed += 1) {
      const drawn = sampleProportions(makeRng(seed));
      expect(sampleProportions(makeRng(seed))).toEqual(drawn);
      expect(drawn.palm).toBeGreaterThanOrEqual(PROPORTION_RANGES.palm[0]);
      expect(drawn.palm).toBeLessThanOrEqual(PROPORTION_RANGES.palm[1]);
      expect(drawn.girth).toBeGreaterThanOrEqual(PROPORTION_RANGES.girth[0]);
      expect(drawn.girth).toBeLessThanOrEqual(PROPORTION_RANGES.girth[1]);
      for (const factor of Object.values(drawn.digits)) {
        expect(factor).toBeGreaterThanOrEqual(PROPORTION_RANGES.digit[0]);
        expect(factor).toBeLessThanOrEqual(PROPORTION_RANGES.digit[1]);
        seen.push(factor);
      }
      for (const factor of Object.values(drawn.phalanges).flat()) {
        expect(factor).toBeGreaterThanOrEqual(PROPORTION_RANGES.bone[0]);
        expect(factor).toBeLessThanOrEqual(PROPORTION_RANGES.bone[1]);
      }
    }
    expect(Math.min(...seen)).toBeLessThan(0.9);
    expect(Math.max(...seen)).toBeGreaterThan(1.1);
    expect(() => proportionedRig(rigs.right, { ...ones, digits: { ...ones.digits, ring: 2 } })).toThrow(
      "proportions digits.ring: expected a factor between 0.5 and 1.5; got 2",
    );
    expect(() => proportionedRig(proportionedRig(rigs.right, ones), ones)).toThrow(/expected the mesh's own rig/);
  });
});
