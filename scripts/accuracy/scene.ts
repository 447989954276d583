import { Matrix4, PerspectiveCamera, Quaternion, Vector3 } from "three";
import { uniformFloat64 } from "pure-rand/distribution/uniformFloat64";
import { uniformInt } from "pure-rand/distribution/uniformInt";
import { xoroshiro128plus } from "pure-rand/generator/xoroshiro128plus";
import {
  FINGERS,
  forearmFrame,
  landmarkAnglesDeg,
  landmarkPositions,
  POSE_KEYS,
  POSE_RANGES_DEG,
  poseHand,
  restHandAxes,
  restPose,
  setPoseAngle,
  type HandPose,
  type HandProportions,
  type PoseKey,
  type PosedHand,
} from "./hand-pose";
import type { RenderFrameSpec } from "./render-spec";
import { RIG_JOINT_NAMES, type HandRig, type HandSide } from "./rig";

export type Rng = ReturnType<typeof xoroshiro128plus>;

export function makeRng(seed: number): Rng {
  if (!Number.isInteger(seed)) throw new Error(`seed: expected an integer, got ${seed}`);
  return xoroshiro128plus(seed);
}

function uniform(rng: Rng, low: number, high: number): number {
  return low + (high - low) * uniformFloat64(rng);
}

function pick<T>(rng: Rng, items: readonly T[]): T {
  return items[uniformInt(rng, 0, items.length - 1)];
}

/**
 * Seeds for frames 0..count-1 of a set: drawn in order from the set's own generator, so frame i can be rebuilt
 * without rendering the others and two sets with different seeds share nothing.
 */
export function frameSeeds(setSeed: number, count: number): number[] {
  const rng = makeRng(setSeed);
  return Array.from({ length: count }, () => uniformInt(rng, 0, 0x7fffffff));
}

/**
 * A random pose within `POSE_RANGES_DEG`. Half the poses draw every joint independently (coverage of odd
 * combinations); the rest draw one curl per digit and spread the joints around it, as real grasps couple them.
 */
export function samplePose(rng: Rng): HandPose {
  const pose = restPose();
  const coupled = uniformFloat64(rng) < 0.5;
  const curlByPart = new Map<string, number>();
  for (const part of ["wrist", "thumb", ...FINGERS]) curlByPart.set(part, uniformFloat64(rng));
  for (const key of POSE_KEYS) {
    const [low, high] = POSE_RANGES_DEG[key];
    const share = coupled
      ? Math.min(1, Math.max(0, curlByPart.get(key.split(".")[0])! + uniform(rng, -0.2, 0.2)))
      : uniformFloat64(rng);
    setPoseAngle(pose, key, low + (high - low) * share);
  }
  return pose;
}

/**
 * Factors for a hand built unlike the mesh (`proportionedRig`). Our own ranges, not from an anthropometric table:
 * chosen wider than the spread we expect among adult hands ([from memory] hand length varies by roughly 5-7% (one
 * SD) between adults of one sex, and each finger's share of it by less) so a result that holds here holds with room:
 * palm and each digit 0.88-1.12, each bone a further 0.95-1.05, girth 0.9-1.15.
 */
export const PROPORTION_RANGES = { palm: [0.88, 1.12], digit: [0.88, 1.12], bone: [0.95, 1.05], girth: [0.9, 1.15] } as const;

export function sampleProportions(rng: Rng): HandProportions {
  const draw = (range: readonly [number, number]) => Math.round(uniform(rng, range[0], range[1]) * 1000) / 1000;
  const palm = draw(PROPORTION_RANGES.palm);
  const girth = draw(PROPORTION_RANGES.girth);
  const parts = ["thumb", ...FINGERS] as const;
  const digits = Object.fromEntries(parts.map((part) => [part, draw(PROPORTION_RANGES.digit)])) as HandProportions["digits"];
  const phalanges = Object.fromEntries(
    parts.map((part) => [part, [draw(PROPORTION_RANGES.bone), draw(PROPORTION_RANGES.bone), draw(PROPORTION_RANGES.bone)]]),
  ) as HandProportions["phalanges"];
  return { palm, digits, phalanges, girth };
}

export const CAMERA_VIEWS = ["palm", "back", "radial", "ulnar", "oblique", "down"] as const;
export type CameraView = (typeof CAMERA_VIEWS)[number];

/**
 * Where each view puts the camera, as a direction from the hand in the forearm's anatomical axes (palm, ulnar,
 * distal), and which way is up in the image. `down` is a camera above the back of a hand lying on a table, in front
 * of the fingertips and tilted 55 degrees down (a phone on a stand across the table), so the fingers point down the
 * image; the others hold the hand up with the fingers toward the top of the image.
 */
const VIEW_GEOMETRY: Record<CameraView, { palm: number; ulnar: number; distal: number; upDistal: 1 | -1 }> = {
  palm: { palm: 1, ulnar: 0, distal: 0, upDistal: 1 },
  back: { palm: -1, ulnar: 0, distal: 0, upDistal: 1 },
  radial: { palm: 0, ulnar: -1, distal: 0, upDistal: 1 },
  ulnar: { palm: 0, ulnar: 1, distal: 0, upDistal: 1 },
  oblique: { palm: -0.65, ulnar: -0.65, distal: 0.35, upDistal: 1 },
  down: { palm: -Math.sin((55 * Math.PI) / 180), ulnar: 0, distal: Math.cos((55 * Math.PI) / 180), upDistal: -1 },
};

/** Skin colours from light to dark (sRGB), chosen to span the range of human skin; not a clinical scale. */
export const SKIN_TONES_HEX = ["#f2cfb3", "#e3b08e", "#d8a07c", "#c38661", "#a66c48", "#875232", "#66402a", "#48301f"] as const;

const BACKGROUNDS: RenderFrameSpec["background"][] = [
  { kind: "plain", colorHex: "#808080" },
  { kind: "plain", colorHex: "#e9e5dc" },
  { kind: "plain", colorHex: "#2a2e35" },
  { kind: "plain", colorHex: "#41607c" },
  { kind: "plain", colorHex: "#6d7d5b" },
  { kind: "gradient", topHex: "#cfc6b8", bottomHex: "#7a6450" },
  { kind: "gradient", topHex: "#f4f4f4", bottomHex: "#9aa3ad" },
  { kind: "gradient", topHex: "#3b3b46", bottomHex: "#a89a86" },
];

export interface CameraPlacement {
  view: CameraView;
  distanceM: number;
  /** Turns of the view direction about the distal axis and toward it, and of the image about the line of sight. */
  azimuthJitterDeg: number;
  elevationJitterDeg: number;
  rollDeg: number;
  /** Offset of the look-at point from the hand's centre, as a share of the distance (keeps the hand off-centre). */
  aimOffset: [number, number];
}

export interface SceneLook {
  skinHex: string;
  roughness: number;
  background: RenderFrameSpec["background"];
  lighting: RenderFrameSpec["lighting"];
  /** A label for reports: "normal", "dim" or "flat". */
  lightingKind: "normal" | "dim" | "flat";
}

export function sampleCamera(rng: Rng, view: CameraView, distanceRangeM: readonly [number, number] = [0.3, 1.0]): CameraPlacement {
  return {
    view,
    distanceM: uniform(rng, distanceRangeM[0], distanceRangeM[1]),
    azimuthJitterDeg: uniform(rng, -12, 12),
    elevationJitterDeg: uniform(rng, -12, 12),
    rollDeg: uniform(rng, -20, 20),
    aimOffset: [uniform(rng, -0.06, 0.06), uniform(rng, -0.05, 0.05)],
  };
}

function randomUnit(rng: Rng): Vector3 {
  const z = uniform(rng, -1, 1);
  const angle = uniform(rng, 0, 2 * Math.PI);
  const r = Math.sqrt(1 - z * z);
  return new Vector3(r * Math.cos(angle), r * Math.sin(angle), z);
}

/**
 * Skin, background and light. The key light comes from the camera's side of the hand (plus a random spread) so
 * the visible side is lit, as in a room where the client faces a window or lamp.
 */
export function sampleLook(rng: Rng): SceneLook {
  const kindRoll = uniformFloat64(rng);
  const lightingKind: SceneLook["lightingKind"] = kindRoll < 0.2 ? "dim" : kindRoll < 0.35 ? "flat" : "normal";
  const scale = lightingKind === "dim" ? uniform(rng, 0.3, 0.55) : 1;
  const keyOffset = randomUnit(rng).multiplyScalar(0.8);
  const fillOffset = randomUnit(rng);
  const warm = pick(rng, ["#fff4e6", "#ffffff", "#eef3ff"] as const);
  return {
    skinHex: pick(rng, SKIN_TONES_HEX),
    roughness: uniform(rng, 0.45, 0.8),
    background: pick(rng, BACKGROUNDS),
    lightingKind,
    lighting: {
      hemisphere: {
        skyHex: "#ffffff",
        groundHex: pick(rng, ["#444444", "#6b5a4a", "#3a4450"] as const),
        intensity: scale * (lightingKind === "flat" ? uniform(rng, 2.2, 3.0) : uniform(rng, 0.9, 1.6)),
      },
      // Key and fill directions are relative to the line of sight here and turned into world axes in buildFrame.
      key: {
        direction: [keyOffset.x, keyOffset.y, keyOffset.z - 1],
        intensity: scale * (lightingKind === "flat" ? 0.3 : uniform(rng, 1.5, 3.0)),
        colorHex: warm,
      },
      fill: { direction: [fillOffset.x, fillOffset.y, fillOffset.z], intensity: scale * uniform(rng, 0.2, 0.8) },
    },
  };
}

export const IMAGE_WIDTH_PX = 640;
export const IMAGE_HEIGHT_PX = 480;
/** 40 degrees vertical, as in the rendered-hand settings that were detected well. */
export const VERTICAL_FOV_DEG = 40;

/** Centre of the hand the camera aims at: the mean of the landmarks of a given pose. */
export function handCentre(posed: PosedHand): Vector3 {
  const points = landmarkPositions(posed);
  return points.reduce((sum, point) => sum.add(point), new Vector3()).divideScalar(points.length);
}

/** A view's line from the hand toward the camera, before the camera's jitter, in the rest hand's axes. */
function viewDirection(axes: ReturnType<typeof restHandAxes>, view: CameraView): Vector3 {
  const geometry = VIEW_GEOMETRY[view];
  return axes.palm.clone().multiplyScalar(geometry.palm).addScaledVector(axes.ulnar, geometry.ulnar).addScaledVector(axes.distal, geometry.distal).normalize();
}

/**
 * The sign of `azimuthJitterDeg` that turns a view toward the palm: the hand turning palm-first toward the camera about
 * its long axis looks the same as the camera moving that way around it.
 */
export function palmwardAzimuthSign(side: HandSide, view: CameraView): 1 | -1 {
  const axes = restHandAxes(side);
  const direction = viewDirection(axes, view);
  const turned = direction.clone().applyAxisAngle(axes.distal, Math.PI / 18);
  return turned.dot(axes.palm) > direction.dot(axes.palm) ? 1 : -1;
}

/** A camera (three's own, so projection matches the page's) placed for a view around `centre`. */
export function placeCamera(side: HandSide, placement: CameraPlacement, centre: Vector3): PerspectiveCamera {
  const axes = restHandAxes(side);
  const geometry = VIEW_GEOMETRY[placement.view];
  const direction = viewDirection(axes, placement.view);
  const toRad = Math.PI / 180;
  direction.applyAxisAngle(axes.distal, placement.azimuthJitterDeg * toRad);
  const tiltAxis = new Vector3().crossVectors(direction, axes.distal);
  if (tiltAxis.lengthSq() > 1e-9) direction.applyAxisAngle(tiltAxis.normalize(), placement.elevationJitterDeg * toRad);
  const up = axes.distal.clone().multiplyScalar(geometry.upDistal);
  // Up must not run along the line of sight; `down` looks partly along the distal axis, which is fine at 55 degrees.
  up.addScaledVector(direction, -up.dot(direction)).normalize();
  const camera = new PerspectiveCamera(VERTICAL_FOV_DEG, IMAGE_WIDTH_PX / IMAGE_HEIGHT_PX, 0.01, 10);
  camera.up.copy(up);
  camera.position.copy(centre).addScaledVector(direction, placement.distanceM);
  const right = new Vector3().crossVectors(up, direction).normalize();
  const aim = centre
    .clone()
    .addScaledVector(right, placement.aimOffset[0] * placement.distanceM)
    .addScaledVector(up, placement.aimOffset[1] * placement.distanceM);
  camera.lookAt(aim);
  camera.rotateZ(placement.rollDeg * toRad);
  camera.updateMatrixWorld(true);
  camera.updateProjectionMatrix();
  return camera;
}

/** Forearm stand-in matching the mesh's cuff (measured on the rig: 5.2 cm wide, 3.8 cm thick at the wrist), 22 cm long. */
const FOREARM = { radiusM: 0.0185, lengthM: 0.22, widthScale: 1.38 };

function forearmMatrix(rig: HandRig): Matrix4 {
  const frame = forearmFrame(rig);
  // Capsule local Y along the forearm (wrist local +Z), local X along the radio-ulnar axis, local Z dorsal.
  const basis = new Matrix4().makeBasis(
    new Vector3(1, 0, 0).applyQuaternion(frame.quaternion),
    frame.proximal.clone(),
    new Vector3(0, -1, 0).applyQuaternion(frame.quaternion),
  );
  const rotation = new Quaternion().setFromRotationMatrix(basis);
  // The cylinder starts at the wrist joint, so its rounded end fills the mesh's open cuff (which ends 2.2 cm proximal
  // and turns with the hand) when the wrist flexes or extends far.
  const centre = frame.origin.clone().addScaledVector(frame.proximal, FOREARM.lengthM / 2);
  return new Matrix4().compose(centre, rotation, new Vector3(1, 1, 1));
}

export interface FrameTruth {
  side: HandSide;
  view: CameraView;
  distanceM: number;
  camera: CameraPlacement;
  skinHex: string;
  lightingKind: SceneLook["lightingKind"];
  background: string;
  /** Commanded angles: the truth. */
  commandedDeg: HandPose;
  /** What the landmark-angle formula gives on the exact landmark positions (not zero at rest). */
  landmarkFormulaDeg: Record<PoseKey, number | null>;
  /** The 21 landmarks (MediaPipe order) in the camera frame, metres: x right, y down, z away from the camera. */
  landmarksCameraM: [number, number, number][];
  /** The 21 landmarks projected into the image, pixels from the top-left corner. */
  landmarksImagePx: [number, number][];
  /** Unit vector from elbow to wrist along the forearm capsule, camera axes as `landmarksCameraM`. */
  forearmCameraDir: [number, number, number];
}

function round(value: number, digits = 4): number {
  const factor = 10 ** digits;
  return Math.round(value * factor) / factor;
}

/** Everything for one frame: the page's spec and the truth written beside it. */
export function buildFrame(
  rig: HandRig,
  pose: HandPose,
  camera: PerspectiveCamera,
  placement: CameraPlacement,
  look: SceneLook,
): { spec: RenderFrameSpec; truth: FrameTruth } {
  const posed = poseHand(rig, pose);
  const boneMatrices: Record<string, number[]> = {};
  for (const joint of RIG_JOINT_NAMES) {
    const scale = rig.boneScales?.[joint];
    const matrix = scale ? posed.jointMatrices[joint].clone().multiply(new Matrix4().makeScale(...scale)) : posed.jointMatrices[joint];
    boneMatrices[joint] = matrix.toArray();
  }
  // The mesh's cuff is skinned to the wrist bone alone; left to turn with the hand it swings out of the forearm
  // and shows its open end. Holding that bone still (the wrist joint's position does not move either way) lets
  // the skin between cuff and metacarpals bend instead, as skin over a wrist does.
  boneMatrices.wrist = new Matrix4().compose(rig.joints.wrist.position, rig.joints.wrist.quaternion, new Vector3(1, 1, 1)).toArray();
  const cameraRotation = new Matrix4().extractRotation(camera.matrixWorld);
  const toWorld = (direction: [number, number, number]) =>
    new Vector3(...direction).normalize().transformDirection(cameraRotation).toArray() as [number, number, number];
  const spec: RenderFrameSpec = {
    side: rig.side,
    widthPx: IMAGE_WIDTH_PX,
    heightPx: IMAGE_HEIGHT_PX,
    boneMatrices,
    camera: { matrixWorld: camera.matrixWorld.toArray(), verticalFovDeg: camera.fov, nearM: camera.near, farM: camera.far },
    skin: { colorHex: look.skinHex, roughness: look.roughness },
    forearm: { matrix: forearmMatrix(rig).toArray(), ...FOREARM },
    background: look.background,
    lighting: {
      ...look.lighting,
      key: { ...look.lighting.key, direction: toWorld(look.lighting.key.direction) },
      fill: { ...look.lighting.fill, direction: toWorld(look.lighting.fill.direction) },
    },
    jpegQuality: 0.9,
  };
  const landmarks = landmarkPositions(posed);
  const flipYZ = new Matrix4().makeScale(1, -1, -1);
  const landmarksCameraM = landmarks.map((point) => {
    const inCamera = point.clone().applyMatrix4(camera.matrixWorldInverse).applyMatrix4(flipYZ);
    return [round(inCamera.x, 5), round(inCamera.y, 5), round(inCamera.z, 5)] as [number, number, number];
  });
  const landmarksImagePx = landmarks.map((point) => {
    const ndc = point.clone().project(camera);
    return [round(((ndc.x + 1) / 2) * IMAGE_WIDTH_PX, 2), round(((1 - ndc.y) / 2) * IMAGE_HEIGHT_PX, 2)] as [number, number];
  });
  const forearmInCamera = forearmFrame(rig)
    .proximal.negate()
    .transformDirection(camera.matrixWorldInverse)
    .applyMatrix4(flipYZ);
  const formula = landmarkAnglesDeg(rig, posed);
  const truth: FrameTruth = {
    side: rig.side,
    view: placement.view,
    distanceM: round(placement.distanceM, 3),
    camera: placement,
    skinHex: look.skinHex,
    lightingKind: look.lightingKind,
    background: look.background.kind === "plain" ? look.background.colorHex : `${look.background.topHex}>${look.background.bottomHex}`,
    commandedDeg: pose,
    landmarkFormulaDeg: Object.fromEntries(
      Object.entries(formula).map(([key, value]) => [key, value === null ? null : round(value, 3)]),
    ) as Record<PoseKey, number | null>,
    landmarksCameraM,
    landmarksImagePx,
    forearmCameraDir: [round(forearmInCamera.x, 6), round(forearmInCamera.y, 6), round(forearmInCamera.z, 6)],
  };
  return { spec, truth };
}

export interface RandomFrameOptions {
  views?: readonly CameraView[];
  sides?: readonly HandSide[];
  distanceRangeM?: readonly [number, number];
}

/** One random labelled frame, fully determined by its seed. */
export function randomFrame(
  rigs: Record<HandSide, HandRig>,
  seed: number,
  options: RandomFrameOptions = {},
): { spec: RenderFrameSpec; truth: FrameTruth; seed: number } {
  const rng = makeRng(seed);
  const side = pick(rng, options.sides ?? (["left", "right"] as const));
  const view = pick(rng, options.views ?? CAMERA_VIEWS);
  const pose = samplePose(rng);
  const placement = sampleCamera(rng, view, options.distanceRangeM);
  const look = sampleLook(rng);
  const rig = rigs[side];
  const camera = placeCamera(side, placement, handCentre(poseHand(rig, pose)));
  return { ...buildFrame(rig, pose, camera, placement, look), seed };
}
