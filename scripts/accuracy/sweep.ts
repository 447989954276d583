import {
  clonePose,
  getPoseAngle,
  POSE_KEYS,
  poseHand,
  restPose,
  setPoseAngle,
  type HandPose,
  type PoseKey,
} from "./hand-pose";
import type { RenderFrameSpec } from "./render-spec";
import type { HandRig, HandSide } from "./rig";
import {
  buildFrame,
  CAMERA_VIEWS,
  handCentre,
  makeRng,
  palmwardAzimuthSign,
  placeCamera,
  sampleCamera,
  sampleLook,
  type CameraView,
  type FrameTruth,
} from "./scene";

export interface SweepOptions {
  /**
   * The joints that move, all through the same angles (e.g. the PIP of all four fingers, as Kinarc asks a client to
   * bend them: scripts/accuracy/report.md shows one finger moving alone reads 19-32 degrees off).
   */
  joints: readonly PoseKey[];
  fromDeg: number;
  toDeg: number;
  cycles: number;
  cycleSeconds: number;
  fps: number;
  view: CameraView;
  side: HandSide;
  /** Fixes skin, background, light and the camera's small offsets; the camera stays still for the whole clip. */
  seed: number;
  distanceM: number;
  /** Angles of the joints that do not move; the rest pose when omitted. */
  basePose?: HandPose;
  /**
   * Seconds held still at `fromDeg` before the first cycle, as a client settles before moving (an uploaded wrist clip
   * takes its straight-wrist reading from such a still start: vision/live/clip-capture.ts). None when omitted.
   */
  holdSeconds?: number;
  /**
   * Degrees the hand starts turned palm-first toward the camera about its long axis, turning back to the view along a
   * raised cosine over `turnInSeconds`, before the hold: a client who shows the palm for a moment so the tracker finds
   * the hand, then turns back. None when omitted.
   */
  turnInDeg?: number;
  turnInSeconds?: number;
  /**
   * Joints that bend along with the swept ones, each at `ratio` times the swept angle (e.g. each finger's DIP with its
   * PIP, as it does in most people's active finger flexion). Paired with `joints` by position. None when omitted.
   */
  followers?: { joints: readonly PoseKey[]; ratio: number };
}

/** Checks options from the command line or a caller; every message names the field and what it expects. */
export function validateSweepOptions(options: SweepOptions): SweepOptions {
  if (options.joints.length === 0) throw new Error(`joints: expected at least one of ${POSE_KEYS.join(", ")}; got none`);
  for (const joint of options.joints) {
    if (!POSE_KEYS.includes(joint)) throw new Error(`joints: expected some of ${POSE_KEYS.join(", ")}; got '${joint}'`);
  }
  if (new Set(options.joints).size !== options.joints.length) throw new Error(`joints: expected each joint once; got ${options.joints.join(", ")}`);
  if (!CAMERA_VIEWS.includes(options.view)) throw new Error(`view: expected one of ${CAMERA_VIEWS.join(", ")}; got '${options.view}'`);
  if (options.side !== "left" && options.side !== "right") throw new Error(`side: expected left or right; got '${options.side}'`);
  const positive: [keyof SweepOptions, number][] = [
    ["cycles", options.cycles],
    ["cycleSeconds", options.cycleSeconds],
    ["fps", options.fps],
    ["distanceM", options.distanceM],
  ];
  for (const [field, value] of positive) {
    if (!Number.isFinite(value) || value <= 0) throw new Error(`${field}: expected a positive number; got ${value}`);
  }
  if (!Number.isInteger(options.cycles)) throw new Error(`cycles: expected a whole number; got ${options.cycles}`);
  for (const field of ["fromDeg", "toDeg"] as const) {
    if (!Number.isFinite(options[field])) throw new Error(`${field}: expected an angle in degrees; got ${options[field]}`);
  }
  if (!Number.isInteger(options.seed)) throw new Error(`seed: expected an integer; got ${options.seed}`);
  if (options.holdSeconds !== undefined && !(Number.isFinite(options.holdSeconds) && options.holdSeconds >= 0)) {
    throw new Error(`holdSeconds: expected zero or more seconds; got ${options.holdSeconds}`);
  }
  if (options.turnInDeg !== undefined) {
    if (!(Number.isFinite(options.turnInDeg) && options.turnInDeg > 0 && options.turnInDeg <= 90)) {
      throw new Error(`turnInDeg: expected degrees above 0 and at most 90; got ${options.turnInDeg}`);
    }
    if (!(Number.isFinite(options.turnInSeconds) && options.turnInSeconds! > 0)) {
      throw new Error(`turnInSeconds: expected a positive number of seconds with turnInDeg; got ${options.turnInSeconds}`);
    }
  }
  if (options.followers) {
    const { joints, ratio } = options.followers;
    if (joints.length !== options.joints.length) throw new Error(`followers.joints: expected one per swept joint (${options.joints.length}); got ${joints.length}`);
    for (const joint of joints) {
      if (!POSE_KEYS.includes(joint)) throw new Error(`followers.joints: expected some of ${POSE_KEYS.join(", ")}; got '${joint}'`);
      if (options.joints.includes(joint)) throw new Error(`followers.joints: '${joint}' is swept already`);
    }
    if (!(Number.isFinite(ratio) && ratio > 0 && ratio <= 1.5)) throw new Error(`followers.ratio: expected a number above 0 and at most 1.5; got ${ratio}`);
  }
  return options;
}

/** The extra palmward turn of each frame of a turn-in: from `turnInDeg` down a raised cosine, reaching 0 at the frame after. */
export function turnInOffsetsDeg(turnInDeg: number, frames: number): number[] {
  return Array.from({ length: frames }, (_, i) => (turnInDeg * (1 + Math.cos((Math.PI * i) / frames))) / 2);
}

/**
 * The commanded angle at each frame: from -> to -> from per cycle along a raised cosine, so the joint slows at both
 * ends as a real movement does and each cycle has one peak, reached exactly at its middle frame when the frames
 * per cycle are even.
 */
export function sweepAnglesDeg(fromDeg: number, toDeg: number, cycles: number, framesPerCycle: number): number[] {
  const total = cycles * framesPerCycle;
  return Array.from({ length: total + 1 }, (_, frame) => {
    const phase = (2 * Math.PI * frame) / framesPerCycle;
    return fromDeg + ((toDeg - fromDeg) * (1 - Math.cos(phase))) / 2;
  });
}

export interface SweepFrame {
  index: number;
  timeMs: number;
  spec: RenderFrameSpec;
  truth: FrameTruth;
}

/** Every frame of a sweep, camera and look fixed from the seed. */
export function buildSweepFrames(rig: HandRig, rawOptions: SweepOptions): SweepFrame[] {
  const options = validateSweepOptions(rawOptions);
  if (rig.side !== options.side) throw new Error(`side: the rig is the ${rig.side} hand but the sweep asks for ${options.side}`);
  const rng = makeRng(options.seed);
  const placement = { ...sampleCamera(rng, options.view), distanceM: options.distanceM };
  const look = sampleLook(rng);
  const base = options.basePose ? clonePose(options.basePose) : restPose();
  const framesPerCycle = Math.round(options.cycleSeconds * options.fps);
  const held = Array.from({ length: Math.round((options.holdSeconds ?? 0) * options.fps) }, () => options.fromDeg);
  const turns = options.turnInDeg ? turnInOffsetsDeg(options.turnInDeg, Math.round(options.turnInSeconds! * options.fps)) : [];
  const angles = [...turns.map(() => options.fromDeg), ...held, ...sweepAnglesDeg(options.fromDeg, options.toDeg, options.cycles, framesPerCycle)];
  // Aim at the hand halfway through the motion so it stays in view at both ends.
  const setSwept = (pose: HandPose, angleDeg: number) => {
    for (const joint of options.joints) setPoseAngle(pose, joint, angleDeg);
    for (const joint of options.followers?.joints ?? []) setPoseAngle(pose, joint, options.followers!.ratio * angleDeg);
  };
  const middlePose = clonePose(base);
  setSwept(middlePose, (options.fromDeg + options.toDeg) / 2);
  const centre = handCentre(poseHand(rig, middlePose));
  const camera = placeCamera(options.side, placement, centre);
  const palmward = palmwardAzimuthSign(options.side, options.view);
  return angles.map((angleDeg, index) => {
    const pose = clonePose(base);
    setSwept(pose, angleDeg);
    const turned = index < turns.length ? { ...placement, azimuthJitterDeg: placement.azimuthJitterDeg + palmward * turns[index] } : null;
    const { spec, truth } = turned ? buildFrame(rig, pose, placeCamera(options.side, turned, centre), turned, look) : buildFrame(rig, pose, camera, placement, look);
    return { index, timeMs: (index * 1000) / options.fps, spec, truth };
  });
}

/** The commanded angle of the swept joint in each frame (for reports and checks). */
export function sweptAnglesOf(frames: SweepFrame[], joint: PoseKey): number[] {
  return frames.map((frame) => getPoseAngle(frame.truth.commandedDeg, joint));
}
