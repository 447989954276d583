import { dot, lineAngleDeg, normalize, type Vec3 } from "./vec";

export type PlaneVerdict = "against_gravity" | "gravity_assisted" | "gravity_minimized" | "unclear";

/**
 * An axis at least 60 degrees from gravity means the motion plane is near vertical; within 30 degrees, near
 * horizontal. The band between is left `unclear` rather than guessed, because a tilted plane is partly each.
 */
export const PLANE_LIMITS = { verticalMinDeg: 60, horizontalMaxDeg: 30 } as const;

/** Straight down the image: camera y points down. */
export const IMAGE_DOWN: Vec3 = [0, 1, 0];

export interface PlaneReading {
  verdict: PlaneVerdict;
  /** Angle between the joint's axis of motion and the gravity line, 0..90 degrees. */
  axisToGravityDeg: number;
}

export function unitGravity(gravity: Vec3 | null | undefined): Vec3 {
  return (gravity && normalize(gravity)) || IMAGE_DOWN;
}

export function axisToGravityDeg(axis: Vec3, gravityUnit: Vec3): number {
  return lineAngleDeg(axis, gravityUnit);
}

/**
 * `travelAlongGravity` is the component along gravity of the direction the moving part travels as the angle grows:
 * negative means it rises (works against gravity).
 */
export function planeVerdict(axisToGravity: number, travelAlongGravity: number): PlaneVerdict {
  if (axisToGravity >= PLANE_LIMITS.verticalMinDeg) return travelAlongGravity < 0 ? "against_gravity" : "gravity_assisted";
  if (axisToGravity <= PLANE_LIMITS.horizontalMaxDeg) return "gravity_minimized";
  return "unclear";
}

export function readPlane(axis: Vec3, travel: Vec3, gravityUnit: Vec3): PlaneReading & { travelAlongGravity: number } {
  const axisDeg = axisToGravityDeg(axis, gravityUnit);
  const travelAlongGravity = dot(travel, gravityUnit);
  return { verdict: planeVerdict(axisDeg, travelAlongGravity), axisToGravityDeg: axisDeg, travelAlongGravity };
}

/** Weighted running mean of plane readings over the frames that matter (the outward arc of each repetition). */
export class PlaneAccumulator {
  private weight = 0;
  private sumAxisDeg = 0;
  private sumTravel = 0;

  add(axisDeg: number, travelAlongGravity: number, weight = 1): void {
    if (!(weight > 0)) return;
    this.weight += weight;
    this.sumAxisDeg += weight * axisDeg;
    this.sumTravel += weight * travelAlongGravity;
  }

  merge(other: PlaneAccumulator): void {
    this.weight += other.weight;
    this.sumAxisDeg += other.sumAxisDeg;
    this.sumTravel += other.sumTravel;
  }

  get empty(): boolean {
    return this.weight === 0;
  }

  result(): PlaneReading | null {
    if (this.weight === 0) return null;
    const axisDeg = this.sumAxisDeg / this.weight;
    return { verdict: planeVerdict(axisDeg, this.sumTravel / this.weight), axisToGravityDeg: axisDeg };
  }
}
