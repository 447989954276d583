import { uniformFloat64 } from "pure-rand/distribution/uniformFloat64";
import { uniformInt } from "pure-rand/distribution/uniformInt";
import { POSE_KEYS, POSE_RANGES_DEG, poseHand, restPose, setPoseAngle, type PoseKey } from "./hand-pose";
import type { HandRig, HandSide } from "./rig";
import { buildFrame, handCentre, makeRng, placeCamera, sampleCamera, sampleLook, type CameraView } from "./scene";

/**
 * Stills of one test motion each, seen from the view the motion catalog recommends (lib/motions/catalog.ts:
 * "side" = a radial or ulnar view, "overhead" = looking down at a hand on the table). The tested joint (on all four
 * fingers at once, as a client flexes them together) spans its range; every other joint stays within a few degrees
 * of rest, as in a test position.
 */
export interface MotionSet {
  id: string;
  label: string;
  keys: readonly PoseKey[];
  rangeDeg: readonly [number, number];
  views: readonly CameraView[];
}

const FINGER_KEYS = (joint: "mcpFlexionDeg" | "pipFlexionDeg" | "dipFlexionDeg" | "mcpAbductionDeg") =>
  (joint === "mcpAbductionDeg" ? (["index", "ring", "little"] as const) : (["index", "middle", "ring", "little"] as const)).map(
    (finger) => `${finger}.${joint}` as PoseKey,
  );

export const MOTION_SETS: readonly MotionSet[] = [
  { id: "mcp.flexion", label: "MCP flexion", keys: FINGER_KEYS("mcpFlexionDeg"), rangeDeg: [0, 90], views: ["radial", "ulnar"] },
  { id: "pip.flexion", label: "PIP flexion", keys: FINGER_KEYS("pipFlexionDeg"), rangeDeg: [0, 100], views: ["radial", "ulnar"] },
  { id: "dip.flexion", label: "DIP flexion", keys: FINGER_KEYS("dipFlexionDeg"), rangeDeg: [0, 90], views: ["radial", "ulnar"] },
  { id: "wrist.flexion", label: "wrist flexion (+) / extension (-)", keys: ["wrist.flexionDeg"], rangeDeg: [-70, 80], views: ["radial", "ulnar"] },
  { id: "wrist.radial_deviation", label: "wrist radial (+) / ulnar (-) deviation", keys: ["wrist.radialDeviationDeg"], rangeDeg: [-30, 20], views: ["down"] },
  { id: "finger.abduction", label: "finger abduction", keys: FINGER_KEYS("mcpAbductionDeg"), rangeDeg: [-10, 20], views: ["down"] },
];

/** Joints other than the tested ones stay within this many degrees of rest. */
const OTHER_JOINT_JITTER_DEG = 5;
/** Fingers flexed together still differ a little from each other. */
const FINGER_SPREAD_DEG = 4;

/**
 * One still of `set`, fully determined by `seed`. With `singleFinger`, only one finger (drawn from the seed) moves
 * the tested joint and the others stay near rest, as when a client is asked to bend one finger: the landmark model
 * reads that very differently from four fingers bending together (a straight neighbour hides the bent finger).
 */
export function motionFrame(rigs: Record<HandSide, HandRig>, seed: number, set: MotionSet, singleFinger = false) {
  const rng = makeRng(seed);
  const uniform = (low: number, high: number) => low + (high - low) * uniformFloat64(rng);
  const side: HandSide = uniformInt(rng, 0, 1) === 0 ? "left" : "right";
  const view = set.views[uniformInt(rng, 0, set.views.length - 1)];
  const pose = restPose();
  for (const key of POSE_KEYS) {
    const [low, high] = POSE_RANGES_DEG[key];
    setPoseAngle(pose, key, Math.min(high, Math.max(low, uniform(-OTHER_JOINT_JITTER_DEG, OTHER_JOINT_JITTER_DEG))));
  }
  const shared = uniform(set.rangeDeg[0], set.rangeDeg[1]);
  const moving = singleFinger ? [set.keys[uniformInt(rng, 0, set.keys.length - 1)]] : set.keys;
  for (const key of moving) {
    const spread = set.keys.length > 1 ? uniform(-FINGER_SPREAD_DEG, FINGER_SPREAD_DEG) : 0;
    setPoseAngle(pose, key, Math.min(set.rangeDeg[1], Math.max(set.rangeDeg[0], shared + spread)));
  }
  // A hand framed for a test: nearer than the random set's 0.3-1.0 m.
  const placement = sampleCamera(rng, view, [0.3, 0.7]);
  const look = sampleLook(rng);
  const rig = rigs[side];
  const camera = placeCamera(side, placement, handCentre(poseHand(rig, pose)));
  return { ...buildFrame(rig, pose, camera, placement, look), seed, motion: set.id, ...(singleFinger ? { movingKeys: moving } : {}) };
}

/**
 * Training stills for the finger estimator (kinarc-correction-2): MCP, PIP and DIP of all four fingers flexed
 * together, as in making a fist or a hook, not one joint at a time. Half the stills close the hand along one curl
 * (each joint a share of its range, a little apart per finger); the rest draw each joint level on its own, so the
 * estimator sees the joints apart too. Views: the side views the catalog recommends for finger flexion, plus the
 * palm and back views a client's open hand or fist is often seen from. Never used for validation.
 */
/** The `motion` label of these stills. */
export const FINGER_FLEXION_SET = "fingers.flexion-together";
export const FINGER_FLEXION_VIEWS: readonly CameraView[] = ["radial", "ulnar", "palm", "back", "radial", "ulnar", "oblique"];
const FINGER_FLEXION_RANGES_DEG = { mcpFlexionDeg: [0, 90], pipFlexionDeg: [0, 100], dipFlexionDeg: [0, 80] } as const;

export function fingerFlexionFrame(rigs: Record<HandSide, HandRig>, seed: number, index: number) {
  const rng = makeRng(seed);
  const uniform = (low: number, high: number) => low + (high - low) * uniformFloat64(rng);
  const side: HandSide = uniformInt(rng, 0, 1) === 0 ? "left" : "right";
  const view = FINGER_FLEXION_VIEWS[index % FINGER_FLEXION_VIEWS.length];
  const pose = restPose();
  for (const key of POSE_KEYS) {
    const [low, high] = POSE_RANGES_DEG[key];
    setPoseAngle(pose, key, Math.min(high, Math.max(low, uniform(-OTHER_JOINT_JITTER_DEG, OTHER_JOINT_JITTER_DEG))));
  }
  const coupled = uniformFloat64(rng) < 0.5;
  const curl = uniformFloat64(rng);
  const levels = Object.fromEntries(
    Object.keys(FINGER_FLEXION_RANGES_DEG).map((joint) => [joint, coupled ? Math.min(1, Math.max(0, curl + uniform(-0.15, 0.15))) : uniformFloat64(rng)]),
  ) as Record<keyof typeof FINGER_FLEXION_RANGES_DEG, number>;
  for (const finger of ["index", "middle", "ring", "little"] as const) {
    for (const joint of Object.keys(FINGER_FLEXION_RANGES_DEG) as (keyof typeof FINGER_FLEXION_RANGES_DEG)[]) {
      const [low, high] = FINGER_FLEXION_RANGES_DEG[joint];
      const value = low + (high - low) * levels[joint] + uniform(-2 * FINGER_SPREAD_DEG, 2 * FINGER_SPREAD_DEG);
      setPoseAngle(pose, `${finger}.${joint}` as PoseKey, Math.min(high, Math.max(low, value)));
    }
  }
  // A closing hand brings the thumb in with it.
  if (coupled) {
    setPoseAngle(pose, "thumb.mcpFlexionDeg", 50 * curl * uniform(0.5, 1));
    setPoseAngle(pose, "thumb.ipFlexionDeg", 60 * curl * uniform(0.3, 1));
  }
  const placement = sampleCamera(rng, view, [0.3, 0.7]);
  const look = sampleLook(rng);
  const rig = rigs[side];
  const camera = placeCamera(side, placement, handCentre(poseHand(rig, pose)));
  return { ...buildFrame(rig, pose, camera, placement, look), seed, motion: FINGER_FLEXION_SET };
}

/**
 * Whole-hand shapes seen from the palm, the back or obliquely: how an open hand or a fist is often shown to a camera
 * held in front of it. All four fingers take the same shape (a little apart per finger). The named shapes are the
 * tendon-gliding positions of hand therapy [common practice]: open (straight), full fist, straight fist (MCP and PIP
 * bent, DIP straight), hook (MCP straight, PIP and DIP bent) and tabletop (MCP bent, PIP and DIP straight); the rest
 * close the hand along one curl or draw each joint on its own, so a fit also sees shapes in between. Used for the
 * whole-hand-shape estimator (training seeds 77000xxx) and its held-out sets (seed 20261206; 20261212 since kinarc-correction-7).
 */
export const HAND_SHAPE_SET = "fingers.hand-shape";
export const HAND_SHAPE_VIEWS: readonly CameraView[] = ["palm", "back", "oblique"];
/**
 * The same shapes seen from above the back of a hand lying on a table (`down`), for the second whole-hand-shape fit
 * (training seed 77000103, held-out seed 20261208; 20261213 since kinarc-correction-7). A camera held over the back of the hand is often measured as this
 * view, and the first fit did not cover it.
 */
export const HAND_SHAPE_DOWN_VIEWS: readonly CameraView[] = ["down"];
/**
 * The same shapes seen side-on, from the thumb side and the little-finger side, for the third whole-hand-shape fit
 * (training seed 77000411, held-out seed 20261237). The side-view finger estimator was fitted on the test motions and
 * stills of one joint's range; a whole fist seen side-on lies outside what it saw (its fingertips come nearer the
 * knuckles than any training finger did), and it declines such frames.
 */
export const HAND_SHAPE_SIDE_VIEWS: readonly CameraView[] = ["radial", "ulnar"];
/** Levels of each joint as a share of its range [low, high] per named shape. */
const HAND_SHAPES: Record<string, Record<"mcp" | "pip" | "dip", readonly [number, number]>> = {
  open: { mcp: [0, 0.1], pip: [0, 0.1], dip: [0, 0.1] },
  fist: { mcp: [0.75, 1], pip: [0.85, 1], dip: [0.6, 1] },
  "straight fist": { mcp: [0.75, 1], pip: [0.85, 1], dip: [0, 0.15] },
  hook: { mcp: [0, 0.15], pip: [0.7, 1], dip: [0.6, 1] },
  tabletop: { mcp: [0.75, 1], pip: [0, 0.1], dip: [0, 0.1] },
};
export const HAND_SHAPE_NAMES = [...Object.keys(HAND_SHAPES), "curl", "apart"] as const;
const HAND_SHAPE_RANGES_DEG = { mcp: [0, 90], pip: [0, 100], dip: [0, 80] } as const;

export function handShapeFrame(rigs: Record<HandSide, HandRig>, seed: number, index: number, views: readonly CameraView[] = HAND_SHAPE_VIEWS) {
  const rng = makeRng(seed);
  const uniform = (low: number, high: number) => low + (high - low) * uniformFloat64(rng);
  const side: HandSide = uniformInt(rng, 0, 1) === 0 ? "left" : "right";
  const view = views[index % views.length];
  const pose = restPose();
  for (const key of POSE_KEYS) {
    const [low, high] = POSE_RANGES_DEG[key];
    setPoseAngle(pose, key, Math.min(high, Math.max(low, uniform(-OTHER_JOINT_JITTER_DEG, OTHER_JOINT_JITTER_DEG))));
  }
  const shape = HAND_SHAPE_NAMES[uniformInt(rng, 0, HAND_SHAPE_NAMES.length - 1)];
  const curl = uniformFloat64(rng);
  const levels = Object.fromEntries(
    (["mcp", "pip", "dip"] as const).map((joint) => {
      const named = HAND_SHAPES[shape]?.[joint];
      const level = named ? uniform(named[0], named[1]) : shape === "curl" ? curl + uniform(-0.15, 0.15) : uniformFloat64(rng);
      return [joint, Math.min(1, Math.max(0, level))];
    }),
  ) as Record<"mcp" | "pip" | "dip", number>;
  for (const finger of ["index", "middle", "ring", "little"] as const) {
    for (const joint of ["mcp", "pip", "dip"] as const) {
      const [low, high] = HAND_SHAPE_RANGES_DEG[joint];
      const value = low + (high - low) * levels[joint] + uniform(-FINGER_SPREAD_DEG, FINGER_SPREAD_DEG);
      setPoseAngle(pose, `${finger}.${joint}FlexionDeg` as PoseKey, Math.min(high, Math.max(low, value)));
    }
  }
  // A closing hand brings the thumb in with it; an open hand may spread the fingers.
  const closed = (levels.mcp + levels.pip) / 2;
  setPoseAngle(pose, "thumb.mcpFlexionDeg", 50 * closed * uniform(0.5, 1));
  setPoseAngle(pose, "thumb.ipFlexionDeg", 60 * closed * uniform(0.3, 1));
  if (closed < 0.3) for (const finger of ["index", "ring", "little"] as const) setPoseAngle(pose, `${finger}.mcpAbductionDeg`, uniform(-5, 15));
  const placement = sampleCamera(rng, view, [0.3, 0.7]);
  const look = sampleLook(rng);
  const rig = rigs[side];
  const camera = placeCamera(side, placement, handCentre(poseHand(rig, pose)));
  return { ...buildFrame(rig, pose, camera, placement, look), seed, motion: HAND_SHAPE_SET, shape };
}
