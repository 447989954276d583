import { describe, expect, it } from "vitest";
import { gravityInCamera, tiltFromUprightDeg } from "./gravity";

const G = 9.81;
const close = (a: readonly number[], b: readonly number[]) => a.forEach((v, i) => expect(v).toBeCloseTo(b[i], 6));

// Device readings follow the W3C DeviceOrientation Event Specification's convention for accelerationIncludingGravity:
// at rest the reading points away from the ground (a phone flat, screen up, reads z = +9.81; held upright in portrait,
// y = +9.81). Expected camera-axis directions follow from the tracker's axes: x right, y down, z away from the camera.
describe("gravity in camera axes", () => {
  it("phone upright in portrait: down in the picture is down, for either camera", () => {
    close(gravityInCamera({ x: 0, y: G, z: 0 }, "user")!, [0, 1, 0]);
    close(gravityInCamera({ x: 0, y: G, z: 0 }, "environment")!, [0, 1, 0]);
    expect(tiltFromUprightDeg(gravityInCamera({ x: 0, y: G, z: 0 }, "user")!)).toBeCloseTo(0, 6);
  });

  it("phone flat on the table screen up: the front camera looks at the ceiling (down is behind it), the rear camera at the table", () => {
    close(gravityInCamera({ x: 0, y: 0, z: G }, "user")!, [0, 0, -1]);
    close(gravityInCamera({ x: 0, y: 0, z: G }, "environment")!, [0, 0, 1]);
    expect(tiltFromUprightDeg(gravityInCamera({ x: 0, y: 0, z: G }, "user")!)).toBeCloseTo(90, 6);
  });

  it("phone turned on its side (landscape, screen angle 90): the picture's down is still down", () => {
    // screen.orientation.angle 90 is the device turned a quarter counter-clockwise (W3C Screen Orientation; the
    // direction [from memory]): its right edge faces up, so the reading points along the device's +x.
    close(gravityInCamera({ x: G, y: 0, z: 0 }, "environment", 90)!, [0, 1, 0]);
    close(gravityInCamera({ x: G, y: 0, z: 0 }, "user", 90)!, [0, 1, 0]);
    close(gravityInCamera({ x: -G, y: 0, z: 0 }, "environment", 270)!, [0, 1, 0]);
    // Held in portrait while the screen is turned for landscape, true down lies toward the picture's right (the
    // screen's right is the device's -y); the front camera's unmirrored picture has it on the left.
    close(gravityInCamera({ x: 0, y: G, z: 0 }, "environment", 90)!, [1, 0, 0]);
    close(gravityInCamera({ x: 0, y: G, z: 0 }, "user", 90)!, [-1, 0, 0]);
  });

  it("a phone tilted back by 30 degrees reads 30 degrees from upright", () => {
    const a = (30 * Math.PI) / 180;
    const g = gravityInCamera({ x: 0, y: G * Math.cos(a), z: G * Math.sin(a) }, "user")!;
    expect(tiltFromUprightDeg(g)).toBeCloseTo(30, 6);
  });

  it("no reading, or a device being moved, gives no gravity", () => {
    expect(gravityInCamera(null, "user")).toBeNull();
    expect(gravityInCamera({ x: null, y: null, z: null }, "user")).toBeNull();
    expect(gravityInCamera({ x: 0, y: 2 * G, z: 0 }, "user")).toBeNull();
  });
});
