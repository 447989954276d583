import { describe, expect, it } from "vitest";
import { correctHandedness, forearmDirection, handFrame, type PointLike } from "./landmark-results";

const points = (n: number, f: (i: number) => PointLike): PointLike[] => Array.from({ length: n }, (_, i) => f(i));

describe("correctHandedness", () => {
  it("keeps the label for unmirrored frames and swaps it for mirrored ones", () => {
    expect(correctHandedness("Left", false)).toBe("left");
    expect(correctHandedness("Right", false)).toBe("right");
    expect(correctHandedness("Left", true)).toBe("right");
    expect(correctHandedness("Right", true)).toBe("left");
    expect(correctHandedness("", false)).toBeNull();
  });
});

describe("handFrame", () => {
  it("gives nulls and a zero score when no hand was found", () => {
    expect(handFrame(12, { landmarks: [], worldLandmarks: [], handedness: [] }, false)).toEqual({
      t: 12,
      score: 0,
      handedness: null,
      hand: null,
      image: null,
    });
  });

  it("keeps all 21 world and image landmarks as [x, y, z]", () => {
    const world = points(21, (i) => ({ x: i / 100, y: -i / 100, z: i / 1000 }));
    const image = points(21, (i) => ({ x: 0.3 + i / 100, y: 0.5, z: -i / 1000 }));
    const frame = handFrame(40, { landmarks: [image], worldLandmarks: [world], handedness: [[{ categoryName: "Right", score: 0.97 }]] }, false);
    expect(frame.score).toBe(0.97);
    expect(frame.handedness).toBe("right");
    expect(frame.hand).toHaveLength(21);
    expect(frame.hand![20]).toEqual([0.2, -0.2, 0.02]);
    expect(frame.image![3]).toEqual([image[3].x, image[3].y, image[3].z]);
  });
});

describe("forearmDirection", () => {
  // BlazePose indices (MediaPipe Pose model card): 13 left elbow, 14 right elbow, 15 left wrist, 16 right wrist.
  function pose(elbowVisibility = 0.9, elbowImageX = 0.3) {
    const image = points(33, () => ({ x: 0.5, y: 0.5, z: 0, visibility: 0.9 }));
    const world = points(33, () => ({ x: 0, y: 0, z: 0 }));
    image[13] = { x: elbowImageX, y: 0.7, z: 0, visibility: elbowVisibility };
    image[15] = { x: 0.2, y: 0.4, z: 0, visibility: 0.9 };
    image[14] = { x: 0.7, y: 0.7, z: 0, visibility: 0.9 };
    image[16] = { x: 0.8, y: 0.4, z: 0, visibility: 0.9 };
    world[13] = { x: 0.1, y: 0.2, z: 0.05 };
    world[15] = { x: 0.1 + 0.12, y: 0.2 - 0.16, z: 0.05 };
    world[14] = { x: -0.1, y: 0.2, z: 0 };
    world[16] = { x: -0.1, y: 0.2, z: 0.25 };
    return { landmarks: [image], worldLandmarks: [world] };
  }

  it("points from elbow to wrist of the arm whose wrist is nearest the hand, as a unit vector", () => {
    // A 3-4-5 triangle: (0.12, -0.16, 0) has length 0.2.
    const left = forearmDirection(pose(), [0.21, 0.41, 0])!;
    expect(left[0]).toBeCloseTo(0.6, 10);
    expect(left[1]).toBeCloseTo(-0.8, 10);
    expect(left[2]).toBeCloseTo(0, 10);
    expect(forearmDirection(pose(), [0.79, 0.4, 0])).toEqual([0, 0, 1]);
  });

  it("gives null when that elbow is hidden or outside the image", () => {
    expect(forearmDirection(pose(0.2), [0.2, 0.4, 0])).toBeNull();
    expect(forearmDirection(pose(0.9, 1.2), [0.2, 0.4, 0])).toBeNull();
    expect(forearmDirection({ landmarks: [], worldLandmarks: [] }, null)).toBeNull();
  });
});
