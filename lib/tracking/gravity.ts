/**
 * Gravity in the camera's axes from a phone's or tablet's motion sensor, for the test-plane check. Pure.
 *
 * `DeviceMotionEvent.accelerationIncludingGravity` is in the device's axes (x to the right of the screen in its
 * natural orientation, y to its top, z out of the screen toward the viewer) and, at rest, points up: a device lying
 * flat screen-up reads about (0, 0, +9.81) (W3C DeviceOrientation Event Specification, accelerationIncludingGravity).
 * Gravity itself is the opposite. The tracker's camera axes are those of the unmirrored picture: x right, y down,
 * z away from the camera.
 */
import type { Vec3 } from "@/vision/vec";

export type CameraFacing = "user" | "environment";

// Readings further than this from 1 g are the device being moved, not gravity [common practice: accelerometer tilt
// sensing is valid only when other accelerations are small].
const STILL_TOLERANCE_MS2 = 1.5;
const STANDARD_GRAVITY_MS2 = 9.80665;

/**
 * `screenAngleDeg` is `screen.orientation.angle` (0, 90, 180, 270): how far the picture is turned from the device's
 * natural orientation. Returns a unit vector, or null when the reading is missing or the device is moving.
 */
export function gravityInCamera(reading: { x: number | null; y: number | null; z: number | null } | null, facing: CameraFacing, screenAngleDeg = 0): Vec3 | null {
  if (!reading || reading.x === null || reading.y === null || reading.z === null) return null;
  const { x, y, z } = reading;
  const magnitude = Math.hypot(x, y, z);
  if (!Number.isFinite(magnitude) || Math.abs(magnitude - STANDARD_GRAVITY_MS2) > STILL_TOLERANCE_MS2) return null;
  // Down, in device axes.
  const down: Vec3 = [-x / magnitude, -y / magnitude, -z / magnitude];
  // Into the screen's current axes. Angle 90 is the device turned a quarter counter-clockwise with the picture kept
  // upright: the screen's up is then the device's +x and its right the device's -y.
  const a = (screenAngleDeg * Math.PI) / 180;
  const sx = down[0] * Math.cos(a) - down[1] * Math.sin(a);
  const sy = down[0] * Math.sin(a) + down[1] * Math.cos(a);
  const sz = down[2];
  // Screen axes (x right, y up, z toward the viewer) to the camera picture's (x right, y down, z away from the
  // camera). The front camera looks out toward the viewer, so its picture's right is the screen's left; the rear
  // camera looks away, along -z, with the screen's right.
  const camera: Vec3 = facing === "user" ? [-sx, -sy, sz] : [sx, -sy, -sz];
  const clean = (v: number) => (Math.abs(v) < 1e-12 ? 0 : v);
  return [clean(camera[0]), clean(camera[1]), clean(camera[2])];
}

/** Angle in degrees between the picture's down direction and true down: 0 for a camera held upright. */
export function tiltFromUprightDeg(gravity: Vec3): number {
  const cos = Math.max(-1, Math.min(1, gravity[1] / Math.hypot(gravity[0], gravity[1], gravity[2])));
  return (Math.acos(cos) * 180) / Math.PI;
}
