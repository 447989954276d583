// Small 3-vector helpers on plain tuples: they run unchanged on the main thread, in a worker and in Node, and a frame
// needs only a few dozen of them, so a library's matrix types would cost more in conversions than they save.

export type Vec3 = readonly [number, number, number];

export const RAD_TO_DEG = 180 / Math.PI;

export function vec(x: number, y: number, z: number): Vec3 {
  return [x, y, z];
}

export function add(a: Vec3, b: Vec3): Vec3 {
  return [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
}

export function sub(a: Vec3, b: Vec3): Vec3 {
  return [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
}

export function scale(a: Vec3, s: number): Vec3 {
  return [a[0] * s, a[1] * s, a[2] * s];
}

export function dot(a: Vec3, b: Vec3): number {
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

export function cross(a: Vec3, b: Vec3): Vec3 {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}

export function length(a: Vec3): number {
  return Math.hypot(a[0], a[1], a[2]);
}

/** Unit vector, or null when the input is too short to have a direction (collapsed landmarks). */
export function normalize(a: Vec3, minLength = 1e-9): Vec3 | null {
  const len = length(a);
  if (!(len > minLength)) return null;
  return [a[0] / len, a[1] / len, a[2] / len];
}

/** The part of `a` perpendicular to the unit vector `axis`. */
export function rejectFrom(a: Vec3, axis: Vec3): Vec3 {
  const d = dot(a, axis);
  return [a[0] - axis[0] * d, a[1] - axis[1] * d, a[2] - axis[2] * d];
}

/** Unsigned angle between two vectors in degrees, 0..180; atan2 stays accurate near 0 and 180 where acos does not. */
export function angleBetweenDeg(a: Vec3, b: Vec3): number {
  return Math.atan2(length(cross(a, b)), dot(a, b)) * RAD_TO_DEG;
}

/** Angle between two lines (direction ignored), 0..90 degrees. */
export function lineAngleDeg(a: Vec3, b: Vec3): number {
  const deg = angleBetweenDeg(a, b);
  return deg > 90 ? 180 - deg : deg;
}

/** Unsigned angle between the projections of two vectors on the camera's image plane (x, y), or NaN if either vanishes. */
export function imagePlaneAngleDeg(a: Vec3, b: Vec3): number {
  const crossZ = a[0] * b[1] - a[1] * b[0];
  const d = a[0] * b[0] + a[1] * b[1];
  if (Math.hypot(a[0], a[1]) < 1e-9 || Math.hypot(b[0], b[1]) < 1e-9) return Number.NaN;
  return Math.abs(Math.atan2(crossZ, d)) * RAD_TO_DEG;
}

/** Rotates `v` about the unit `axis` by `angleRad` (Rodrigues' formula). */
export function rotateAbout(v: Vec3, axis: Vec3, angleRad: number): Vec3 {
  const c = Math.cos(angleRad);
  const s = Math.sin(angleRad);
  const k = cross(axis, v);
  const kd = dot(axis, v) * (1 - c);
  return [v[0] * c + k[0] * s + axis[0] * kd, v[1] * c + k[1] * s + axis[1] * kd, v[2] * c + k[2] * s + axis[2] * kd];
}

export function isFiniteVec(a: readonly number[]): boolean {
  return a.length === 3 && Number.isFinite(a[0]) && Number.isFinite(a[1]) && Number.isFinite(a[2]);
}

/** The signed turn from one picture direction to another, degrees, positive from x toward y (clockwise on screen). */
export function pictureTurnDeg(from: readonly number[], to: readonly number[]): number {
  return Math.atan2(from[0] * to[1] - from[1] * to[0], from[0] * to[0] + from[1] * to[1]) * RAD_TO_DEG;
}
