import type { Digit, MotionId, Side } from "@/lib/motions/catalog";
import { DIGIT_CHAIN, INDEX_MCP, LITTLE_MCP, MIDDLE_MCP, WRIST, type HandLandmarks } from "./landmarks";
import { RAD_TO_DEG, cross, dot, imagePlaneAngleDeg, normalize, rejectFrom, scale, sub, type Vec3 } from "./vec";

/**
 * The hand's own axes, from the wrist and the index, middle and little MCP landmarks.
 * `flexionAxis` = longAxis x palmarNormal: a positive rotation about it bends a segment toward the palm on either
 * hand, so one sign rule serves left and right. The palm normal needs the side: a left hand is a mirror image.
 */
export interface HandAxes {
  wrist: Vec3;
  longAxis: Vec3;
  radialAxis: Vec3;
  palmarNormal: Vec3;
  flexionAxis: Vec3;
}

/** Why a single angle can't be read from a frame. */
export type AngleFailure = "degenerate_hand" | "no_neutral";

export function handAxes(hand: HandLandmarks, side: Side): HandAxes | null {
  const wrist = hand[WRIST];
  const longAxis = normalize(sub(hand[MIDDLE_MCP], wrist));
  if (!longAxis) return null;
  const radialAxis = normalize(rejectFrom(sub(hand[INDEX_MCP], hand[LITTLE_MCP]), longAxis));
  if (!radialAxis) return null;
  const rc = cross(radialAxis, longAxis);
  const palmarNormal = side === "right" ? rc : scale(rc, -1);
  return { wrist, longAxis, radialAxis, palmarNormal, flexionAxis: cross(longAxis, palmarNormal) };
}

/** A 3-D angle with its image-plane counterpart (what a protractor held to the screen would read), same sign. */
export interface AngleReading {
  deg: number;
  imagePlaneDeg: number;
}

/** An angle for a motion plus what the test-plane check needs: the joint's axis and where the moving part goes. */
export interface MotionReading extends AngleReading {
  /** Unit axis of the motion, camera axes. */
  axis: Vec3;
  /** Unit direction the moving segment travels as the reported angle grows. */
  travel: Vec3;
}

function signOf(x: number): number {
  return x < 0 ? -1 : 1;
}

interface Hinge {
  deg: number;
  imagePlaneDeg: number;
  axis: Vec3;
  travel: Vec3;
}

/**
 * Flexion at a hinge joint: the angle between the bone lines `proximal` and `distal`, taken in the joint's flexion
 * plane (perpendicular to `k`, the lateral axis, made perpendicular to the proximal bone). For a true hinge this is
 * the 3-D angle between the bones; measured in the plane, sideways landmark jitter neither inflates it nor flips its
 * sign near straight.
 */
function hingeFlexion(proximal: Vec3, distal: Vec3, k: Vec3): Hinge | null {
  const a = normalize(proximal);
  const b = normalize(distal);
  if (!a || !b) return null;
  const axis = normalize(rejectFrom(k, a));
  if (!axis) return null;
  const palmward = cross(axis, a);
  const rad = Math.atan2(dot(b, palmward), dot(b, a));
  return { deg: rad * RAD_TO_DEG, imagePlaneDeg: signOf(rad) * imagePlaneAngleDeg(a, rejectFrom(b, axis)), axis, travel: cross(axis, b) };
}

/**
 * MCP of a finger: flexion is the angle of the proximal phalanx in the metacarpal's flexion plane, and abduction is
 * its angle out of that plane toward the thumb side (flexion first, then abduction about the moved palmar axis, so
 * the two do not leak into each other).
 */
function fingerMcp(hand: HandLandmarks, axes: HandAxes, digit: Exclude<Digit, "thumb">) {
  const [mcp, pip] = DIGIT_CHAIN[digit];
  const a = normalize(sub(hand[mcp], axes.wrist));
  const b = normalize(sub(hand[pip], hand[mcp]));
  if (!a || !b) return null;
  const k = normalize(rejectFrom(axes.flexionAxis, a));
  const r = normalize(rejectFrom(axes.radialAxis, a));
  if (!k || !r) return null;
  const n = cross(k, a);
  const flexRad = Math.atan2(dot(b, n), dot(b, a));
  const radialAbdRad = Math.asin(Math.max(-1, Math.min(1, dot(b, r))));
  const inFlexPlane = rejectFrom(b, r);
  const sideways = normalize(rejectFrom(r, b)) ?? r;
  const sagittalSign = signOf(flexRad);
  return {
    flexion: {
      deg: flexRad * RAD_TO_DEG,
      imagePlaneDeg: sagittalSign * imagePlaneAngleDeg(a, inFlexPlane),
      axis: k,
      travel: cross(k, b),
    } satisfies Hinge,
    radialAbduction: {
      deg: radialAbdRad * RAD_TO_DEG,
      imagePlaneDeg: signOf(radialAbdRad) * imagePlaneAngleDeg(a, rejectFrom(b, n)),
      axis: normalize(rejectFrom(axes.palmarNormal, b)) ?? axes.palmarNormal,
      travel: sideways,
    },
  };
}

/** The thumb flexes toward the palm and the little-finger side; its hinge axis is set by that direction and its metacarpal. */
function thumbHingeAxis(hand: HandLandmarks, axes: HandAxes): Vec3 | null {
  const [cmc, mcp] = DIGIT_CHAIN.thumb;
  const a = normalize(sub(hand[mcp], hand[cmc]));
  if (!a) return null;
  const toward = normalize(rejectFrom(sub(axes.palmarNormal, axes.radialAxis), a));
  if (!toward) return null;
  return cross(a, toward);
}

function digitJointFlexion(hand: HandLandmarks, axes: HandAxes, digit: Digit, joint: "mcp" | "pip" | "dip" | "ip"): Hinge | null {
  const chain = DIGIT_CHAIN[digit];
  if (digit === "thumb") {
    const k = thumbHingeAxis(hand, axes);
    if (!k) return null;
    const [cmc, mcp, ip, tip] = chain;
    return joint === "mcp" ? hingeFlexion(sub(hand[mcp], hand[cmc]), sub(hand[ip], hand[mcp]), k) : hingeFlexion(sub(hand[ip], hand[mcp]), sub(hand[tip], hand[ip]), k);
  }
  const [mcp, pip, dip, tip] = chain;
  // The lateral axis is carried down the finger: the metacarpal's, made perpendicular to each phalanx in turn. Flexion
  // of a joint doesn't turn the next joint's axis, and sideways spread at the MCP turns it exactly this way.
  const atMcp = fingerMcp(hand, axes, digit)?.flexion ?? null;
  if (joint === "mcp" || !atMcp) return atMcp;
  const atPip = hingeFlexion(sub(hand[pip], hand[mcp]), sub(hand[dip], hand[pip]), atMcp.axis);
  if (joint === "pip" || !atPip) return atPip;
  return hingeFlexion(sub(hand[dip], hand[pip]), sub(hand[tip], hand[dip]), atPip.axis);
}

/**
 * Wrist angles of the hand relative to a forearm direction (unit, elbow to wrist). Flexion is the forearm's angle to
 * the hand's long axis in the plane of long axis and palm normal; deviation is the forearm's elevation out of that
 * plane toward the little-finger side (a radial tilt of the hand). Flexion first, then deviation, so pure motions read
 * exactly and combined ones do not double count.
 */
export function wristAngles(axes: HandAxes, forearm: Vec3): { flexion: MotionReading; radialDeviation: MotionReading } | null {
  const f = normalize(forearm);
  if (!f) return null;
  const { longAxis: u, radialAxis: r, palmarNormal: n } = axes;
  const flexRad = Math.atan2(-dot(f, n), dot(f, u));
  const devRad = Math.asin(Math.max(-1, Math.min(1, -dot(f, r))));
  return {
    flexion: { deg: flexRad * RAD_TO_DEG, imagePlaneDeg: signOf(flexRad) * imagePlaneAngleDeg(rejectFrom(f, r), u), axis: r, travel: n },
    radialDeviation: { deg: devRad * RAD_TO_DEG, imagePlaneDeg: signOf(devRad) * imagePlaneAngleDeg(rejectFrom(f, n), u), axis: n, travel: r },
  };
}

/** The same reading counted the other way (extension as negative flexion). */
export function negate(reading: MotionReading): MotionReading {
  return { deg: -reading.deg, imagePlaneDeg: -reading.imagePlaneDeg, axis: reading.axis, travel: scale(reading.travel, -1) };
}

/**
 * The angle a capture of `motion` reports, positive in that motion's direction from anatomical zero
 * (a capture of wrist.extension reads +60 for 60 degrees of extension). Null when the frame can't give it.
 */
export function readMotion(
  motion: MotionId,
  digit: Digit | null,
  hand: HandLandmarks,
  axes: HandAxes,
  forearm: Vec3 | null,
): MotionReading | null {
  switch (motion) {
    case "wrist.flexion":
    case "wrist.extension":
    case "wrist.radial_deviation":
    case "wrist.ulnar_deviation": {
      if (!forearm) return null;
      const w = wristAngles(axes, forearm);
      if (!w) return null;
      if (motion === "wrist.flexion") return w.flexion;
      if (motion === "wrist.extension") return negate(w.flexion);
      if (motion === "wrist.radial_deviation") return w.radialDeviation;
      return negate(w.radialDeviation);
    }
    case "mcp.flexion":
    case "mcp.extension":
    case "pip.flexion":
    case "dip.flexion":
    case "ip.flexion":
    case "ip.extension": {
      if (!digit) return null;
      const joint = motion === "ip.extension" ? (digit === "thumb" ? "ip" : "pip") : (motion.slice(0, motion.indexOf(".")) as "mcp" | "pip" | "dip" | "ip");
      const hinge = digitJointFlexion(hand, axes, digit, joint);
      if (!hinge) return null;
      return motion === "mcp.extension" || motion === "ip.extension" ? negate(hinge) : hinge;
    }
    case "finger.abduction":
    case "finger.adduction": {
      if (!digit || digit === "thumb") return null;
      const mcp = fingerMcp(hand, axes, digit);
      if (!mcp) return null;
      const ab = mcp.radialAbduction;
      // Spreading is away from the middle finger: thumb-ward for the index, little-finger-ward for ring and little,
      // and whichever way it went for the middle finger itself.
      const awaySign = digit === "index" ? 1 : digit === "middle" ? signOf(ab.deg) : -1;
      const abduction: MotionReading = {
        deg: awaySign * ab.deg,
        imagePlaneDeg: awaySign * ab.imagePlaneDeg,
        axis: ab.axis,
        travel: scale(ab.travel, awaySign),
      };
      return motion === "finger.abduction" ? abduction : negate(abduction);
    }
  }
}
