import { describe, expect, it } from "vitest";
import { viewPolicy } from "@/vision/view-policy";
import { neutralPose, poseHand, withMotionAngle } from "@/vision/testing/synthetic-hand";
import type { TrackedFrame } from "@/vision/live/types";
import {
  CLIP_MOTIONS,
  clipReport,
  fingerRows,
  framesAtRate,
  parseFraming,
  parseMinConfidence,
  parseSensorNoise,
  SETUP_FRAMING_DISTANCE_M,
  setupAccepts,
  parseTrackFps,
  ordinalStep,
  parseProportions,
  planClips,
  trackedRateSuffix,
  truthAtTimes,
  statedCoverage,
  peakCoverage,
  peakErrorP90,
  readClip,
  summarizeClipReadings,
  withoutStraightWristRows,
  withTurnIn,
  withDipFollowing,
  planSweep,
  TURN_IN_SECONDS,
  type ClipReading,
} from "./clip-validation";
import { parseClipFingerRows, parseWithoutStraightWrist } from "./derive-uncertainty";
import { restPose, setPoseAngle } from "./hand-pose";
import { buildSweepFrames, sweepAnglesDeg, validateSweepOptions } from "./sweep";
import { getPoseAngle } from "./hand-pose";
import { loadHandRig } from "./rig-files";
import type { FrameTruth } from "./scene";

describe("turn-in clips", () => {
  it("keeps every draw, names the clips apart and marks the turn", () => {
    const plans = planClips(77000410, 4, "gravity_minimized", ["mcp.flexion", "pip.flexion"]);
    const turned = withTurnIn(plans, 77000410, 30);
    expect(turned).toHaveLength(plans.length);
    turned.forEach((plan, i) => {
      expect(plan.name).toBe(plans[i].name.replace("-gm-77000410-", "-gm-turn30-77000410-"));
      expect({ ...plan, name: plans[i].name, turnInDeg: undefined }).toEqual({ ...plans[i], turnInDeg: undefined });
      expect(plan.turnInDeg).toBe(30);
      expect(planSweep(plan)).toEqual({ ...planSweep(plans[i]), turnInDeg: 30, turnInSeconds: TURN_IN_SECONDS });
    });
    expect(planSweep(plans[0])).not.toHaveProperty("turnInDeg");
    expect(planSweep(plans[0], 1).cycles).toBe(1);
  });

  it("refuses wrist clips and turns outside 1-90 whole degrees, naming the option", () => {
    const wrist = planClips(77000410, 2, "gravity_minimized", ["wrist.flexion"]);
    expect(() => withTurnIn(wrist, 77000410, 30)).toThrow(/^--turn-in: expected finger motions only.*got wrist\.flexion/);
    const fingers = planClips(77000410, 2, "gravity_minimized", ["mcp.flexion"]);
    expect(() => withTurnIn(fingers, 77000410, 0)).toThrow(/^--turn-in: expected whole degrees from 1 to 90; got '0'/);
    expect(() => withTurnIn(fingers, 77000410, 12.5)).toThrow(/^--turn-in: expected whole degrees/);
  });
});

describe("PIP clips whose DIP bends along (--dip-follows)", () => {
  it("names the clips apart and bends each finger's DIP at the ratio of its PIP, the PIP as in the plain clip", () => {
    const plans = planClips(77000412, 2, "against_gravity", ["pip.flexion"]);
    const following = withDipFollowing(plans, 77000412, 0.7);
    expect(following.map((p) => p.name)).toEqual(plans.map((p) => p.name.replace("-77000412-", "-dip70-77000412-")));
    const rig = loadHandRig(plans[0].side);
    const plain = buildSweepFrames(rig, planSweep(plans[0]));
    const bent = buildSweepFrames(rig, planSweep(following[0]));
    expect(bent).toHaveLength(plain.length);
    let deepest = 0;
    bent.forEach((frame, i) => {
      for (const finger of ["index", "middle", "ring", "little"] as const) {
        const pip = getPoseAngle(frame.truth.commandedDeg, `${finger}.pipFlexionDeg`);
        expect(pip).toBeCloseTo(getPoseAngle(plain[i].truth.commandedDeg, `${finger}.pipFlexionDeg`), 9);
        expect(getPoseAngle(frame.truth.commandedDeg, `${finger}.dipFlexionDeg`)).toBeCloseTo(0.7 * pip, 9);
        expect(getPoseAngle(plain[i].truth.commandedDeg, `${finger}.dipFlexionDeg`)).toBe(0);
        deepest = Math.max(deepest, pip);
      }
    });
    expect(deepest).toBeGreaterThanOrEqual(60);
  });

  it("refuses other motions and ratios outside (0, 1.5], and a follower list that does not pair with the swept joints", () => {
    expect(() => withDipFollowing(planClips(77000412, 2, "against_gravity", ["mcp.flexion"]), 77000412, 0.7)).toThrow(/^--dip-follows: expected PIP flexion clips only.*got mcp\.flexion/);
    const pip = planClips(77000412, 2, "against_gravity", ["pip.flexion"]);
    expect(() => withDipFollowing(pip, 77000412, 0)).toThrow(/^--dip-follows: expected a ratio above 0 and at most 1.5; got '0'/);
    const options = planSweep(withDipFollowing(pip, 77000412, 0.7)[0]);
    expect(() => validateSweepOptions({ ...options, followers: { joints: options.followers!.joints.slice(1), ratio: 0.7 } })).toThrow(/^followers\.joints: expected one per swept joint \(4\); got 3/);
    expect(() => validateSweepOptions({ ...options, followers: { joints: options.joints, ratio: 0.7 } })).toThrow(/is swept already/);
  });
});

describe("held-out clip plans", () => {
  const plans = planClips(20261205, 8);

  it("are the same every time, a clip per motion and index, hands alternating, in the view the policy recommends", () => {
    expect(planClips(20261205, 8)).toEqual(plans);
    expect(plans).toHaveLength(CLIP_MOTIONS.length * 8);
    for (const motion of CLIP_MOTIONS) {
      const mine = plans.filter((plan) => plan.motion === motion);
      expect(mine.map((plan) => plan.side)).toEqual(["right", "left", "right", "left", "right", "left", "right", "left"]);
      for (const plan of mine) expect(plan.view).toBe(viewPolicy(motion.motion, "against_gravity", motion.digits[0]).recommended[0]);
    }
    expect(new Set(plans.map((plan) => plan.seed)).size).toBe(plans.length);
    // More clips keep the clips of fewer (their renders and tracking are reused).
    const fewer = planClips(20261205, 3);
    for (const plan of fewer) expect(plans).toContainEqual(plan);
  });

  it("with gravity minimized: the same motions in the view the policy recommends for that condition, named apart", () => {
    const minimized = planClips(20261205, 8, "gravity_minimized");
    expect(minimized).toHaveLength(plans.length);
    minimized.forEach((plan, i) => {
      expect(plan.condition).toBe("gravity_minimized");
      expect(plan.view).toBe(viewPolicy(plan.motion.motion, "gravity_minimized", plan.motion.digits[0]).recommended[0]);
      // Cached renders are found by name: a clip of the other condition must never be taken for this one.
      expect(plan.name).not.toBe(plans[i].name);
      expect(plan.name).toContain("-gm-");
    });
    for (const plan of plans) expect(plan.condition).toBe("against_gravity");
  });

  it("with a view asked for: the same clips in that view, named apart (training clips of the whole-hand-shape fits)", () => {
    const palm = planClips(20261205, 8, "against_gravity", ["mcp.flexion"], "palm");
    const recommended = plans.filter((plan) => plan.motion.motion === "mcp.flexion");
    expect(palm.map((plan) => plan.view)).toEqual(recommended.map(() => "palm"));
    // Same draws (end of range, distance, hand), so a view is the only difference; the name says which view.
    expect(palm.map((plan) => [plan.toDeg, plan.distanceM, plan.side])).toEqual(recommended.map((plan) => [plan.toDeg, plan.distanceM, plan.side]));
    palm.forEach((plan, i) => expect(plan.name).toBe(recommended[i].name.replace("mcp.flexion-", "mcp.flexion-palm-")));
  });

  it("with one finger: the finger motions only, one finger moving per clip in turn, the same draws, named apart", () => {
    const alone = planClips(20261205, 8, "against_gravity", undefined, undefined, true);
    const fingers = plans.filter((plan) => plan.motion.digits[0] !== null);
    expect(alone.map((plan) => plan.motion.motion)).toEqual(fingers.map((plan) => plan.motion.motion));
    alone.forEach((plan, i) => {
      const digit = ["index", "middle", "ring", "little"][i % 8 % 4];
      expect(plan.motion.digits).toEqual([digit]);
      expect(plan.motion.joints).toHaveLength(1);
      expect(plan.motion.joints[0].startsWith(`${digit}.`)).toBe(true);
      expect(plan.oneFinger).toBe(true);
      expect([plan.toDeg, plan.distanceM, plan.side, plan.view]).toEqual([fingers[i].toDeg, fingers[i].distanceM, fingers[i].side, fingers[i].view]);
      expect(plan.name).toBe(fingers[i].name.replace(/^([a-z.]+)-/, "$1-alone-"));
    });
  });

  it("with one finger and chosen digits: only those fingers move, in turn, named for them; no finger outside the four", () => {
    const all = planClips(20261205, 8, "against_gravity", undefined, undefined, true);
    const little = planClips(20261205, 8, "against_gravity", undefined, undefined, true, null, ["little"]);
    expect(little).toHaveLength(all.length);
    little.forEach((plan, i) => {
      expect(plan.motion.digits).toEqual(["little"]);
      expect(plan.motion.joints.every((joint) => joint.startsWith("little."))).toBe(true);
      expect([plan.toDeg, plan.distanceM, plan.side]).toEqual([all[i].toDeg, all[i].distanceM, all[i].side]);
      expect(plan.name).toBe(all[i].name.replace("-alone-", "-alone-little-"));
    });
    // Every finger, in the usual order, keeps the usual names (and cached renders).
    expect(planClips(20261205, 8, "against_gravity", undefined, undefined, true, null, ["index", "middle", "ring", "little"])).toEqual(all);
    expect(() => planClips(20261205, 8, "against_gravity", undefined, undefined, true, null, ["thumb"])).toThrow(/--digits: expected some of index, middle, ring, little; got 'thumb'/);
  });

  it("with hands of varied build: the same clips, each hand drawn apart and named apart; the mesh's own clips unchanged", () => {
    const varied = planClips(20261205, 8, "against_gravity", undefined, undefined, false, null, undefined, "varied");
    expect(varied).toHaveLength(plans.length);
    varied.forEach((plan, i) => {
      expect([plan.toDeg, plan.distanceM, plan.side, plan.view, plan.seed]).toEqual([plans[i].toDeg, plans[i].distanceM, plans[i].side, plans[i].view, plans[i].seed]);
      expect(plan.name).toBe(plans[i].name.replace(/-(20261205-\d+-\d+)$/, "-varied-$1"));
      expect(plan.proportions).toBeDefined();
      expect(plans[i].proportions).toBeUndefined();
    });
    // Each clip its own hand.
    expect(new Set(varied.map((plan) => plan.proportions!.digits.index)).size).toBeGreaterThan(varied.length / 2);
    expect(planClips(20261205, 8, "against_gravity", undefined, undefined, false, null, undefined, "mesh")).toEqual(plans);
    expect(parseProportions(undefined)).toBe("mesh");
    expect(() => parseProportions("child")).toThrow("--proportions: expected mesh or varied; got 'child'");
  });

  it("draw ends of range and distances across their whole span (neighbouring seeds once gave near-identical clips)", () => {
    for (const motion of CLIP_MOTIONS) {
      const ends = plans.filter((plan) => plan.motion === motion).map((plan) => plan.toDeg);
      const [low, high] = motion.toDeg;
      for (const end of ends) {
        expect(end).toBeGreaterThanOrEqual(low);
        expect(end).toBeLessThanOrEqual(high);
      }
      // Eight uniform draws spanning less than a third of the range would happen about once in 10,000 sets.
      expect(Math.max(...ends) - Math.min(...ends)).toBeGreaterThan((high - low) / 3);
    }
    const distances = plans.map((plan) => plan.distanceM);
    expect(Math.min(...distances)).toBeGreaterThanOrEqual(0.3);
    expect(Math.max(...distances)).toBeLessThanOrEqual(0.7);
    expect(Math.max(...distances) - Math.min(...distances)).toBeGreaterThan(0.2);
  });
});

describe("framing as the set-up check asks (--framing)", () => {
  const usual = planClips(20261205, 8, "gravity_minimized", ["pip.flexion"]);
  const framed = planClips(20261205, 8, "gravity_minimized", ["pip.flexion"], undefined, false, "setup");

  it("`setup` draws distances in its own range from the same draws, and names the clips apart", () => {
    framed.forEach((plan, i) => {
      expect(plan.distanceM).toBeGreaterThanOrEqual(SETUP_FRAMING_DISTANCE_M[0]);
      expect(plan.distanceM).toBeLessThanOrEqual(SETUP_FRAMING_DISTANCE_M[1]);
      expect([plan.toDeg, plan.side, plan.seed]).toEqual([usual[i].toDeg, usual[i].side, usual[i].seed]);
      expect(plan.name).toBe(usual[i].name.replace("-gm-", "-gm-setup-"));
    });
    // `filter` reads the usual clips.
    expect(planClips(20261205, 8, "gravity_minimized", ["pip.flexion"], undefined, false, "filter")).toEqual(usual);
  });

  it("keeps a clip only where the set-up check accepts its first frame's hand span", () => {
    // A first frame whose landmarks span `px` pixels of the 480-pixel height (the picture is 640x480).
    const truthSpanning = (px: number) => ({ frameCount: 1, frames: [{ index: 0, timeMs: 0, truth: { landmarksImagePx: Array.from({ length: 21 }, (_, i) => [300, 100 + (px * i) / 20]) } as unknown as FrameTruth }] });
    const plan = framed[0];
    expect(setupAccepts(plan, truthSpanning(240))).toBe(true); // 0.5 of the picture's shorter side
    expect(setupAccepts(plan, truthSpanning(330))).toBe(false); // 0.69: too near
    expect(setupAccepts(plan, truthSpanning(150))).toBe(false); // 0.31: too far
    // Against gravity a finger has no upper bound, only the set-up check's least span.
    const against = planClips(20261205, 1, "against_gravity", ["pip.flexion"])[0];
    expect(setupAccepts(against, truthSpanning(330))).toBe(true);
  });

  it("names the expected values of a bad --framing", () => {
    expect(parseFraming(undefined)).toBeNull();
    expect(parseFraming("filter")).toBe("filter");
    expect(() => parseFraming("tight")).toThrow(/--framing: expected setup or filter; got 'tight'/);
  });
});

describe("reading a clip against its truth", () => {
  // Exact landmarks of our synthetic hand sweeping all four PIPs 0 -> 70 -> 0 twice, seen from the little-finger side.
  const ulnarView = { forearmDistal: [0, -1, 0] as const, forearmRadial: [0, 0, 1] as const, wrist: [0, 0.05, 0.45] as const };
  const anglesDeg = [...Array.from({ length: 30 }, () => 0), ...sweepAnglesDeg(0, 70, 2, 60)];
  const plan = { ...planClips(20261205, 1).find((p) => p.motion.motion === "pip.flexion")!, side: "right" as const, toDeg: 70 };
  const frames: TrackedFrame[] = anglesDeg.map((deg, i) => {
    let pose = neutralPose();
    for (const digit of ["index", "middle", "ring", "little"] as const) pose = withMotionAngle(pose, "pip.flexion", digit, deg);
    const hand = poseHand(pose, "right", ulnarView).landmarks.map((p) => [...p] as [number, number, number]);
    // A tracker that lost the hand for frames 40-44.
    const lost = i >= 40 && i < 45;
    return { t: (i * 1000) / 30, score: lost ? 0 : 0.95, handedness: lost ? null : "right", hand: lost ? null : hand, image: lost ? null : hand };
  });
  const truth = {
    frameCount: frames.length,
    frames: anglesDeg.map((deg, index) => {
      const commandedDeg = restPose();
      for (const digit of ["index", "middle", "ring", "little"] as const) setPoseAngle(commandedDeg, `${digit}.pipFlexionDeg`, deg);
      return { index, timeMs: (index * 1000) / 30, truth: { commandedDeg } as unknown as FrameTruth };
    }),
  };

  it("pairs each frame's reading with that frame's truth, and counts lost frames as undetected", () => {
    const reading = readClip(plan, "lite", "ring", frames, truth, "raw");
    expect(reading.samples).toHaveLength(frames.length);
    expect(reading.samples.filter((s) => s.estimateDeg === null)).toHaveLength(5);
    // Raw angles of exact landmarks: the engine's geometry reads our hand's PIP to well under a degree.
    for (const sample of reading.samples) if (sample.estimateDeg !== null) expect(Math.abs(sample.estimateDeg - sample.truthDeg)).toBeLessThan(0.5);
    expect(reading.truthPeakDeg).toBeCloseTo(70, 9);
    expect(reading.reps).toBe(2);
    // The peak is read from the smoothed angle (One Euro filter), which rounds the turn off by a degree or two.
    expect(Math.abs(reading.peakDeg! - 70)).toBeLessThan(2);
    const summary = summarizeClipReadings([reading]);
    expect(summary.frames.detectionRate).toBeCloseTo((frames.length - 5) / frames.length, 9);
    expect(summary.repsRight).toBe(1);
  });

  it("a clip where the tracker never found the hand counts every frame as undetected, with no peak", () => {
    const lost = frames.map((frame) => ({ ...frame, score: 0, handedness: null, hand: null, image: null }));
    const reading = readClip(plan, "lite", "ring", lost, truth, "engine");
    expect(reading.samples.every((s) => s.estimateDeg === null)).toBe(true);
    expect(reading.samples).toHaveLength(frames.length);
    expect([reading.peakDeg, reading.reps]).toEqual([null, 0]);
  });

  it("counts the frames whose error lies within the interval the engine stated for them", () => {
    const reading = readClip(plan, "lite", "ring", frames, truth, "engine");
    const detected = reading.samples.filter((s) => s.estimateDeg !== null).length;
    expect(reading.uncertaintiesDeg.filter((u) => u !== null)).toHaveLength(detected);
    // Hand-made: errors of 1, 3, 5 and 7 against a stated 4 (two within), a lost frame, a frame with no interval.
    const made = {
      samples: [1, 3, 5, 7, 0, 2].map((error, i) => ({ truthDeg: 40, estimateDeg: i === 4 ? null : 40 + error })),
      uncertaintiesDeg: [4, 4, 4, 4, null, null],
    };
    expect(statedCoverage([made])).toBe(0.5);
    expect(statedCoverage([{ samples: [], uncertaintiesDeg: [] }])).toBeNull();
  });

  it("counts the readings whose peak lies within the interval stated for the peak", () => {
    // Peak errors of -2, 6 and 3 against a stated 4 (two within, the second not), one with no interval, one with no peak.
    const made = [
      { peakDeg: 78, truthPeakDeg: 80, peakUncertaintyDeg: 4 },
      { peakDeg: 86, truthPeakDeg: 80, peakUncertaintyDeg: 4 },
      { peakDeg: 83, truthPeakDeg: 80, peakUncertaintyDeg: 4 },
      { peakDeg: 80, truthPeakDeg: 80, peakUncertaintyDeg: null },
      { peakDeg: null, truthPeakDeg: 80, peakUncertaintyDeg: null },
    ];
    expect(peakCoverage(made)).toBe(0.5);
    expect(peakCoverage([made[4]])).toBeNull();
  });

  it("gives the peak the half-width that held 90% of peaks, leaving out wrists read against capture start", () => {
    // Ten peak errors of 1..10 degrees (alternating sign): the ninth smallest, 9, holds nine of ten (nearest rank).
    const made = Array.from({ length: 10 }, (_, i) => ({ peakDeg: 60 + (i % 2 ? 1 : -1) * (i + 1), truthPeakDeg: 60, forearmSource: "neutral-reading" }));
    expect(peakErrorP90(made)).toBe(9);
    // A reading read against how the hand was first seen carries its own pooled figure: a 40-degree miss does not count.
    expect(peakErrorP90([...made, { peakDeg: 100, truthPeakDeg: 60, forearmSource: "capture-start" }])).toBe(9);
    // A reading with no peak has no error to rank; none at all gives no figure.
    expect(peakErrorP90([...made, { peakDeg: null, truthPeakDeg: 60, forearmSource: null }])).toBe(9);
    expect(peakErrorP90([{ peakDeg: null, truthPeakDeg: 60, forearmSource: null }])).toBeNull();
  });

  it("refuses a clip whose tracked frames do not match its truth", () => {
    expect(() => readClip(plan, "lite", "ring", frames.slice(1), truth, "raw")).toThrow(new RegExp(`tracked ${frames.length - 1} frames, the clip has ${frames.length}`));
  });

  it("summarizes peaks, repetitions and the verdict against issue 8's bars", () => {
    const make = (peakDeg: number | null, reps: number, errorDeg: number): ClipReading => ({
      ...readClip(plan, "lite", "ring", frames, truth, "raw"),
      peakDeg,
      reps,
      samples: anglesDeg.map((deg) => ({ truthDeg: deg, estimateDeg: deg + errorDeg })),
    });
    const summary = summarizeClipReadings([make(76, 2, 4), make(58, 3, -4), make(null, 0, 4)]);
    expect(summary.peakMaeDeg).toBeCloseTo((6 + 12) / 2, 9);
    expect(summary.peakWorstDeg).toBeCloseTo(-12, 9);
    expect(summary.repsRight).toBe(1);
    expect(summary.frames.meanAbsoluteErrorDeg).toBeCloseTo(4, 9);
    const row = { label: "PIP flexion", variant: "engine" as const, bar: "pip.flexion" as const, view: "ulnar" as const, model: "lite" as const, ...summary };
    expect(clipReport([{ seed: 1, clips: 1, rows: [row] }], { glName: "test" })).toContain("- PIP flexion, ulnar, lite: meets (MAE 4.00 of at most 5, slope 1.00 in 0.9-1.1, detected 100% of at least 95%)");
    const worse = { ...row, ...summarizeClipReadings([make(76, 2, 6)]) };
    expect(clipReport([{ seed: 1, clips: 1, rows: [worse] }], { glName: "test" })).toContain("- PIP flexion, ulnar, lite: misses (MAE 6.00 of at most 5");
  });

  it("splits the engine's finger readings by finger, in the hand's order, and leaves other variants out", () => {
    const make = (digit: "index" | "ring", errorDeg: number, variant: "engine" | "raw" = "engine"): ClipReading => ({
      ...readClip(plan, "lite", digit, frames, truth, "raw"),
      variant,
      samples: anglesDeg.map((deg) => ({ truthDeg: deg, estimateDeg: deg + errorDeg })),
    });
    const rows = fingerRows("PIP flexion", "radial", "lite", [make("ring", 9), make("index", 2), make("ring", -3), make("index", 40, "raw")]);
    expect(rows.map((r) => [r.digit, r.summary.readings])).toEqual([
      ["index", 1],
      ["ring", 2],
    ]);
    // Every frame detected, both ring readings the same length: the ring finger's MAE is the mean of 9 and 3.
    expect(rows[0].summary.frames.meanAbsoluteErrorDeg).toBeCloseTo(2, 9);
    expect(rows[1].summary.frames.meanAbsoluteErrorDeg).toBeCloseTo(6, 9);
    const text = clipReport([{ seed: 1, clips: 1, rows: [], byFinger: rows }], { glName: "test" });
    expect(text).toContain("### By finger (engine)");
    expect(text).toContain("| PIP flexion | radial | lite | ring | 2 | 100% | 3.0 | 6.00 |");
    expect(clipReport([{ seed: 1, clips: 1, rows: [] }], { glName: "test" })).not.toContain("By finger");
    // The uncertainty script reads the table back as written.
    expect(parseClipFingerRows([text]).map((r) => [r.group, r.view, r.model, r.digit, r.engineMaeDeg, r.seeds])).toEqual([
      ["PIP flexion", "radial", "lite", "index", 2, 1],
      ["PIP flexion", "radial", "lite", "ring", 6, 1],
    ]);
  });

  it("lists the readings made without a straight-wrist reading per model, in a table the uncertainty script reads back", () => {
    const make = (model: "lite" | "full", errorDeg: number): ClipReading => ({
      ...readClip(plan, model, "ring", frames, truth, "raw"),
      forearmSource: "capture-start",
      samples: anglesDeg.map((deg) => ({ truthDeg: deg, estimateDeg: deg + errorDeg })),
    });
    const rows = withoutStraightWristRows([make("lite", -20), make("full", -10), make("lite", -30)]);
    expect(rows.map((r) => [r.model, r.readings])).toEqual([
      ["lite", 2],
      ["full", 1],
    ]);
    const text = clipReport([], { glName: "test", withoutStraightWrist: rows });
    expect(text).toContain("## Wrist readings without a straight-wrist reading");
    // Every frame detected and every reading the same length: the pooled error is the mean of 20, 30 and 10.
    expect(parseWithoutStraightWrist([text])).toEqual({ readings: 3, maeDeg: 20 });
    expect(clipReport([], { glName: "test" })).not.toContain("without a straight-wrist reading");
  });
});

describe("--min-confidence (tracking with other confidence floors)", () => {
  it("takes a number strictly between 0 and 1 and names the flag otherwise", () => {
    expect(parseMinConfidence(undefined)).toBeUndefined();
    expect(parseMinConfidence("0.3")).toBe(0.3);
    for (const bad of ["0", "1", "1.5", "", "x"]) expect(() => parseMinConfidence(bad)).toThrow(`--min-confidence: expected a number between 0 and 1; got '${bad}'`);
  });
});

describe("--sensor-noise (tracking grainy copies of the clips)", () => {
  it("takes a whole number from 1 to 100 and names the flag otherwise", () => {
    expect(parseSensorNoise(undefined)).toBeUndefined();
    expect(parseSensorNoise("6")).toBe(6);
    for (const bad of ["0", "101", "2.5", "", "x"]) expect(() => parseSensorNoise(bad)).toThrow(`--sensor-noise: expected a whole number from 1 to 100; got '${bad}'`);
  });
});

describe("clips tracked at a lower rate than their own", () => {
  it("takes a whole divisor of 30 below it, keeps it apart in its own files, and reads the truth at the tracked frames' times", () => {
    expect([2, 3, 5, 10].map(ordinalStep)).toEqual(["second", "third", "fifth", "10th"]);
    expect(parseTrackFps(undefined)).toBeNull();
    expect(parseTrackFps("15")).toBe(15);
    expect(parseTrackFps("10")).toBe(10);
    for (const bad of ["20", "30", "0", "7.5", ""]) expect(() => parseTrackFps(bad)).toThrow(/--track-fps: expected a whole divisor of 30/);
    expect(trackedRateSuffix(null)).toBe("");
    expect(trackedRateSuffix(15)).toBe("-f15");
    // Frames tracked at 15 frames a second take the truth at their own times; a time with no frame is refused.
    const timed = { frameCount: 7, frames: Array.from({ length: 7 }, (_, i) => ({ index: i, timeMs: (i * 1000) / 30 })) } as never as Parameters<typeof truthAtTimes>[0];
    const picked = truthAtTimes(timed, [{ t: 0 }, { t: 1000 / 15 }, { t: 2000 / 15 }]);
    expect((picked.frames as unknown as { index: number }[]).map((f) => f.index)).toEqual([0, 2, 4]);
    expect(picked.frameCount).toBe(3);
    expect(() => truthAtTimes(timed, [{ t: 20 }])).toThrow(/no truth frame at 20.0 ms/);
  });
});

describe("frames a slower camera would have given", () => {
  it("keeps frames evenly spread at the asked rate, and every frame at or above the clip's own", () => {
    expect(framesAtRate(9, 20, 30)).toEqual([0, 2, 3, 5, 6, 8]);
    expect(framesAtRate(8, 15, 30)).toEqual([0, 2, 4, 6]);
    expect(framesAtRate(5, 30, 30)).toEqual([0, 1, 2, 3, 4]);
    expect(framesAtRate(5, 60, 30)).toEqual([0, 1, 2, 3, 4]);
    // Over a second of a 30 fps clip, 20 frames.
    expect(framesAtRate(30, 20, 30)).toHaveLength(20);
    expect(() => framesAtRate(5, 0, 30)).toThrow(/fps: expected a positive number/);
  });
});
