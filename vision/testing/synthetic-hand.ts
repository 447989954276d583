// A forward-kinematics hand of our own, posed at known joint angles, for tests and benchmarks. It places the 21
// landmarks in the same order and axes the tracker gives (metres, x right, y down, z away from the camera), so the
// measurement code can be checked against angles we set rather than angles we measured.
import { uniformFloat64 } from "pure-rand/distribution/uniformFloat64";
import { xoroshiro128plus } from "pure-rand/generator/xoroshiro128plus";
import type { Condition, Digit, MotionId, Side } from "@/lib/motions/catalog";
import { CORRECTION_MODEL, readsPicturePoints } from "../correction";
import { DIGIT_CHAIN, LANDMARK_COUNT, WRIST } from "../landmarks";
import { add, cross, normalize, rejectFrom, scale, type Vec3 } from "../vec";

const DEG = Math.PI / 180;

/**
 * Adult bone lengths in millimetres, rounded from general anatomy texts [common practice]: wrist crease to each MCP
 * along the palm, then proximal, middle and distal phalanx (to the fingertip). Radial offsets place the MCPs across
 * the palm, thumb side positive, middle finger on the long axis.
 */
export const BONES_MM = {
  index: { palm: 92, radial: 22, phalanges: [40, 23, 19] },
  middle: { palm: 95, radial: 0, phalanges: [45, 27, 20] },
  ring: { palm: 88, radial: -17, phalanges: [42, 26, 20] },
  little: { palm: 80, radial: -32, phalanges: [33, 19, 18] },
  thumb: { cmc: { distal: 25, radial: 22, palmar: 8 }, bones: [45, 32, 25] },
} as const;

/** The thumb's metacarpal at rest points distally, toward the thumb side and somewhat out of the palm [common practice]. */
const THUMB_REST_DIRECTION: Vec3 = [0.6, 0.65, 0.45];

export interface FingerPose {
  mcpFlexionDeg: number;
  /** Toward the thumb side, out of the metacarpal's flexion plane. */
  radialAbductionDeg: number;
  pipFlexionDeg: number;
  dipFlexionDeg: number;
}

export interface HandPose {
  wristFlexionDeg: number;
  wristRadialDeviationDeg: number;
  fingers: Record<Exclude<Digit, "thumb">, FingerPose>;
  thumb: { mcpFlexionDeg: number; ipFlexionDeg: number };
}

export function neutralPose(): HandPose {
  const finger = (): FingerPose => ({ mcpFlexionDeg: 0, radialAbductionDeg: 0, pipFlexionDeg: 0, dipFlexionDeg: 0 });
  return {
    wristFlexionDeg: 0,
    wristRadialDeviationDeg: 0,
    fingers: { index: finger(), middle: finger(), ring: finger(), little: finger() },
    thumb: { mcpFlexionDeg: 0, ipFlexionDeg: 0 },
  };
}

/**
 * Where the forearm is in the camera's axes: its distal direction and its radial direction (perpendicular).
 * The hand hangs off the wrist at `wrist`.
 */
export interface Placement {
  forearmDistal: Vec3;
  forearmRadial: Vec3;
  wrist: Vec3;
}

/** Orthonormal frame: long axis, radial axis, palmar normal (the last set by the side: a left hand is a mirror image). */
interface Frame {
  u: Vec3;
  r: Vec3;
  n: Vec3;
}

function forearmFrame(placement: Placement, side: Side): Frame {
  const u = normalize(placement.forearmDistal)!;
  const r = normalize(rejectFrom(placement.forearmRadial, u))!;
  const rc = cross(r, u);
  return { u, r, n: side === "right" ? rc : scale(rc, -1) };
}

function inFrame(f: Frame, along: number, radial: number, palmar: number): Vec3 {
  return add(add(scale(f.u, along), scale(f.r, radial)), scale(f.n, palmar));
}

/** Width over height of the picture `pinholePicture` projects into. */
export const PINHOLE_ASPECT = 640 / 480;

/**
 * The picture points of a camera-axes hand under a 600-pixel pinhole centred in a 640 x 480 picture, as fractions of
 * its width and height (how the tracker reports them), z 0.
 */
export function pinholePicture(hand: readonly Vec3[]): [number, number, number][] {
  return hand.map((p) => [(320 + (600 * p[0]) / p[2]) / 640, (240 + (600 * p[1]) / p[2]) / 480, 0]);
}

/** The picture a finger estimator reads for a camera-axes hand: its `pinholePicture` points and that picture's aspect. */
export function pinholeFingerPicture(hand: readonly Vec3[]): { image: [number, number, number][]; aspect: number } {
  return { image: pinholePicture(hand), aspect: PINHOLE_ASPECT };
}

export interface PosedHand {
  landmarks: Vec3[];
  /** Unit vector elbow to wrist. */
  forearm: Vec3;
}

/**
 * Landmarks of a hand in `pose`. The wrist deviates first (about the forearm's palm normal) and then flexes (about the
 * moved radial axis); each finger flexes at the MCP and then abducts about its moved palmar axis; PIP, DIP and the
 * thumb joints are hinges. These orders are the ones the measurement decomposes by, so set angles read back exactly.
 */
export function poseHand(pose: HandPose, side: Side, placement: Placement): PosedHand {
  const fore = forearmFrame(placement, side);
  const dev = pose.wristRadialDeviationDeg * DEG;
  const u1 = add(scale(fore.u, Math.cos(dev)), scale(fore.r, Math.sin(dev)));
  const r1 = add(scale(fore.u, -Math.sin(dev)), scale(fore.r, Math.cos(dev)));
  const flex = pose.wristFlexionDeg * DEG;
  const hand: Frame = {
    u: add(scale(u1, Math.cos(flex)), scale(fore.n, Math.sin(flex))),
    r: r1,
    n: add(scale(u1, -Math.sin(flex)), scale(fore.n, Math.cos(flex))),
  };
  const mm = 0.001;
  const wrist = placement.wrist;
  const landmarks: Vec3[] = new Array(LANDMARK_COUNT);
  landmarks[WRIST] = wrist;

  for (const digit of ["index", "middle", "ring", "little"] as const) {
    const bones = BONES_MM[digit];
    const fp = pose.fingers[digit];
    const mcp = add(wrist, scale(inFrame(hand, bones.palm, bones.radial, 0), mm));
    const a = normalize(inFrame(hand, bones.palm, bones.radial, 0))!;
    const rA = normalize(rejectFrom(hand.r, a))!;
    const kA = normalize(rejectFrom(cross(hand.u, hand.n), a))!;
    const nA = cross(kA, a);
    const t1 = fp.mcpFlexionDeg * DEG;
    const a1 = add(scale(a, Math.cos(t1)), scale(nA, Math.sin(t1)));
    const n1 = add(scale(a, -Math.sin(t1)), scale(nA, Math.cos(t1)));
    const ab = fp.radialAbductionDeg * DEG;
    const b1 = add(scale(a1, Math.cos(ab)), scale(rA, Math.sin(ab)));
    const t2 = fp.pipFlexionDeg * DEG;
    const b2 = add(scale(b1, Math.cos(t2)), scale(n1, Math.sin(t2)));
    const n2 = add(scale(b1, -Math.sin(t2)), scale(n1, Math.cos(t2)));
    const t3 = fp.dipFlexionDeg * DEG;
    const b3 = add(scale(b2, Math.cos(t3)), scale(n2, Math.sin(t3)));
    const [iMcp, iPip, iDip, iTip] = DIGIT_CHAIN[digit];
    const pip = add(mcp, scale(b1, bones.phalanges[0] * mm));
    const dip = add(pip, scale(b2, bones.phalanges[1] * mm));
    landmarks[iMcp] = mcp;
    landmarks[iPip] = pip;
    landmarks[iDip] = dip;
    landmarks[iTip] = add(dip, scale(b3, bones.phalanges[2] * mm));
  }

  const tb = BONES_MM.thumb;
  const cmc = add(wrist, scale(inFrame(hand, tb.cmc.distal, tb.cmc.radial, tb.cmc.palmar), mm));
  const ta = normalize(inFrame(hand, ...THUMB_REST_DIRECTION))!;
  const toward = normalize(rejectFrom(add(hand.n, scale(hand.r, -1)), ta))!;
  const tm = pose.thumb.mcpFlexionDeg * DEG;
  const tb1 = add(scale(ta, Math.cos(tm)), scale(toward, Math.sin(tm)));
  const td1 = add(scale(ta, -Math.sin(tm)), scale(toward, Math.cos(tm)));
  const ti = pose.thumb.ipFlexionDeg * DEG;
  const tb2 = add(scale(tb1, Math.cos(ti)), scale(td1, Math.sin(ti)));
  const tMcp = add(cmc, scale(ta, tb.bones[0] * mm));
  const tIp = add(tMcp, scale(tb1, tb.bones[1] * mm));
  landmarks[1] = cmc;
  landmarks[2] = tMcp;
  landmarks[3] = tIp;
  landmarks[4] = add(tIp, scale(tb2, tb.bones[2] * mm));
  return { landmarks, forearm: fore.u };
}

/** Sets the joint that `motion` reads so the motion reports `reportedDeg` (the inverse of the sign conventions). */
export function withMotionAngle(base: HandPose, motion: MotionId, digit: Digit | null, reportedDeg: number): HandPose {
  const pose: HandPose = structuredClone(base);
  const finger = digit && digit !== "thumb" ? pose.fingers[digit] : null;
  switch (motion) {
    case "wrist.flexion":
      pose.wristFlexionDeg = reportedDeg;
      break;
    case "wrist.extension":
      pose.wristFlexionDeg = -reportedDeg;
      break;
    case "wrist.radial_deviation":
      pose.wristRadialDeviationDeg = reportedDeg;
      break;
    case "wrist.ulnar_deviation":
      pose.wristRadialDeviationDeg = -reportedDeg;
      break;
    case "mcp.flexion":
    case "mcp.extension": {
      const deg = motion === "mcp.flexion" ? reportedDeg : -reportedDeg;
      if (digit === "thumb") pose.thumb.mcpFlexionDeg = deg;
      else finger!.mcpFlexionDeg = deg;
      break;
    }
    case "pip.flexion":
      finger!.pipFlexionDeg = reportedDeg;
      break;
    case "dip.flexion":
      finger!.dipFlexionDeg = reportedDeg;
      break;
    case "ip.flexion":
      pose.thumb.ipFlexionDeg = reportedDeg;
      break;
    case "ip.extension":
      if (digit === "thumb") pose.thumb.ipFlexionDeg = -reportedDeg;
      else finger!.pipFlexionDeg = -reportedDeg;
      break;
    case "finger.abduction":
    case "finger.adduction": {
      const away = digit === "index" || digit === "middle" ? 1 : -1;
      finger!.radialAbductionDeg = (motion === "finger.abduction" ? 1 : -1) * away * reportedDeg;
      break;
    }
  }
  return pose;
}

/** Seeded randomness so every synthetic capture is reproducible. */
export class SeededRandom {
  private readonly rng;
  private spare = Number.NaN;

  constructor(seed: number) {
    this.rng = xoroshiro128plus(seed);
    // The first outputs of a freshly seeded xoroshiro are poorly mixed for small seeds; discard a few.
    for (let i = 0; i < 8; i++) uniformFloat64(this.rng);
  }

  uniform(lo = 0, hi = 1): number {
    return lo + (hi - lo) * uniformFloat64(this.rng);
  }

  /** Standard normal by the Box-Muller transform. */
  normal(): number {
    if (!Number.isNaN(this.spare)) {
      const s = this.spare;
      this.spare = Number.NaN;
      return s;
    }
    const u1 = 1 - uniformFloat64(this.rng);
    const u2 = uniformFloat64(this.rng);
    const radius = Math.sqrt(-2 * Math.log(u1));
    this.spare = radius * Math.sin(2 * Math.PI * u2);
    return radius * Math.cos(2 * Math.PI * u2);
  }

  /** A uniformly random unit vector. */
  direction(): Vec3 {
    for (;;) {
      const v: Vec3 = [this.normal(), this.normal(), this.normal()];
      const n = normalize(v);
      if (n) return n;
    }
  }
}

/** A random forearm placement: any direction, any roll about it. */
export function randomPlacement(random: SeededRandom): Placement {
  const forearmDistal = random.direction();
  let forearmRadial = rejectFrom(random.direction(), forearmDistal);
  while (!normalize(forearmRadial)) forearmRadial = rejectFrom(random.direction(), forearmDistal);
  return { forearmDistal, forearmRadial, wrist: [random.uniform(-0.05, 0.05), random.uniform(-0.05, 0.05), random.uniform(0.3, 0.6)] };
}

/** One repetition of a synthetic movement: rest, a smooth rise to the peak, a hold, a smooth return. */
export interface SyntheticRep {
  peakDeg: number;
  moveMs?: number;
  holdMs?: number;
  returnMs?: number;
  restAfterMs?: number;
}

export interface SyntheticCaptureSpec {
  motion: MotionId;
  side: Side;
  digit: Digit | null;
  condition: Condition;
  placement: Placement;
  /** Reported angle at rest. */
  restDeg?: number;
  reps: SyntheticRep[];
  restBeforeMs?: number;
  fps?: number;
  /** Standard deviation of Gaussian noise added to every landmark coordinate, millimetres. */
  noiseMm?: number;
  /** Share of frames lost outright (no frame at all). */
  dropRate?: number;
  /** Share of frames with no hand found. */
  noHandRate?: number;
  /** Share of frames with a low score and scrambled landmarks, which gating must skip. */
  lowScoreRate?: number;
  includeForearm?: boolean;
  gravity?: Vec3;
  base?: HandPose;
  seed?: number;
  /**
   * Keep each frame's picture points (`pinholePicture` of the frame's landmarks) and the picture's aspect. Default: as
   * a live recording does, for the motions whose correction reads them (vision/correction.ts readsPicturePoints).
   */
  picture?: boolean;
}

export interface SyntheticFrame {
  t: number;
  score: number;
  hand: Vec3[] | null;
  forearm?: Vec3;
  image?: [number, number][] | null;
}

export interface SyntheticCapture {
  format: "kinarc.capture";
  version: 1;
  motion: MotionId;
  side: Side;
  digit: Digit | null;
  condition: Condition;
  gravity?: Vec3;
  imageAspect?: number;
  frames: SyntheticFrame[];
}

/** Smooth 0..1 ramp (half a cosine), so speed is zero at both ends like a real reach. */
function ease(x: number): number {
  return 0.5 - 0.5 * Math.cos(Math.PI * Math.min(1, Math.max(0, x)));
}

/** The reported angle over time for a rep profile; exported so tests can read the true value at any instant. */
export function profileAngle(spec: Pick<SyntheticCaptureSpec, "restDeg" | "reps" | "restBeforeMs">, tMs: number): number {
  const rest = spec.restDeg ?? 0;
  let t0 = spec.restBeforeMs ?? 1000;
  if (tMs < t0) return rest;
  for (const rep of spec.reps) {
    const move = rep.moveMs ?? 700;
    const hold = rep.holdMs ?? 1000;
    const back = rep.returnMs ?? 700;
    const after = rep.restAfterMs ?? 1000;
    const span = rep.peakDeg - rest;
    const x = tMs - t0;
    if (x < move) return rest + span * ease(x / move);
    if (x < move + hold) return rep.peakDeg;
    if (x < move + hold + back) return rep.peakDeg - span * ease((x - move - hold) / back);
    if (x < move + hold + back + after) return rest;
    t0 += move + hold + back + after;
  }
  return rest;
}

export function profileDurationMs(spec: Pick<SyntheticCaptureSpec, "reps" | "restBeforeMs">): number {
  let total = spec.restBeforeMs ?? 1000;
  for (const rep of spec.reps) total += (rep.moveMs ?? 700) + (rep.holdMs ?? 1000) + (rep.returnMs ?? 700) + (rep.restAfterMs ?? 1000);
  return total;
}

/** A capture file (format v1) of the synthetic hand moving through `spec`, with the noise and losses it asks for. */
export function buildSyntheticCapture(spec: SyntheticCaptureSpec): SyntheticCapture {
  const random = new SeededRandom(spec.seed ?? 1);
  const fps = spec.fps ?? 30;
  const base = spec.base ?? neutralPose();
  const noiseM = (spec.noiseMm ?? 0) / 1000;
  const frames: SyntheticFrame[] = [];
  const duration = profileDurationMs(spec);
  const keepPicture = spec.picture ?? readsPicturePoints(CORRECTION_MODEL, spec.motion, spec.digit);
  for (let i = 0; i * (1000 / fps) <= duration; i++) {
    const t = Math.round(i * (1000 / fps) * 1000) / 1000;
    if (random.uniform() < (spec.dropRate ?? 0)) continue;
    if (random.uniform() < (spec.noHandRate ?? 0)) {
      frames.push(keepPicture ? { t, score: random.uniform(0, 0.2), hand: null, image: null } : { t, score: random.uniform(0, 0.2), hand: null });
      continue;
    }
    const pose = withMotionAngle(base, spec.motion, spec.digit, profileAngle(spec, t));
    const posed = poseHand(pose, spec.side, spec.placement);
    const lowScore = random.uniform() < (spec.lowScoreRate ?? 0);
    // A low-score frame is the tracker guessing: scramble it by centimetres so a gating slip would show in the result.
    const jitterM = lowScore ? 0.03 : noiseM;
    const hand = posed.landmarks.map((p): Vec3 =>
      jitterM > 0 ? [p[0] + jitterM * random.normal(), p[1] + jitterM * random.normal(), p[2] + jitterM * random.normal()] : p,
    );
    const frame: SyntheticFrame = { t, score: lowScore ? random.uniform(0.05, 0.4) : random.uniform(0.85, 0.99), hand };
    if (spec.includeForearm ?? true) frame.forearm = posed.forearm;
    if (keepPicture) frame.image = pinholePicture(hand).map(([x, y]): [number, number] => [x, y]);
    frames.push(frame);
  }
  const capture: SyntheticCapture = {
    format: "kinarc.capture",
    version: 1,
    motion: spec.motion,
    side: spec.side,
    digit: spec.digit,
    condition: spec.condition,
    frames,
  };
  if (spec.gravity) capture.gravity = spec.gravity;
  if (keepPicture) capture.imageAspect = PINHOLE_ASPECT;
  return capture;
}

/** True axis of the motion in the model and the direction the part travels, from two nearby poses (finite difference). */
export function trueTravel(base: HandPose, motion: MotionId, digit: Digit | null, side: Side, placement: Placement, reportedDeg: number, movingLandmark: number): Vec3 {
  const a = poseHand(withMotionAngle(base, motion, digit, reportedDeg), side, placement).landmarks[movingLandmark];
  const b = poseHand(withMotionAngle(base, motion, digit, reportedDeg + 0.5), side, placement).landmarks[movingLandmark];
  return normalize([b[0] - a[0], b[1] - a[1], b[2] - a[2]]) ?? [0, 0, 0];
}

