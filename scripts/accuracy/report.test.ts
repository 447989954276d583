import { describe, expect, it } from "vitest";
import { JOINT_GROUPS } from "./joint-groups";
import { accuracyMarkdown, accuracyRows, framesForStills, type TrackedStill } from "./report";
import { loadHandRig } from "./rig-files";
import { CAMERA_VIEWS, frameSeeds, randomFrame } from "./scene";

const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };

describe("matching tracked frames to stills", () => {
  const hand = [[0, 0, 0]];
  it("takes the last frame with a hand inside each still's window, after its first video frame", () => {
    // Stills of 200 ms at 15 fps: still 1 covers 200-399 ms; its first video frame (200 ms) may still show the
    // tracker following the previous still's hand.
    const frames = [
      { t: 0, hand },
      { t: 66.7, hand },
      { t: 200, hand, id: "first of still 1" },
      { t: 266.7, hand, id: "settled" },
      { t: 333.3, hand: null },
      { t: 400, hand: null },
    ];
    const chosen = framesForStills(frames, 3, 200, 15);
    expect(chosen[0]?.t).toBe(66.7);
    expect(chosen[1]).toMatchObject({ id: "settled" });
    expect(chosen[2]).toBeNull();
  });

  it("falls back to a still's first frame when it is the only one processed", () => {
    const chosen = framesForStills([{ t: 200, hand }], 2, 200, 15);
    expect(chosen[0]).toBeNull();
    expect(chosen[1]?.t).toBe(200);
  });
});

describe("accuracy rows", () => {
  const truths = frameSeeds(41, 24).map((seed, i) => randomFrame(rigs, seed, { views: [CAMERA_VIEWS[i % 6]] }).truth);

  it("reads a perfect tracker as unbiased beyond the convention, and a blind one as undetected", () => {
    const perfect: TrackedStill[] = truths.map((truth) => ({ truth, model: "exact", hand: truth.landmarksCameraM, score: 1 }));
    const blind: TrackedStill[] = truths.map((truth) => ({ truth, model: "blind", hand: null, score: 0 }));
    const rows = accuracyRows([...perfect, ...blind]);
    expect(rows).toHaveLength(2 * JOINT_GROUPS.length * CAMERA_VIEWS.length * 2);
    for (const row of rows.filter((r) => r.model === "exact")) {
      expect(row.summary.detectionRate).toBe(1);
      // Given the exact landmarks, the tracked estimate is the perfect-tracker reading itself.
      expect(row.summary.biasDeg).toBeCloseTo(row.perfectTrackerBiasDeg!, 9);
    }
    for (const row of rows.filter((r) => r.model === "blind")) {
      expect(row.summary.detectionRate).toBe(0);
      expect(row.summary.meanAbsoluteErrorDeg).toBeNull();
    }
    const markdown = accuracyMarkdown(rows);
    expect(markdown).toContain("### Raw landmarks, 3-D angles");
    expect(markdown).toContain("| PIP flexion | palm | blind | 16 | 0% | - | - | - | - | - |");
  });
});

describe("single-finger stills", () => {
  it("score only the moving finger's joint", () => {
    const truths = frameSeeds(43, 6).map((seed) => randomFrame(rigs, seed, { views: ["ulnar"] }).truth);
    const stills: TrackedStill[] = truths.map((truth) => ({ truth, model: "exact", hand: truth.landmarksCameraM, score: 1, movingKeys: ["ring.pipFlexionDeg"] }));
    const [row] = accuracyRows(stills, null, [JOINT_GROUPS.find((g) => g.label === "PIP flexion")!]);
    // Six stills, one scored joint each (four fingers otherwise).
    expect(row.summary.samples).toBe(6);
  });
});
