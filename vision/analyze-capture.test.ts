import { describe, expect, it } from "vitest";
import { MOTIONS, MOTION_IDS, SIDES, type Digit, type MotionId, type Side } from "@/lib/motions/catalog";
import { analyzeCapture, framingWarning, startHandSpan } from "./analyze-capture";
import { DIGIT_CHAIN, MIDDLE_MCP, WRIST } from "./landmarks";
import { createLivePipeline } from "./pipeline";
import { PLANE_LIMITS, planeVerdict } from "./plane";
import {
  buildSyntheticCapture,
  neutralPose,
  poseHand,
  randomPlacement,
  SeededRandom,
  trueTravel,
  withMotionAngle,
  type Placement,
  type SyntheticCaptureSpec,
} from "./testing/synthetic-hand";
import { cross, dot, lineAngleDeg, normalize, sub, type Vec3 } from "./vec";

// Whole captures of the synthetic hand (known angles over time), both hands, many camera orientations, with
// landmark noise, lost frames, frames without a hand and low-score scrambled frames. Targets from issue 3:
// peak error within 3 deg on clean data and 5 deg with 2 mm noise for wrist, MCP and PIP; repetitions counted exactly.

/** Resting and peak reported angle per motion, inside the AAOS 1965 normal ranges of the catalog. */
// Synthetic hands have exact landmarks: these checks of the angle geometry run with the correction off, since the
// correction is fitted to the tracker's under-reading and would rightly move an exact reading (vision/correction.test.ts).
const RAW = { correction: "off" } as const;

const ARC: Record<MotionId, [rest: number, peak: number]> = {
  "wrist.flexion": [0, 70],
  "wrist.extension": [0, 60],
  "wrist.radial_deviation": [0, 20],
  "wrist.ulnar_deviation": [0, 30],
  "mcp.flexion": [0, 80],
  "mcp.extension": [0, 35],
  "pip.flexion": [0, 95],
  "dip.flexion": [0, 70],
  "ip.flexion": [0, 70],
  "ip.extension": [-80, 0],
  "finger.abduction": [0, 18],
  "finger.adduction": [-18, 0],
};

/** Wrist, MCP and PIP carry the 5-degree target under 2 mm noise. */
const STRICT = new Set<MotionId>(["wrist.flexion", "wrist.extension", "wrist.radial_deviation", "wrist.ulnar_deviation", "mcp.flexion", "mcp.extension", "pip.flexion"]);

function digitFor(motion: MotionId, i: number): Digit | null {
  const def = MOTIONS[motion];
  return def.joint === "wrist" ? null : def.digits[i % def.digits.length];
}

function specFor(motion: MotionId, i: number, noiseMm: number): SyntheticCaptureSpec {
  const [rest, peak] = ARC[motion];
  return {
    motion,
    side: SIDES[i % 2],
    digit: digitFor(motion, i),
    condition: "against_gravity",
    placement: randomPlacement(new SeededRandom(1000 + i)),
    restDeg: rest,
    reps: [{ peakDeg: peak }, { peakDeg: peak - 5, holdMs: 1500 }, { peakDeg: peak, moveMs: 1000 }],
    noiseMm,
    dropRate: 0.1,
    noHandRate: 0.05,
    lowScoreRate: 0.05,
    seed: 50 + i,
  };
}

describe("analyzeCapture on synthetic captures", () => {
  const CASES = 16;
  for (const motion of MOTION_IDS) {
    it(`${motion}: counts repetitions exactly and reads each peak, clean and with 2 mm noise`, () => {
      const errors: number[] = [];
      for (let i = 0; i < CASES; i++) {
        for (const noiseMm of [0, 2]) {
          const spec = specFor(motion, i, noiseMm);
          const result = analyzeCapture(buildSyntheticCapture(spec), RAW);
          expect(result.reps, `${motion} ${spec.side} ${spec.digit} noise ${noiseMm}`).toBe(3);
          // Short bones (DIP, thumb, sideways spread) see 2 mm as a larger angle; their bound is wider and stated.
          const limit = noiseMm === 0 ? 3 : STRICT.has(motion) ? 5 : 10;
          result.repetitions.forEach((rep, j) => {
            const error = Math.abs(rep.peakDeg - spec.reps[j].peakDeg);
            if (noiseMm > 0) errors.push(error);
            expect(error, `${motion} ${spec.side} ${spec.digit} noise ${noiseMm} rep ${j}`).toBeLessThanOrEqual(limit);
            const startLimit = noiseMm === 0 ? 2 : STRICT.has(motion) ? 6 : 10;
            expect(Math.abs(rep.startDeg - spec.restDeg!), `start, rep ${j}`).toBeLessThanOrEqual(startLimit);
          });
        }
      }
      const rms = Math.sqrt(errors.reduce((s, e) => s + e * e, 0) / errors.length);
      expect(rms).toBeLessThan(STRICT.has(motion) ? 2.5 : 4);
    });
  }

  it("reports hold time and time to peak close to the movement's own timing", () => {
    const spec: SyntheticCaptureSpec = { ...specFor("mcp.flexion", 1, 0), reps: [{ peakDeg: 80, moveMs: 800, holdMs: 2000 }] };
    const [rep] = analyzeCapture(buildSyntheticCapture(spec), RAW).repetitions;
    expect(rep.holdMs).toBeGreaterThan(1700);
    expect(rep.holdMs).toBeLessThan(2600);
    expect(rep.timeToPeakMs).toBeGreaterThan(300);
    expect(rep.timeToPeakMs).toBeLessThan(900);
  });

  it("skips frames without a hand or with a low score instead of reading them as zero", () => {
    const spec: SyntheticCaptureSpec = { ...specFor("pip.flexion", 2, 0), noHandRate: 0.2, lowScoreRate: 0.2, dropRate: 0 };
    const capture = buildSyntheticCapture(spec);
    const result = analyzeCapture(capture, RAW);
    const goodFrames = capture.frames.filter((f) => f.hand && f.score >= 0.5).length;
    expect(result.usableFrames).toBe(goodFrames);
    expect(result.frames).toBe(capture.frames.length);
    result.repetitions.forEach((rep, j) => expect(Math.abs(rep.peakDeg - spec.reps[j].peakDeg)).toBeLessThan(3));
    const pipeline = createLivePipeline({ motion: spec.motion, side: spec.side, digit: spec.digit, condition: spec.condition, ...RAW });
    const updates = capture.frames.map((f) => pipeline.push(f));
    expect(updates.filter((u) => u.quality !== "ok").every((u) => u.angleDeg === null && u.smoothedDeg === null)).toBe(true);
  });

  it("flags poor tracking when too many frames are lost", () => {
    const spec: SyntheticCaptureSpec = { ...specFor("mcp.flexion", 3, 0), noHandRate: 0.4 };
    const result = analyzeCapture(buildSyntheticCapture(spec), RAW);
    expect(result.trackingOk).toBe(false);
    expect(result.warnings.join(" ")).toMatch(/usable hand/);
  });

  it("without a forearm direction, measures the wrist from the first rest frames and says so", () => {
    const spec: SyntheticCaptureSpec = { ...specFor("wrist.extension", 4, 1), includeForearm: false };
    const result = analyzeCapture(buildSyntheticCapture(spec), RAW);
    expect(result.warnings.join(" ")).toMatch(/no forearm direction/);
    expect(result.reps).toBe(3);
    result.repetitions.forEach((rep, j) => expect(Math.abs(rep.peakDeg - spec.reps[j].peakDeg)).toBeLessThan(5));
  });

  it("the live pipeline fed frame by frame gives the same repetitions as the whole-capture analyzer", () => {
    const spec = specFor("wrist.flexion", 5, 2);
    const capture = buildSyntheticCapture(spec);
    const pipeline = createLivePipeline({ motion: spec.motion, side: spec.side, digit: spec.digit, condition: spec.condition, ...RAW });
    let lastCount = 0;
    for (const frame of capture.frames) {
      const update = pipeline.push(frame);
      expect(update.rep.count).toBeGreaterThanOrEqual(lastCount);
      lastCount = update.rep.count;
      if (update.angleDeg !== null) expect(update.method).toBe("world3d");
    }
    expect(pipeline.summary().repetitions).toEqual(analyzeCapture(capture, RAW).repetitions);
  });

  it("a capture that stops mid-hold keeps the open repetition, marked incomplete", () => {
    const spec = specFor("pip.flexion", 6, 0);
    const capture = buildSyntheticCapture({ ...spec, reps: [{ peakDeg: 90, holdMs: 3000 }] });
    capture.frames = capture.frames.filter((f) => f.t < 2900);
    const result = analyzeCapture(capture, RAW);
    expect(result.reps).toBe(1);
    expect(result.repetitions[0].complete).toBe(false);
    expect(Math.abs(result.peakDeg! - 90)).toBeLessThan(3);
  });

  it("no movement gives no repetition and no peak", () => {
    const result = analyzeCapture(buildSyntheticCapture({ ...specFor("mcp.flexion", 7, 2), reps: [{ peakDeg: 0 }, { peakDeg: 0 }] }), RAW);
    expect(result.reps).toBe(0);
    expect(result.peakDeg).toBeNull();
  });
});

/** The landmark a motion moves and the landmark it pivots about, to read the true axis off the model's positions. */
function movingPair(motion: MotionId, digit: Digit | null): [moving: number, pivot: number] {
  if (MOTIONS[motion].joint === "wrist") return [MIDDLE_MCP, WRIST];
  const c = DIGIT_CHAIN[digit!];
  if (motion === "pip.flexion" || (motion === "ip.extension" && digit !== "thumb")) return [c[2], c[1]];
  if (motion === "dip.flexion" || motion === "ip.flexion" || motion === "ip.extension") return [c[3], c[2]];
  // The thumb's chain starts at its CMC, so its MCP moves the landmark one further along.
  return digit === "thumb" ? [c[2], c[1]] : [c[1], c[0]];
}

/** The verdict the model's own geometry implies over the outward arc, and how far it sits from a band edge. */
function modelVerdict(motion: MotionId, digit: Digit | null, side: Side, placement: Placement, gravity: Vec3) {
  const [rest, peak] = ARC[motion];
  const [moving, pivot] = movingPair(motion, digit);
  let axisSum = 0;
  let travelSum = 0;
  const steps = 12;
  for (let s = 0; s < steps; s++) {
    const deg = rest + ((peak - rest) * (s + 0.5)) / steps;
    const lm = poseHand(withMotionAngle(neutralPose(), motion, digit, deg), side, placement).landmarks;
    const travel = trueTravel(neutralPose(), motion, digit, side, placement, deg, moving);
    const axis = normalize(cross(sub(lm[moving], lm[pivot]), travel));
    if (!axis) throw new Error(`${motion} ${digit}: the model did not move landmark ${moving} at ${deg} deg`);
    axisSum += lineAngleDeg(axis, gravity);
    travelSum += dot(travel, gravity);
  }
  const axisDeg = axisSum / steps;
  const margin = Math.min(Math.abs(axisDeg - PLANE_LIMITS.verticalMinDeg), Math.abs(axisDeg - PLANE_LIMITS.horizontalMaxDeg));
  return { verdict: planeVerdict(axisDeg, travelSum / steps), axisDeg, margin, travel: travelSum / steps };
}

describe("plane verdict against the model's geometry, random orientations and gravity directions", () => {
  it("agrees outside the unclear band for every motion", () => {
    const random = new SeededRandom(99);
    let checked = 0;
    for (const motion of MOTION_IDS) {
      for (let i = 0; i < 10; i++) {
        const side = SIDES[i % 2];
        const digit = digitFor(motion, i);
        const placement = randomPlacement(random);
        const gravity: Vec3 = i % 3 === 0 ? [0, 1, 0] : random.direction();
        const truth = modelVerdict(motion, digit, side, placement, gravity);
        // Near a band edge or with a plane barely tilted either way, the truth itself is a coin toss: skip those.
        if (truth.margin < 4 || (truth.axisDeg >= 60 && Math.abs(truth.travel) < 0.15)) continue;
        const [rest, peak] = ARC[motion];
        const result = analyzeCapture(
          buildSyntheticCapture({ motion, side, digit, condition: "against_gravity", placement, gravity, restDeg: rest, reps: [{ peakDeg: peak }], noiseMm: 1, seed: i }),
        );
        expect(result.plane!.verdict, `${motion} ${side} ${digit} axis ${truth.axisDeg.toFixed(1)}`).toBe(truth.verdict);
        expect(Math.abs(result.plane!.axisToGravityDeg - truth.axisDeg)).toBeLessThan(4);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(80);
  });
});

describe("framing at the start of a capture (an upload no set-up check held)", () => {
  // Picture points spanning `span` of a 4:3 picture's height (its shorter side), from t = 0 in steps of 100 ms.
  const framed = (spans: readonly number[]) =>
    spans.map((span, i) => ({ t: i * 100, score: 0.9, hand: null, image: Array.from({ length: 21 }, (_, k) => [0.5, 0.2 + (span * k) / 20]), imageAspect: 4 / 3 }));
  const thumbSide = { motion: "pip.flexion" as const, side: "right" as const, digit: "index" as const, condition: "gravity_minimized" as const };

  it("measures the hand's span as the median over the first second, later frames aside", () => {
    const frames = [...framed(Array.from({ length: 11 }, () => 0.5)), ...framed([0.95, 0.95]).map((f) => ({ ...f, t: f.t + 2000 }))];
    expect(startHandSpan({ frames })).toBeCloseTo(0.5, 9);
    expect(startHandSpan({ frames: [{ t: 0, score: 0, hand: null }] })).toBeNull();
  });

  it("warns from the thumb side outside the set-up check's band (vision/view-policy.ts FRAMING), not inside it", () => {
    expect(framingWarning({ ...thumbSide, frames: framed([0.7, 0.7, 0.7]) })).toMatch(/filled 70% of the picture at the start, more than the 60%/);
    expect(framingWarning({ ...thumbSide, frames: framed([0.3, 0.3, 0.3]) })).toMatch(/filled 30% .* less than the 40%/);
    expect(framingWarning({ ...thumbSide, frames: framed([0.5, 0.5, 0.5]) })).toBeNull();
    // Against gravity (little-finger side) a finger has no upper bound.
    expect(framingWarning({ ...thumbSide, condition: "against_gravity", frames: framed([0.7, 0.7, 0.7]) })).toBeNull();
    // The wrist from the thumb side: the same upper bound; below the usual least span, its own reason.
    const wrist = { ...thumbSide, motion: "wrist.flexion" as const, digit: null };
    expect(framingWarning({ ...wrist, frames: framed([0.7, 0.7, 0.7]) })).toMatch(/more than the 60%/);
    expect(framingWarning({ ...wrist, frames: framed([0.3, 0.3, 0.3]) })).toBeNull();
    expect(framingWarning({ ...wrist, frames: framed([0.1, 0.1, 0.1]) })).toMatch(/less than the 20% .* pixel jitter/);
  });

  it("reaches the analysis's warnings", () => {
    const analysis = analyzeCapture({ ...thumbSide, frames: framed(Array.from({ length: 20 }, () => 0.75)) });
    expect(analysis.warnings.some((w) => /filled 75% of the picture/.test(w))).toBe(true);
  });
});
