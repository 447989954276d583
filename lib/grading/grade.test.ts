import { describe, expect, it } from "vitest";
import { chooseReference, gradeMotion, type GradeInput, type GradingAttempt } from "./grade";

// Worked cases against the published grade definitions (shared/notes/clinical-references.md):
// Daniels & Worthingham's Muscle Testing, Hislop, Avers & Brown, 9th ed., 2014: 2- partial range gravity minimized;
// 2 full range gravity minimized; 2+ up to half the range against gravity; 3- more than half but less than full
// against gravity; 3 full range against gravity. MRC Memorandum 45, HMSO 1976: 2 movement with gravity eliminated,
// 3 against gravity, no plus or minus. Modified intrinsic scale (Brandsma & Schreuders; ASHT): gravity ignored,
// 3 full active range, 2 reduced range, 1 palpable contraction only.
// Reference: wrist flexion 80 deg, AAOS 1965 via Norkin & White, 5th ed., Appendix A.

const REF = { endRangeDeg: 80, source: "AAOS 1965" };

function ag(peakDeg: number, extra: Partial<GradingAttempt> = {}): GradingAttempt {
  return { condition: "against_gravity", planeVerdict: "against_gravity", peakDeg, arcDeg: peakDeg, trackingOk: true, ...extra };
}
function gm(peakDeg: number, extra: Partial<GradingAttempt> = {}): GradingAttempt {
  return { condition: "gravity_minimized", planeVerdict: "gravity_minimized", peakDeg, arcDeg: peakDeg, trackingOk: true, ...extra };
}
function grade(attempts: GradingAttempt[], extra: Partial<GradeInput> = {}) {
  return gradeMotion({ motion: "wrist.flexion", attempts, reference: REF, today: "2026-12-02", ...extra });
}
const reasonsOf = (r: ReturnType<typeof grade>) => r.inPerson.map((n) => n.reason);

describe("Daniels & Worthingham range grades (default scale)", () => {
  it("full range against gravity is 3, a ceiling that needs a resisted test for 3+ to 5", () => {
    const r = grade([ag(76)]);
    expect(r.value).toBe("3");
    expect(r.ceiling).toBe(true);
    expect(reasonsOf(r)).toEqual(["resistance"]);
    expect(r.inPerson[0].detail).toMatch(/unhealed fracture/);
  });

  it("more than half but less than full range against gravity is 3-", () => {
    expect(grade([ag(50)]).value).toBe("3-");
  });

  it("up to half the range against gravity is 2+", () => {
    expect(grade([ag(30)]).value).toBe("2+");
  });

  it("no movement against gravity but full range gravity-minimized is 2; partial is 2-", () => {
    expect(grade([ag(2), gm(78)]).value).toBe("2");
    expect(grade([ag(2), gm(30)]).value).toBe("2-");
  });

  it("no movement anywhere gives no grade and asks for palpation to tell 0 from 1", () => {
    const r = grade([ag(1), gm(3)]);
    expect(r.value).toBeNull();
    expect(reasonsOf(r)).toContain("palpation");
  });

  it("uses the thresholds at their edges: 90% is full, 50% is 3-, an arc of exactly 5 deg is no movement", () => {
    expect(grade([ag(72)]).value).toBe("3");
    expect(grade([ag(71.9)]).value).toBe("3-");
    expect(grade([ag(40)]).value).toBe("3-");
    expect(grade([ag(39.9)]).value).toBe("2+");
    expect(grade([ag(5), gm(5)]).value).toBeNull();
    expect(grade([ag(5.1)]).value).toBe("2+");
  });

  it("takes the best verified attempt of each condition", () => {
    const r = grade([ag(30), ag(60), gm(80)]);
    expect(r.value).toBe("3-");
    expect(r.againstGravityBestDeg).toBe(60);
    expect(r.gravityMinimizedBestDeg).toBe(80);
  });

  it("an attempt counts for its condition only when the plane check agrees", () => {
    const r = grade([ag(78, { planeVerdict: "gravity_minimized", label: "attempt-1" }), gm(78)]);
    expect(r.value).toBe("2");
    expect(r.reasons.join(" ")).toMatch(/attempt-1 not counted/);
    expect(reasonsOf(r)).toContain("position");
  });

  it("asks for a gravity-minimized attempt when nothing moved against gravity and none was verified", () => {
    const r = grade([ag(2)]);
    expect(r.value).toBeNull();
    expect(reasonsOf(r)).toEqual(expect.arrayContaining(["palpation", "position"]));
  });

  it("flags poor tracking on a counted attempt", () => {
    expect(reasonsOf(grade([ag(50, { trackingOk: false })]))).toContain("tracking");
  });

  it("a clinic's own thresholds change the boundaries", () => {
    expect(grade([ag(73)], { thresholds: { fullRangeFraction: 0.95 } }).value).toBe("3-");
    expect(grade([ag(7)], { thresholds: { minMotionDeg: 10 } }).value).toBeNull();
  });

  it("return motions are graded on their arc, not on the angle they end at", () => {
    // IP extension from 80 deg of flexion back to 0: peak reads 0, arc 80; reference 100 (AAOS PIP flexion).
    const r = gradeMotion({
      motion: "ip.extension",
      attempts: [{ condition: "against_gravity", planeVerdict: "against_gravity", peakDeg: 0, arcDeg: 80, trackingOk: true }],
      reference: { endRangeDeg: 100, source: "AAOS 1965" },
    });
    expect(r.value).toBe("3-");
  });
});

describe("precautions", () => {
  it("lists the precaution with the earliest date resisted testing is allowed: when every active one has lapsed", () => {
    const r = grade([ag(78)], {
      precautions: [
        { noResistanceUntil: "2027-01-10", note: "distal radius fracture" },
        { noResistanceUntil: "2027-02-01", note: "flexor tendon repair" },
        { noResistanceUntil: "2026-11-01", note: "lapsed" },
      ],
    });
    const precaution = r.inPerson.find((n) => n.reason === "precaution")!;
    expect(precaution.notBefore).toBe("2027-02-01");
    expect(precaution.detail).not.toMatch(/lapsed/);
    expect(r.inPerson.find((n) => n.reason === "resistance")!.notBefore).toBe("2027-02-01");
  });

  it("a lapsed precaution adds nothing", () => {
    expect(reasonsOf(grade([ag(78)], { precautions: [{ noResistanceUntil: "2026-12-01" }] }))).toEqual(["resistance"]);
  });
});

describe("MRC scale (Memorandum 45, no plus or minus)", () => {
  it("3 for full range against gravity, 2 for any other movement, none for no movement", () => {
    expect(grade([ag(78)], { scale: "mrc" }).value).toBe("3");
    expect(grade([ag(50)], { scale: "mrc" }).value).toBe("2");
    expect(grade([ag(0), gm(20)], { scale: "mrc" }).value).toBe("2");
    expect(grade([ag(0), gm(0)], { scale: "mrc" }).value).toBeNull();
  });

  it("never gives a plus or minus over a sweep of ranges", () => {
    for (let deg = 0; deg <= 90; deg += 3) {
      const value = grade([ag(deg), gm(deg)], { scale: "mrc" }).value;
      expect(value === null || /^[0-5]$/.test(value)).toBe(true);
    }
  });
});

describe("modified intrinsic scale (Brandsma & Schreuders; ASHT): gravity ignored", () => {
  it("3 for full active range in any plane, 2 for reduced range, none without movement", () => {
    const plane = { planeVerdict: "unclear" as const };
    expect(grade([gm(76, plane)], { scale: "intrinsic" }).value).toBe("3");
    expect(grade([ag(40, plane)], { scale: "intrinsic" }).value).toBe("2");
    const none = grade([ag(2, plane)], { scale: "intrinsic" });
    expect(none.value).toBeNull();
    expect(reasonsOf(none)).toEqual(["palpation"]);
  });
});

describe("reference end-range", () => {
  it("prefers the client's recorded passive range, else the chosen normal table", () => {
    expect(chooseReference("wrist.flexion", null, { passiveRangeDeg: 60 })).toEqual({ endRangeDeg: 60, source: "client's recorded passive range for this motion" });
    // Norkin & White, 5th ed., Appendix A: Boone & Azen 1979 wrist flexion 76.
    expect(chooseReference("wrist.flexion", null, { table: "boone_azen_1979" })!.endRangeDeg).toBe(76);
    // With a stiff wrist's passive range of 60 deg, 56 deg against gravity is full range (93%).
    const r = grade([ag(56)], { reference: chooseReference("wrist.flexion", null, { passiveRangeDeg: 60 })! });
    expect(r.value).toBe("3");
  });
});

describe("uncertain: the interval peak ± uncertainty straddles a grade line", () => {
  // Reference 80 deg (AAOS 1965 wrist flexion): the full-range line is 90% = 72 deg, the half line 50% = 40 deg
  // (Daniels & Worthingham 2014: 3 full range, 3- more than half, 2+ up to half against gravity).
  const u = (peakDeg: number, uncertaintyDeg: number | null) => ag(peakDeg, { uncertaintyDeg });

  it("70 ± 5 deg grades 3- but could be 3: the full-range line 72 lies inside 65-75", () => {
    const r = grade([u(70, 5)]);
    expect(r.value).toBe("3-");
    expect(reasonsOf(r)).toContain("uncertain");
    expect(r.inPerson.find((n) => n.reason === "uncertain")!.detail).toMatch(/70° ± 5° straddles the full-range \(90%\) line at 72°/);
  });

  it("42 ± 5 deg grades 3- but could be 2+: the half line 40 lies inside 37-47", () => {
    const r = grade([u(42, 5)]);
    expect(r.value).toBe("3-");
    expect(r.inPerson.find((n) => n.reason === "uncertain")!.detail).toMatch(/50% range line at 40°/);
  });

  it("60 ± 5 deg is clear of both lines, and no stated uncertainty adds no reason", () => {
    expect(reasonsOf(grade([u(60, 5)]))).not.toContain("uncertain");
    expect(reasonsOf(grade([u(70, null)]))).not.toContain("uncertain");
    expect(reasonsOf(grade([ag(70)]))).not.toContain("uncertain");
  });

  it("at the edges: the interval reaching the line counts (67 ± 5 reaches 72), one tenth short does not", () => {
    expect(reasonsOf(grade([u(67, 5)]))).toContain("uncertain");
    expect(reasonsOf(grade([u(66.9, 5)]))).not.toContain("uncertain");
    // 77 ± 5: lower end 72 is on the line, which still grades 3: not straddled.
    expect(reasonsOf(grade([u(77, 5)]))).not.toContain("uncertain");
    expect(reasonsOf(grade([u(76.9, 5)]))).toContain("uncertain");
  });

  it("gravity minimized: 70 ± 5 deg is 2- but could be 2 (full range gravity minimized)", () => {
    const r = grade([ag(2), gm(70, { uncertaintyDeg: 5 })]);
    expect(r.value).toBe("2-");
    expect(r.inPerson.find((n) => n.reason === "uncertain")!.detail).toMatch(/gravity minimized 70° ± 5°/);
  });

  it("MRC has no half line: 42 ± 5 is not uncertain there, 70 ± 5 is (MRC Memorandum 45: 2 or 3)", () => {
    expect(reasonsOf(grade([u(42, 5)], { scale: "mrc" }))).not.toContain("uncertain");
    expect(reasonsOf(grade([u(70, 5)], { scale: "mrc" }))).toContain("uncertain");
  });

  it("uses the best attempt's own uncertainty", () => {
    // The best (70, ± 1) is clear of 72; a weaker attempt with a wide interval does not decide.
    expect(reasonsOf(grade([u(70, 1), u(50, 30)]))).not.toContain("uncertain");
  });
});
