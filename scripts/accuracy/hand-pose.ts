import { Euler, Matrix4, Quaternion, Vector3 } from "three";
import type { HandRig, HandSide, RigJointName } from "./rig";

/**
 * Kinarc's pose model for the rigged hand: every angle in degrees, zero at the rig's rest pose (which is not
 * straight by the landmark-angle formula; see `landmarkAnglesDeg`). Flexion, radial deviation and abduction away
 * from the middle finger are positive; extension (hyperextension) and ulnar deviation are negative.
 */
export const FINGERS = ["index", "middle", "ring", "little"] as const;
export type Finger = (typeof FINGERS)[number];

export interface FingerPose {
  mcpFlexionDeg: number;
  /** Away from the middle finger; for the middle finger itself, toward the thumb side. */
  mcpAbductionDeg: number;
  pipFlexionDeg: number;
  dipFlexionDeg: number;
}

export interface ThumbPose {
  /** In the plane of the palm, toward the little finger. */
  cmcFlexionDeg: number;
  /** Palmar abduction: away from the plane of the palm, toward the palm side. */
  cmcAbductionDeg: number;
  mcpFlexionDeg: number;
  ipFlexionDeg: number;
}

export interface WristPose {
  /** Negative is extension. */
  flexionDeg: number;
  /** Negative is ulnar deviation. */
  radialDeviationDeg: number;
}

export interface HandPose {
  wrist: WristPose;
  thumb: ThumbPose;
  index: FingerPose;
  middle: FingerPose;
  ring: FingerPose;
  little: FingerPose;
}

/** Every degree of freedom of the pose model, by a stable key (`index.pipFlexionDeg`, `wrist.flexionDeg`, ...). */
export type PoseKey =
  | `${Finger}.${keyof FingerPose}`
  | `thumb.${keyof ThumbPose}`
  | `wrist.${keyof WristPose}`;

const RIG_FINGER = { index: "index", middle: "middle", ring: "ring", little: "pinky" } as const satisfies Record<Finger, string>;

/** The rig's name for a finger joint (the rig calls the little finger "pinky"). */
export function fingerJointName(finger: Finger, part: "metacarpal" | "phalanx-proximal" | "phalanx-intermediate" | "phalanx-distal" | "tip"): RigJointName {
  return `${RIG_FINGER[finger]}-finger-${part}`;
}

type Direction = "palm" | "ulnar" | "radial";

/** One rotational degree of freedom: which rig joint turns, about which of its local axes, and which way is positive. */
interface DofSpec {
  key: PoseKey;
  joint: RigJointName;
  axis: "x" | "y";
  /** Where the next joint moves for a positive angle; fixes the sign per hand side from the rig itself. */
  positiveToward: Direction;
}

interface JointSpec {
  joint: RigJointName;
  parent: RigJointName | null;
  /** The joint whose position, seen from this one, is the bone the degrees of freedom move. */
  child: RigJointName;
  /**
   * Applied in this order as intrinsic rotations. MCP and CMC follow the joint coordinate system of the ISB
   * recommendation for the hand (Wu et al., J Biomech 2005;38:981-992): flexion about the axis fixed in the proximal
   * bone first, then abduction about the moved (floating) axis. The wrist turns the other way round (deviation about
   * the forearm's dorsopalmar axis, then flexion about the hand's own radio-ulnar axis), which is how angles read in
   * the hand's frame against a forearm line come out exact.
   */
  dofs: DofSpec[];
}

function fingerJoints(finger: Finger): JointSpec[] {
  const name = (part: Parameters<typeof fingerJointName>[1]) => fingerJointName(finger, part);
  const abductionToward: Direction = finger === "ring" || finger === "little" ? "ulnar" : "radial";
  return [
    { joint: name("metacarpal"), parent: "wrist", child: name("phalanx-proximal"), dofs: [] },
    {
      joint: name("phalanx-proximal"),
      parent: name("metacarpal"),
      child: name("phalanx-intermediate"),
      dofs: [
        { key: `${finger}.mcpFlexionDeg`, joint: name("phalanx-proximal"), axis: "x", positiveToward: "palm" },
        { key: `${finger}.mcpAbductionDeg`, joint: name("phalanx-proximal"), axis: "y", positiveToward: abductionToward },
      ],
    },
    {
      joint: name("phalanx-intermediate"),
      parent: name("phalanx-proximal"),
      child: name("phalanx-distal"),
      dofs: [{ key: `${finger}.pipFlexionDeg`, joint: name("phalanx-intermediate"), axis: "x", positiveToward: "palm" }],
    },
    {
      joint: name("phalanx-distal"),
      parent: name("phalanx-intermediate"),
      child: name("tip"),
      dofs: [{ key: `${finger}.dipFlexionDeg`, joint: name("phalanx-distal"), axis: "x", positiveToward: "palm" }],
    },
    { joint: name("tip"), parent: name("phalanx-distal"), child: name("tip"), dofs: [] },
  ];
}

/** Joints in parent-before-child order. The rig stores them flat, so this chain is the model's own. */
export const JOINT_CHAIN: readonly JointSpec[] = [
  {
    joint: "wrist",
    parent: null,
    child: "middle-finger-phalanx-proximal",
    dofs: [
      { key: "wrist.radialDeviationDeg", joint: "wrist", axis: "y", positiveToward: "radial" },
      { key: "wrist.flexionDeg", joint: "wrist", axis: "x", positiveToward: "palm" },
    ],
  },
  {
    joint: "thumb-metacarpal",
    parent: "wrist",
    child: "thumb-phalanx-proximal",
    dofs: [
      // The thumb's rig frame is turned: its local X swings the metacarpal across the palm, Y out of the palm plane.
      { key: "thumb.cmcFlexionDeg", joint: "thumb-metacarpal", axis: "x", positiveToward: "ulnar" },
      { key: "thumb.cmcAbductionDeg", joint: "thumb-metacarpal", axis: "y", positiveToward: "palm" },
    ],
  },
  {
    joint: "thumb-phalanx-proximal",
    parent: "thumb-metacarpal",
    child: "thumb-phalanx-distal",
    dofs: [{ key: "thumb.mcpFlexionDeg", joint: "thumb-phalanx-proximal", axis: "x", positiveToward: "ulnar" }],
  },
  {
    joint: "thumb-phalanx-distal",
    parent: "thumb-phalanx-proximal",
    child: "thumb-tip",
    dofs: [{ key: "thumb.ipFlexionDeg", joint: "thumb-phalanx-distal", axis: "x", positiveToward: "ulnar" }],
  },
  { joint: "thumb-tip", parent: "thumb-phalanx-distal", child: "thumb-tip", dofs: [] },
  ...FINGERS.flatMap(fingerJoints),
];

export const POSE_KEYS: readonly PoseKey[] = JOINT_CHAIN.flatMap((spec) => spec.dofs.map((dof) => dof.key));

/**
 * Sampling ranges, degrees. Upper limits follow the normal active ranges of AAOS 1965 (Joint Motion: Method of
 * Measuring and Recording; secondary source, [from memory] until checked): MCP flexion 90, PIP 100, DIP 90, finger
 * abduction 20, thumb CMC flexion 15 / extension 20, thumb MCP 50, IP 80 / hyperextension 20; wrist (Norkin & White
 * 2016, Appendix A, AAOS column): flexion 80, extension 70, radial 20, ulnar 30. MCP hyperextension is capped at 20
 * (AAOS lists 45) and palmar abduction at 50 (AAOS 70) because the rig's rest pose already holds some of each and the
 * mesh folds beyond.
 */
export const POSE_RANGES_DEG: Readonly<Record<PoseKey, readonly [number, number]>> = Object.fromEntries(
  POSE_KEYS.map((key) => {
    const [, dof] = key.split(".") as [string, string];
    const ranges: Record<string, readonly [number, number]> = {
      mcpFlexionDeg: [-20, 90],
      mcpAbductionDeg: [-10, 20],
      pipFlexionDeg: [0, 100],
      dipFlexionDeg: [0, 90],
      cmcFlexionDeg: [-20, 15],
      cmcAbductionDeg: [0, 50],
      ipFlexionDeg: [-20, 80],
      flexionDeg: [-70, 80],
      radialDeviationDeg: [-30, 20],
    };
    const thumbMcp: readonly [number, number] = [0, 50];
    return [key, key === "thumb.mcpFlexionDeg" ? thumbMcp : ranges[dof]];
  }),
) as Record<PoseKey, readonly [number, number]>;

export function restPose(): HandPose {
  const finger = (): FingerPose => ({ mcpFlexionDeg: 0, mcpAbductionDeg: 0, pipFlexionDeg: 0, dipFlexionDeg: 0 });
  return {
    wrist: { flexionDeg: 0, radialDeviationDeg: 0 },
    thumb: { cmcFlexionDeg: 0, cmcAbductionDeg: 0, mcpFlexionDeg: 0, ipFlexionDeg: 0 },
    index: finger(),
    middle: finger(),
    ring: finger(),
    little: finger(),
  };
}

export function getPoseAngle(pose: HandPose, key: PoseKey): number {
  const [part, dof] = key.split(".") as [keyof HandPose, string];
  return (pose[part] as unknown as Record<string, number>)[dof];
}

export function setPoseAngle(pose: HandPose, key: PoseKey, valueDeg: number): void {
  const [part, dof] = key.split(".") as [keyof HandPose, string];
  if (!Number.isFinite(valueDeg)) throw new Error(`pose ${key}: expected a finite angle in degrees, got ${valueDeg}`);
  (pose[part] as unknown as Record<string, number>)[dof] = valueDeg;
}

export function clonePose(pose: HandPose): HandPose {
  return structuredClone(pose);
}

/** Anatomical directions of the rig's armature frame; the left mesh is the right one mirrored across X. */
export interface HandAxes {
  /** Out of the palm. */
  palm: Vector3;
  /** Toward the little finger. */
  ulnar: Vector3;
  /** From the wrist toward the fingers (the forearm's long axis, pointing away from the elbow). */
  distal: Vector3;
}

/** Axes of the rig at rest: palm toward armature -X (right) or +X (left), fingers toward -Y, radial toward -Z. */
export function restHandAxes(side: HandSide): HandAxes {
  return {
    palm: new Vector3(side === "right" ? -1 : 1, 0, 0),
    ulnar: new Vector3(0, 0, 1),
    distal: new Vector3(0, -1, 0),
  };
}

function directionVector(axes: HandAxes, toward: Direction): Vector3 {
  if (toward === "radial") return axes.ulnar.clone().negate();
  return axes[toward].clone();
}

const LOCAL_AXES = { x: new Vector3(1, 0, 0), y: new Vector3(0, 1, 0) } as const;

/**
 * +1 or -1: the sign of a rotation about the joint's local axis that moves its bone toward `positiveToward`.
 * Read from the rig so the left (mirrored) mesh needs no table of its own.
 */
function dofSign(rig: HandRig, spec: JointSpec, dof: DofSpec): 1 | -1 {
  const joint = rig.joints[spec.joint];
  const bone = rig.joints[spec.child].position.clone().sub(joint.position);
  const axis = LOCAL_AXES[dof.axis].clone().applyQuaternion(joint.quaternion);
  const moved = bone.clone().applyAxisAngle(axis, 0.05).sub(bone);
  const toward = directionVector(restHandAxes(rig.side), dof.positiveToward);
  return moved.dot(toward) >= 0 ? 1 : -1;
}

export interface PosedHand {
  side: HandSide;
  /** Armature-frame transform of every rig joint, for the skinned mesh's bones (flat children of the armature). */
  jointMatrices: Record<RigJointName, Matrix4>;
  /** Armature-frame joint positions, metres. */
  positions: Record<RigJointName, Vector3>;
  /** Rest-to-posed motion of each joint's frame (identity for an unmoved joint). */
  motion: Record<RigJointName, Matrix4>;
}

/** Local rotation of one joint from its degrees of freedom, composed intrinsically in the listed order. */
function jointLocalRotation(rig: HandRig, spec: JointSpec, pose: HandPose): Quaternion {
  const rotation = new Quaternion();
  for (const dof of spec.dofs) {
    const angleRad = (dofSign(rig, spec, dof) * getPoseAngle(pose, dof.key) * Math.PI) / 180;
    rotation.multiply(new Quaternion().setFromAxisAngle(LOCAL_AXES[dof.axis], angleRad));
  }
  return rotation;
}

function restMatrix(rig: HandRig, joint: RigJointName): Matrix4 {
  const rest = rig.joints[joint];
  return new Matrix4().compose(rest.position, rest.quaternion, new Vector3(1, 1, 1));
}

/**
 * Forward kinematics from the rest pose. Each joint's posed frame is its rest frame turned by its own local
 * rotation and then carried by its parent's motion: W = M_parent * W_rest * R_local, M = W * W_rest^-1.
 */
export function poseHand(rig: HandRig, pose: HandPose): PosedHand {
  const jointMatrices = {} as Record<RigJointName, Matrix4>;
  const positions = {} as Record<RigJointName, Vector3>;
  const motion = {} as Record<RigJointName, Matrix4>;
  for (const spec of JOINT_CHAIN) {
    const rest = restMatrix(rig, spec.joint);
    const parentMotion = spec.parent ? motion[spec.parent] : new Matrix4();
    const local = new Matrix4().makeRotationFromQuaternion(jointLocalRotation(rig, spec, pose));
    const world = parentMotion.clone().multiply(rest).multiply(local);
    jointMatrices[spec.joint] = world;
    motion[spec.joint] = world.clone().multiply(rest.clone().invert());
    positions[spec.joint] = new Vector3().setFromMatrixPosition(world);
  }
  return { side: rig.side, jointMatrices, positions, motion };
}

/**
 * The hand's 21 landmarks in the order of the MediaPipe hand landmark model (wrist; thumb CMC, MCP, IP, tip; then
 * MCP, PIP, DIP, tip of index, middle, ring, little), taken from the rig's joints. The rig's finger metacarpal
 * joints (inside the palm) have no landmark.
 */
export const LANDMARK_JOINTS: readonly RigJointName[] = [
  "wrist",
  "thumb-metacarpal",
  "thumb-phalanx-proximal",
  "thumb-phalanx-distal",
  "thumb-tip",
  ...FINGERS.flatMap((finger) =>
    (["phalanx-proximal", "phalanx-intermediate", "phalanx-distal", "tip"] as const).map(
      (part) => fingerJointName(finger, part),
    ),
  ),
];

export function landmarkPositions(posed: PosedHand): Vector3[] {
  return LANDMARK_JOINTS.map((joint) => posed.positions[joint].clone());
}

/**
 * The forearm's frame, fixed in the armature: the wrist's rest frame (local -Z runs from the wrist to the middle
 * finger's MCP, +Y is the back of the hand, X the radio-ulnar axis). The forearm capsule lies along its +Z.
 */
export function forearmFrame(rig: HandRig): { origin: Vector3; quaternion: Quaternion; proximal: Vector3 } {
  const wrist = rig.joints.wrist;
  return {
    origin: wrist.position.clone(),
    quaternion: wrist.quaternion.clone(),
    proximal: new Vector3(0, 0, 1).applyQuaternion(wrist.quaternion),
  };
}

const DEG = 180 / Math.PI;

function unsignedAngleDeg(a: Vector3, b: Vector3): number {
  return a.angleTo(b) * DEG;
}

/**
 * Truth by the landmark-angle formula: the unsigned angle between consecutive bone lines through the 21 landmarks
 * (metacarpal line = wrist to MCP; thumb CMC line = wrist to CMC), as the raw-landmark estimate computes it; being
 * unsigned, it reads MCP hyperextension and the rig's sideways lean at rest as flexion. Wrist angles (signed) come
 * from the forearm axis and the line from
 * the wrist to the middle finger's MCP, projected onto the forearm's sagittal plane (flexion) and onto the plane of
 * the palm at rest (deviation). These are what a tracker that found every landmark exactly would report.
 */
export function landmarkAnglesDeg(rig: HandRig, posed: PosedHand): Record<PoseKey, number | null> {
  const p = posed.positions;
  const result = Object.fromEntries(POSE_KEYS.map((key) => [key, null])) as Record<PoseKey, number | null>;
  const axes = restHandAxes(rig.side);
  const bone = (from: RigJointName, to: RigJointName) => p[to].clone().sub(p[from]);
  for (const finger of FINGERS) {
    const j = (part: Parameters<typeof fingerJointName>[1]) => fingerJointName(finger, part);
    const metacarpal = bone("wrist", j("phalanx-proximal"));
    const proximal = bone(j("phalanx-proximal"), j("phalanx-intermediate"));
    const middle = bone(j("phalanx-intermediate"), j("phalanx-distal"));
    const distal = bone(j("phalanx-distal"), j("tip"));
    result[`${finger}.mcpFlexionDeg`] = unsignedAngleDeg(metacarpal, proximal);
    result[`${finger}.pipFlexionDeg`] = unsignedAngleDeg(proximal, middle);
    result[`${finger}.dipFlexionDeg`] = unsignedAngleDeg(middle, distal);
  }
  result["thumb.cmcFlexionDeg"] = unsignedAngleDeg(bone("wrist", "thumb-metacarpal"), bone("thumb-metacarpal", "thumb-phalanx-proximal"));
  result["thumb.mcpFlexionDeg"] = unsignedAngleDeg(
    bone("thumb-metacarpal", "thumb-phalanx-proximal"),
    bone("thumb-phalanx-proximal", "thumb-phalanx-distal"),
  );
  result["thumb.ipFlexionDeg"] = unsignedAngleDeg(
    bone("thumb-phalanx-proximal", "thumb-phalanx-distal"),
    bone("thumb-phalanx-distal", "thumb-tip"),
  );
  const hand = bone("wrist", "middle-finger-phalanx-proximal");
  const distalAxis = forearmFrame(rig).proximal.negate();
  const alongForearm = hand.dot(distalAxis);
  result["wrist.flexionDeg"] = Math.atan2(hand.dot(axes.palm), alongForearm) * DEG;
  result["wrist.radialDeviationDeg"] = Math.atan2(-hand.dot(axes.ulnar), alongForearm) * DEG;
  return result;
}

/**
 * Inverse of `poseHand`, from joint positions alone (plus the rest rig): the commanded angle of every degree of
 * freedom. The palm is rigid, so the wrist's motion follows from three of its points; each joint's child bone,
 * carried back into its rest frame, then gives that joint's angles, and its motion is rebuilt for the next joint.
 */
export function recoverPoseFromPositions(rig: HandRig, positions: Record<RigJointName, Vector3>): HandPose {
  const pose = restPose();
  const frame = (a: Vector3, b: Vector3, c: Vector3) => {
    const x = b.clone().sub(a).normalize();
    const z = x.clone().cross(c.clone().sub(a)).normalize();
    const y = z.clone().cross(x);
    return new Matrix4().makeBasis(x, y, z).setPosition(a);
  };
  const palmPoints: RigJointName[] = ["index-finger-metacarpal", "index-finger-phalanx-proximal", "pinky-finger-phalanx-proximal"];
  const restFrame = frame(...(palmPoints.map((j) => rig.joints[j].position) as [Vector3, Vector3, Vector3]));
  const posedFrame = frame(...(palmPoints.map((j) => positions[j]) as [Vector3, Vector3, Vector3]));
  const motion = {} as Record<RigJointName, Matrix4>;
  for (const spec of JOINT_CHAIN) {
    const rest = restMatrix(rig, spec.joint);
    let local: Quaternion;
    if (spec.joint === "wrist") {
      // The wrist's motion is the palm's; express it in the wrist's own frame and split it like poseHand composes it.
      const palmMotion = posedFrame.clone().multiply(restFrame.clone().invert());
      const localMatrix = rest.clone().invert().multiply(palmMotion).multiply(rest);
      local = new Quaternion().setFromRotationMatrix(localMatrix);
      // The wrist's order is deviation (Y) then flexion (X): three's Euler order "YXZ" is exactly that product.
      const euler = new Euler().setFromQuaternion(local, "YXZ");
      const [abduction, flexion] = spec.dofs;
      if (abduction.axis !== "y" || flexion.axis !== "x") throw new Error("pose model: the wrist must list deviation before flexion");
      setPoseAngle(pose, abduction.key, (euler.y * DEG) / dofSign(rig, spec, abduction));
      setPoseAngle(pose, flexion.key, (euler.x * DEG) / dofSign(rig, spec, flexion));
    } else {
      const parentMotion = spec.parent ? motion[spec.parent] : new Matrix4();
      const restBone = rig.joints[spec.child].position.clone().sub(rig.joints[spec.joint].position);
      const posedBone = positions[spec.child].clone().sub(positions[spec.joint]);
      const inverseRestRotation = rig.joints[spec.joint].quaternion.clone().invert();
      const v = restBone.applyQuaternion(inverseRestRotation);
      const w = posedBone.transformDirection(parentMotion.clone().invert()).multiplyScalar(restBone.length());
      w.applyQuaternion(inverseRestRotation);
      local = solveLocalRotation(rig, spec, v, w, pose);
    }
    const world = (spec.parent ? motion[spec.parent] : new Matrix4()).clone().multiply(rest).multiply(new Matrix4().makeRotationFromQuaternion(local));
    motion[spec.joint] = world.multiply(rest.clone().invert());
  }
  return pose;
}

/** Angles that carry bone `v` to `w` (both in the joint's rest frame), written into `pose`; returns the rotation. */
function solveLocalRotation(rig: HandRig, spec: JointSpec, v: Vector3, w: Vector3, pose: HandPose): Quaternion {
  if (spec.dofs.length === 0) return new Quaternion();
  const flexionDof = spec.dofs.find((dof) => dof.axis === "x")!;
  const abductionDof = spec.dofs.find((dof) => dof.axis === "y");
  let flexionRad: number;
  let abductionRad = 0;
  if (!abductionDof) {
    // A turn about X keeps the X component and turns the (y, z) part by the angle.
    flexionRad = Math.atan2(w.z, w.y) - Math.atan2(v.z, v.y);
  } else {
    if (spec.dofs[0] !== flexionDof) throw new Error(`pose model: ${spec.joint} must list flexion before abduction`);
    // R = Rx(f) Ry(a): Rx keeps x, so w.x = v.x cos a + v.z sin a fixes a up to a mirror; keep the |a| <= 90 branch,
    // then f is the turn about X from Ry(a) v to w.
    const radius = Math.hypot(v.x, v.z);
    const phase = Math.atan2(v.z, v.x);
    const spread = Math.acos(Math.max(-1, Math.min(1, w.x / radius)));
    const candidates = [phase + spread, phase - spread].map(wrapRad);
    abductionRad = Math.abs(candidates[0]) <= Math.abs(candidates[1]) ? candidates[0] : candidates[1];
    const u = v.clone().applyAxisAngle(LOCAL_AXES.y, abductionRad);
    flexionRad = Math.atan2(w.z, w.y) - Math.atan2(u.z, u.y);
    setPoseAngle(pose, abductionDof.key, (abductionRad * DEG) / dofSign(rig, spec, abductionDof));
  }
  setPoseAngle(pose, flexionDof.key, (wrapRad(flexionRad) * DEG) / dofSign(rig, spec, flexionDof));
  return new Quaternion()
    .setFromAxisAngle(LOCAL_AXES.x, wrapRad(flexionRad))
    .multiply(new Quaternion().setFromAxisAngle(LOCAL_AXES.y, abductionRad));
}

function wrapRad(angle: number): number {
  return Math.atan2(Math.sin(angle), Math.cos(angle));
}

/**
 * How a hand is built relative to the rigged mesh, as factors (1 = the mesh): real hands differ in palm length,
 * finger lengths, the share of each phalanx and finger girth, and the renders otherwise show one hand only.
 */
export interface HandProportions {
  /** Length of the finger metacarpals (the palm, wrist crease to knuckles). */
  palm: number;
  /** Length of every bone of each digit (the thumb's metacarpal and phalanges; a finger's three phalanges). */
  digits: Record<"thumb" | Finger, number>;
  /**
   * Each bone on top of its digit's factor, from the wrist out: a finger's proximal, middle and distal phalanges;
   * the thumb's metacarpal, proximal and distal phalanges.
   */
  phalanges: Record<"thumb" | Finger, [number, number, number]>;
  /** Thickness of every digit bone, across the bone. */
  girth: number;
}

function checkFactor(field: string, value: number): void {
  if (!Number.isFinite(value) || value < 0.5 || value > 1.5) {
    throw new Error(`proportions ${field}: expected a factor between 0.5 and 1.5; got ${value}`);
  }
}

/** Each scaled joint's own bone scale (x, y across, z along: every rig bone runs along its local -Z). */
function boneScalesFor(proportions: HandProportions): Partial<Record<RigJointName, [number, number, number]>> {
  checkFactor("palm", proportions.palm);
  checkFactor("girth", proportions.girth);
  const scales: Partial<Record<RigJointName, [number, number, number]>> = {};
  const g = proportions.girth;
  checkFactor("digits.thumb", proportions.digits.thumb);
  (["thumb-metacarpal", "thumb-phalanx-proximal", "thumb-phalanx-distal"] as const).forEach((joint, i) => {
    checkFactor(`phalanges.thumb[${i}]`, proportions.phalanges.thumb[i]);
    scales[joint] = [g, g, proportions.digits.thumb * proportions.phalanges.thumb[i]];
  });
  scales["thumb-tip"] = [g, g, g];
  for (const finger of FINGERS) {
    const name = (part: Parameters<typeof fingerJointName>[1]) => fingerJointName(finger, part);
    checkFactor(`digits.${finger}`, proportions.digits[finger]);
    scales[name("metacarpal")] = [1, 1, proportions.palm];
    (["phalanx-proximal", "phalanx-intermediate", "phalanx-distal"] as const).forEach((part, i) => {
      checkFactor(`phalanges.${finger}[${i}]`, proportions.phalanges[finger][i]);
      scales[name(part)] = [g, g, proportions.digits[finger] * proportions.phalanges[finger][i]];
    });
    scales[name("tip")] = [g, g, g];
  }
  return scales;
}

/**
 * The rig rebuilt with other proportions: each joint's rest position moves with its parent's scaled bone (the
 * parent's scale applied in the parent's own frame, exactly as the render page scales the skin bound to it), so the
 * landmarks, the posed skeleton and the picture agree. Angles keep their meaning: every rest orientation is the mesh's.
 */
export function proportionedRig(rig: HandRig, proportions: HandProportions): HandRig {
  if (rig.boneScales) throw new Error("proportionedRig: expected the mesh's own rig, got one already rebuilt");
  const boneScales = boneScalesFor(proportions);
  const joints = { ...rig.joints };
  for (const spec of JOINT_CHAIN) {
    if (!spec.parent) continue;
    const parent = rig.joints[spec.parent];
    const scale = boneScales[spec.parent];
    const offset = rig.joints[spec.joint].position.clone().sub(parent.position);
    if (scale) {
      const inverse = parent.quaternion.clone().invert();
      offset.applyQuaternion(inverse).multiply(new Vector3(...scale)).applyQuaternion(parent.quaternion);
    }
    joints[spec.joint] = { ...rig.joints[spec.joint], position: joints[spec.parent].position.clone().add(offset) };
  }
  return { side: rig.side, joints, boneScales };
}
