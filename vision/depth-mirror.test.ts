import { describe, expect, it } from "vitest";
import { handAxes } from "./angles";
import { mirrorInDepth, PalmContinuity } from "./depth-mirror";
import { createLivePipeline } from "./pipeline";
import { neutralPose, poseHand, withMotionAngle } from "./testing/synthetic-hand";
import { dot } from "./vec";

// Hand upright in front of the camera, seen from its little-finger side (the view Kinarc asks for in finger flexion).
const ulnarView = { forearmDistal: [0, -1, 0] as const, forearmRadial: [0, 0, 1] as const, wrist: [0, 0.05, 0.45] as const };
const mcpAt = (deg: number) => {
  let pose = neutralPose();
  for (const digit of ["index", "middle", "ring", "little"] as const) pose = withMotionAngle(pose, "mcp.flexion", digit, deg);
  return poseHand(pose, "right", ulnarView).landmarks;
};

describe("depth mirror of an edge-on hand", () => {
  it("mirroring in depth keeps the picture and turns the palm the other way", () => {
    const hand = mcpAt(80);
    const mirrored = mirrorInDepth(hand);
    // Same x and y for every landmark: the camera sees the same picture (perspective aside).
    mirrored.forEach((p, i) => expect([p[0], p[1]]).toEqual([hand[i][0], hand[i][1]]));
    expect(dot(handAxes(mirrored, "right")!.palmarNormal, handAxes(hand, "right")!.palmarNormal)).toBeLessThan(-0.9);
    expect(mirrorInDepth(mirrored)).toEqual(hand.map((p) => [p[0], p[1], expect.closeTo(p[2], 12)]));
  });

  it("reads a frame whose palm flips against the frames before it as the mirror image", () => {
    const continuity = new PalmContinuity("right");
    for (const deg of [0, 20, 40, 60]) expect(continuity.check(mcpAt(deg), handAxes(mcpAt(deg), "right")!).mirrored).toBe(false);
    const flipped = mirrorInDepth(mcpAt(80));
    const read = continuity.check(flipped, handAxes(flipped, "right")!);
    expect(read.mirrored).toBe(true);
    expect(read.hand).toEqual(mirrorInDepth(flipped));
    expect(continuity.mirroredFrames).toBe(1);
  });

  it("a jump in the picture (a cut, another hand, a real turn) is not mirrored: the palm's direction is taken afresh", () => {
    const continuity = new PalmContinuity("right");
    for (const deg of [0, 20, 40]) continuity.check(mcpAt(deg), handAxes(mcpAt(deg), "right")!);
    // The same hand turned about its long axis to show the other side: the picture is a left-right mirror image.
    const turned = mcpAt(40).map(([x, y, z]) => [-x, y, -z] as const);
    const read = continuity.check(turned, handAxes(turned, "right")!);
    expect(read.mirrored).toBe(false);
    expect(read.hand).toBe(turned);
    // From then on the turned hand is the reference.
    expect(continuity.check(turned, handAxes(turned, "right")!).mirrored).toBe(false);
  });

  it("the pipeline reads a flipped frame at the end of range as flexion, not hyperextension; a first frame has nothing to compare with", () => {
    const options = { motion: "mcp.flexion", side: "right", digit: "middle", condition: "against_gravity", correction: "off" } as const;
    const pipeline = createLivePipeline(options);
    let t = 0;
    for (const deg of [0, 20, 40, 60, 70]) pipeline.push({ t: (t += 33), score: 0.9, hand: mcpAt(deg) });
    const flipped = pipeline.push({ t: (t += 33), score: 0.9, hand: mirrorInDepth(mcpAt(80)) });
    expect(flipped.angleDeg).toBeCloseTo(80, 6);
    expect(pipeline.summary().warnings.join(" ")).toMatch(/1 of 6 usable frames read mirrored front to back/);
    // Without frames before it the mirrored hand is taken as seen: the palm faces away and the finger reads bent back.
    const fresh = createLivePipeline(options).push({ t: 0, score: 0.9, hand: mirrorInDepth(mcpAt(80)) });
    expect(fresh.angleDeg).toBeLessThan(0);
    // After a gap longer than the smoother's, the hand may really have turned: the palm's direction is taken afresh.
    const gap = pipeline.push({ t: t + 5000, score: 0.9, hand: mirrorInDepth(mcpAt(80)) });
    expect(gap.angleDeg).toBeLessThan(0);
  });
});
