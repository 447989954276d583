// Kinarc's own trend rule on worked examples.
import { describe, expect, it } from "vitest";
import { practiceTrend, TYPICAL_ERROR_FLOOR_DEG, type SessionReading } from "./trend";

describe("trend rule (Kinarc's own: best of the last three sessions against the best before them)", () => {
  const readings = (degs: number[], uncertaintyDeg: number | null = null): SessionReading[] =>
    degs.map((bestDeg, i) => ({ sessionId: `s${i}`, startedAt: new Date(Date.UTC(2026, 11, 1 + i)), bestDeg, uncertaintyDeg }));

  it("needs at least four sessions", () => {
    expect(practiceTrend(readings([40, 50, 60]), null).verdict).toBe("too_few");
  });

  it("reads falling, stalled and improving against the typical error", () => {
    // Earlier best 62; recent best 54 is 8° below, more than the 5° floor.
    expect(practiceTrend(readings([40, 60, 62, 50, 52, 54]), 100)).toMatchObject({ verdict: "falling", earlierBestDeg: 62, recentBestDeg: 54 });
    // Earlier best 55; recent best 57 is within 5° above.
    expect(practiceTrend(readings([40, 50, 55, 56, 57, 55]), 100)).toMatchObject({ verdict: "stalled", earlierBestDeg: 55, recentBestDeg: 57 });
    // Earlier best 60; recent best 72 is 12° above.
    expect(practiceTrend(readings([40, 50, 60, 66, 70, 72]), 100)).toMatchObject({ verdict: "improving" });
    // Exactly the typical error above the earlier best is not yet more than it: stalled.
    expect(practiceTrend(readings([40, 50, 60, 62, 65, 61]), 100).verdict).toBe("stalled");
  });

  it("widens the typical error to the engine's stated ± when that is larger than the floor", () => {
    // 67 vs 60: above the 5° floor (improving) but within an engine ± of 8° (stalled).
    expect(practiceTrend(readings([40, 50, 60, 66, 67, 67]), 100).verdict).toBe("improving");
    const wide = practiceTrend(readings([40, 50, 60, 66, 67, 67], 8), 100);
    expect(wide).toMatchObject({ verdict: "stalled", typicalErrorDeg: 8 });
    expect(practiceTrend(readings([40, 50, 60, 66, 67, 67], 3), 100).typicalErrorDeg).toBe(TYPICAL_ERROR_FLOOR_DEG);
  });

  it("does not call a range at the reference end-range stalled", () => {
    // PIP flexion reference 100° (AAOS 1965, via the catalog); a client holding 101-103° has nothing left to gain.
    expect(practiceTrend(readings([95, 101, 102, 103, 101, 102]), 100).verdict).toBe("at_reference");
  });

  it("orders sessions by time, not by arrival", () => {
    const shuffled = readings([40, 60, 62, 50, 52, 54]).reverse();
    expect(practiceTrend(shuffled, 100).verdict).toBe("falling");
  });
});
