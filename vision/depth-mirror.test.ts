import { describe, expect, it } from "vitest";
import { handAxes, readMotion } from "./angles";
import { anatomicallyMirrored, mirrorInDepth, PalmContinuity } from "./depth-mirror";
import { createLivePipeline } from "./pipeline";
import { neutralPose, poseHand, withMotionAngle } from "./testing/synthetic-hand";
import { dot } from "./vec";
import type { HandPose } from "./testing/synthetic-hand";
import type { HandLandmarks } from "./landmarks";

// Hand upright in front of the camera, seen from its little-finger side (the view Kinarc asks for in finger flexion).
const ulnarView = { forearmDistal: [0, -1, 0] as const, forearmRadial: [0, 0, 1] as const, wrist: [0, 0.05, 0.45] as const };
const DIGITS = ["index", "middle", "ring", "little"] as const;
const handWith = (angles: { mcp?: number; pip?: number; dip?: number }) => {
  let pose: HandPose = neutralPose();
  for (const digit of DIGITS) {
    if (angles.mcp !== undefined) pose = withMotionAngle(pose, "mcp.flexion", digit, angles.mcp);
    if (angles.pip !== undefined) pose = withMotionAngle(pose, "pip.flexion", digit, angles.pip);
    if (angles.dip !== undefined) pose = withMotionAngle(pose, "dip.flexion", digit, angles.dip);
  }
  return poseHand(pose, "right", ulnarView).landmarks;
};
const mcpAt = (deg: number) => handWith({ mcp: deg });
const check = (continuity: PalmContinuity, hand: HandLandmarks) => continuity.check(hand, handAxes(hand, "right")!);

describe("depth mirror of an edge-on hand", () => {
  it("mirroring in depth keeps the picture and turns the palm the other way", () => {
    const hand = mcpAt(80);
    const mirrored = mirrorInDepth(hand);
    // Same x and y for every landmark: the camera sees the same picture (perspective aside).
    mirrored.forEach((p, i) => expect([p[0], p[1]]).toEqual([hand[i][0], hand[i][1]]));
    expect(dot(handAxes(mirrored, "right")!.palmarNormal, handAxes(hand, "right")!.palmarNormal)).toBeLessThan(-0.9);
    expect(mirrorInDepth(mirrored)).toEqual(hand.map((p) => [p[0], p[1], expect.closeTo(p[2], 12)]));
    // Every finger angle of the mirror image is the seen one negated (the engine relies on it to skip the mirror).
    const seenAxes = handAxes(hand, "right")!;
    const mirroredAxes = handAxes(mirrored, "right")!;
    const [x, y, z] = seenAxes.palmarNormal;
    expect(mirroredAxes.palmarNormal).toEqual([expect.closeTo(-x, 12), expect.closeTo(-y, 12), expect.closeTo(z, 12)]);
    const bent = handWith({ mcp: 40, pip: 70, dip: 30 });
    const bentMirror = mirrorInDepth(bent);
    for (const motion of ["mcp.flexion", "pip.flexion", "dip.flexion"] as const) {
      const seen = readMotion(motion, "ring", bent, handAxes(bent, "right")!, null)!.deg;
      expect(readMotion(motion, "ring", bentMirror, handAxes(bentMirror, "right")!, null)!.deg).toBeCloseTo(-seen, 9);
    }
  });

  it("takes the mirror image where the landmarks show fingers bent backwards beyond any hand (AAOS MCP hyperextension 45)", () => {
    const flipped = mirrorInDepth(mcpAt(70));
    expect(anatomicallyMirrored(flipped, handAxes(flipped, "right")!)).toBe(true);
    const read = check(new PalmContinuity("right"), flipped);
    expect(read.mirrored).toBe(true);
    expect(read.hand).toEqual(mirrorInDepth(flipped));
  });

  it("keeps hands that really bend backwards: clawing at the MCP, swan-neck PIPs, a flat hand", () => {
    // Clawing after an ulnar nerve lesion: MCP hyperextension with the IP joints flexed [common practice].
    for (const hand of [handWith({ mcp: -30, pip: 60, dip: 30 }), handWith({ mcp: 10, pip: -30, dip: 25 }), mcpAt(0), mcpAt(-45)]) {
      const continuity = new PalmContinuity("right");
      expect(anatomicallyMirrored(hand, handAxes(hand, "right")!)).toBe(false);
      expect(check(continuity, hand).mirrored).toBe(false);
    }
  });

  it("part-way through a motion, reads a flipped frame by the palm's direction in the decisive frames before it", () => {
    const continuity = new PalmContinuity("right");
    // A flipped 30-degree frame alone is not decisive: read as seen.
    expect(check(new PalmContinuity("right"), mirrorInDepth(mcpAt(30))).mirrored).toBe(false);
    for (const deg of [0, 30, 60, 80, 60]) expect(check(continuity, mcpAt(deg)).mirrored).toBe(false);
    expect(check(continuity, mirrorInDepth(mcpAt(30))).mirrored).toBe(true);
    expect(check(continuity, mcpAt(10)).mirrored).toBe(false);
    expect(continuity.mirroredFrames).toBe(1);
  });

  it("a tracker that starts on the mirror image at rest does not turn the later frames over", () => {
    const continuity = new PalmContinuity("right");
    for (const deg of [0, 5, 0]) check(continuity, mirrorInDepth(mcpAt(deg)));
    expect(check(continuity, mcpAt(60)).mirrored).toBe(false);
    expect(check(continuity, mcpAt(30)).mirrored).toBe(false);
    expect(check(continuity, mirrorInDepth(mcpAt(70))).mirrored).toBe(true);
  });

  it("a jump in the picture (a cut, another hand, a real turn) drops the reference", () => {
    const continuity = new PalmContinuity("right");
    for (const deg of [0, 30, 60]) check(continuity, mcpAt(deg));
    // The same hand turned about its long axis to show the other side: the picture is a left-right mirror image.
    const turned = mcpAt(30).map(([x, y, z]) => [-x, y, -z] as const);
    const read = check(continuity, turned);
    expect(read.mirrored).toBe(false);
    expect(read.hand).toBe(turned);
  });

  it("the pipeline reads a flipped frame as flexion, not hyperextension, and says how many it turned", () => {
    const options = { motion: "mcp.flexion", side: "right", digit: "middle", condition: "against_gravity", correction: "off" } as const;
    const pipeline = createLivePipeline(options);
    let t = 0;
    for (const deg of [0, 20, 40, 60, 70]) pipeline.push({ t: (t += 33), score: 0.9, hand: mcpAt(deg) });
    expect(pipeline.push({ t: (t += 33), score: 0.9, hand: mirrorInDepth(mcpAt(80)) }).angleDeg).toBeCloseTo(80, 6);
    expect(pipeline.push({ t: (t += 33), score: 0.9, hand: mirrorInDepth(mcpAt(40)) }).angleDeg).toBeCloseTo(40, 6);
    expect(pipeline.summary().warnings.join(" ")).toMatch(/in 2 of 7 usable frames the tracker saw the hand mirrored front to back; they were read the right way round/);
    // After a gap longer than the smoother's, the hand may really have turned: a non-decisive frame is read as seen.
    expect(pipeline.push({ t: t + 5000, score: 0.9, hand: mirrorInDepth(mcpAt(40)) }).angleDeg).toBeCloseTo(-40, 6);
    // Switched off, the frame is read as seen.
    const plain = createLivePipeline({ ...options, depthMirror: false });
    expect(plain.push({ t: 0, score: 0.9, hand: mirrorInDepth(mcpAt(80)) }).angleDeg).toBeCloseTo(-80, 6);
  });
});
