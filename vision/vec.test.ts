import { glMatrix, quat, vec3 } from "gl-matrix";
import { Vector3 } from "three";
import { describe, expect, it } from "vitest";
import { SeededRandom } from "./testing/synthetic-hand";
import { angleBetweenDeg, cross, dot, imagePlaneAngleDeg, length, lineAngleDeg, normalize, rejectFrom, rotateAbout, type Vec3 } from "./vec";

// Cross-checks of the hand-written vector maths against two general-purpose libraries from the npm registry:
// gl-matrix 3.4 (vec3, quat) and three.js 0.187 (Vector3). Random inputs from a fixed seed.

// gl-matrix stores Float32Array by default; double precision makes the comparison about the maths, not rounding.
glMatrix.setMatrixArrayType(Array);

const random = new SeededRandom(11);
const samples: Array<[Vec3, Vec3]> = Array.from({ length: 200 }, () => [
  [random.uniform(-2, 2), random.uniform(-2, 2), random.uniform(-2, 2)],
  [random.uniform(-2, 2), random.uniform(-2, 2), random.uniform(-2, 2)],
]);

function close(a: readonly number[], b: ArrayLike<number>, digits = 10) {
  for (let i = 0; i < 3; i++) expect(a[i]).toBeCloseTo(b[i], digits);
}

describe("vec3 maths against gl-matrix and three.js", () => {
  it("dot, cross, length and normalize agree with gl-matrix", () => {
    for (const [a, b] of samples) {
      expect(dot(a, b)).toBeCloseTo(vec3.dot(vec3.fromValues(...a), vec3.fromValues(...b)), 10);
      close(cross(a, b), vec3.cross(vec3.create(), vec3.fromValues(...a), vec3.fromValues(...b)));
      expect(length(a)).toBeCloseTo(vec3.length(vec3.fromValues(...a)), 10);
      close(normalize(a)!, vec3.normalize(vec3.create(), vec3.fromValues(...a)));
    }
  });

  it("angle between vectors agrees with three.js Vector3.angleTo and gl-matrix vec3.angle", () => {
    for (const [a, b] of samples) {
      const threeDeg = (new Vector3(...a).angleTo(new Vector3(...b)) * 180) / Math.PI;
      expect(angleBetweenDeg(a, b)).toBeCloseTo(threeDeg, 6);
      expect(angleBetweenDeg(a, b)).toBeCloseTo((vec3.angle(vec3.fromValues(...a), vec3.fromValues(...b)) * 180) / Math.PI, 6);
      expect(lineAngleDeg(a, b)).toBeCloseTo(Math.min(threeDeg, 180 - threeDeg), 6);
    }
  });

  it("rotation about an axis agrees with three.js applyAxisAngle and a gl-matrix quaternion", () => {
    for (const [a, b] of samples) {
      const axis = normalize(b)!;
      const angle = random.uniform(-Math.PI, Math.PI);
      const ours = rotateAbout(a, axis, angle);
      const viaThree = new Vector3(...a).applyAxisAngle(new Vector3(...axis), angle);
      close(ours, [viaThree.x, viaThree.y, viaThree.z]);
      const q = quat.setAxisAngle(quat.create(), vec3.fromValues(...axis), angle);
      close(ours, vec3.transformQuat(vec3.create(), vec3.fromValues(...a), q), 6);
    }
  });

  it("rejection from an axis agrees with three.js projectOnPlane", () => {
    for (const [a, b] of samples) {
      const axis = normalize(b)!;
      const viaThree = new Vector3(...a).projectOnPlane(new Vector3(...axis));
      close(rejectFrom(a, axis), [viaThree.x, viaThree.y, viaThree.z]);
    }
  });

  it("image-plane angle is three.js's angle between the vectors with z dropped", () => {
    for (const [a, b] of samples) {
      const deg = (new Vector3(a[0], a[1], 0).angleTo(new Vector3(b[0], b[1], 0)) * 180) / Math.PI;
      expect(imagePlaneAngleDeg(a, b)).toBeCloseTo(deg, 6);
    }
  });

  it("a vector too short to have a direction normalizes to null, not to NaN", () => {
    expect(normalize([0, 0, 0])).toBeNull();
    expect(imagePlaneAngleDeg([0, 0, 1], [1, 0, 0])).toBeNaN();
  });
});
