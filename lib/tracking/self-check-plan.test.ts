import { describe, expect, it } from "vitest";
import { MOTION_IDS } from "@/lib/motions/catalog";
import { selfCheckPlan } from "./self-check-plan";

describe("self-check plan", () => {
  it("offers every motion on the affected side when no precaution limits active motion", () => {
    const plan = selfCheckPlan({ affectedSide: "right", precautionFlags: ["no_resisted_testing", "unhealed_fracture"] });
    expect(plan.sides).toEqual(["right"]);
    expect(plan.offered).toEqual([...MOTION_IDS]);
    expect(plan.withheld).toEqual([]);
  });
  it("offers both sides when both are affected", () => {
    expect(selfCheckPlan({ affectedSide: "both", precautionFlags: [] }).sides).toEqual(["left", "right"]);
  });
  // Early motion after flexor tendon repair follows the surgeon's protocol under a therapist's eye (clinical notes,
  // cautions) [common practice]: no finger or thumb motion is offered unsupervised.
  it("after a tendon repair offers only the wrist, with the reason", () => {
    const plan = selfCheckPlan({ affectedSide: "left", precautionFlags: ["no_resisted_testing", "tendon_repair"] });
    expect(plan.offered).toEqual(["wrist.flexion", "wrist.extension", "wrist.radial_deviation", "wrist.ulnar_deviation"]);
    expect(plan.withheld.map((w) => w.motion)).toContain("pip.flexion");
    expect(plan.withheld[0].reason).toMatch(/surgeon's protocol/);
  });
  it("a repaired ligament or an unstable joint withholds the sideways motions only", () => {
    for (const flag of ["ligament_or_capsule_repair", "joint_instability"] as const) {
      const plan = selfCheckPlan({ affectedSide: "right", precautionFlags: [flag] });
      expect(plan.withheld.map((w) => w.motion).sort()).toEqual(["finger.abduction", "finger.adduction", "wrist.radial_deviation", "wrist.ulnar_deviation"]);
      expect(plan.offered).toContain("wrist.flexion");
    }
  });
});

describe("fingersTogetherNote", () => {
  it("asks for all four fingers in finger flexion checks, and only there", async () => {
    const { fingersTogetherNote } = await import("./self-check-plan");
    const report = (await import("node:fs")).readFileSync(new URL("../../scripts/accuracy/report.md", import.meta.url), "utf8");
    // The evidence the note rests on: the report's one-finger comparison misses far more than the four-finger set.
    expect(report).toContain("One finger moving, the others near rest");
    expect(fingersTogetherNote("pip.flexion", "middle")).toMatch(/all four fingers together.*middle finger/);
    expect(fingersTogetherNote("mcp.flexion", "index")).not.toBeNull();
    expect(fingersTogetherNote("dip.flexion", "little")).not.toBeNull();
    expect(fingersTogetherNote("mcp.flexion", "thumb")).toBeNull();
    expect(fingersTogetherNote("wrist.flexion", null)).toBeNull();
    expect(fingersTogetherNote("mcp.extension", "index")).toBeNull();
  });
});

describe("oneFingerNote", () => {
  it("tells the client to bend the named finger only and keep the others straight; nothing for the thumb", async () => {
    const { oneFingerNote } = await import("./self-check-plan");
    expect(oneFingerNote("ring")).toMatch(/^Bend only your ring finger\. Keep the other fingers straight/);
    expect(oneFingerNote("thumb")).toBeNull();
    expect(oneFingerNote(null)).toBeNull();
  });
});
