import type { Condition, Digit, MotionId, Side } from "@/lib/motions/catalog";
import { MOTIONS } from "@/lib/motions/catalog";
import { handAxes } from "./angles";
import type { HandLandmarks } from "./landmarks";
import { viewOfAxes, viewOfHand } from "./correction-views";
import type { ValidationView } from "./uncertainty";

/**
 * Kinarc's view policy: for each motion and test position, which way the camera should see the hand so the motion's
 * plane lies in the picture, and what to say when it does not. Views are the hand's own (vision/uncertainty.ts
 * VALIDATION_VIEWS, the accuracy report's views): `ulnar` = the little-finger edge faces the camera, `radial` = the
 * thumb edge, `down` = a camera above the back of a hand lying on the table, tilted toward the fingertips.
 */

/** The measured view from the hand's own axes: the engine's classifier (vision/correction-views.ts). */
export { viewOfAxes, viewOfHand };

/** The view of one frame's world landmarks (the engine's rule, viewOfHand), or null when the hand's axes can't be built. */
export function measureView(hand: HandLandmarks, side: Side): ValidationView | null {
  const axes = handAxes(hand, side);
  return axes ? viewOfHand(hand, axes, side) : null;
}

/** Where the camera stands in the room: level with the hand (a vertical motion plane) or above it (on the table). */
export type CameraPlacement = "side" | "overhead";

export interface ViewPolicy {
  /** Views in which the motion's plane faces the camera and the report's error is lowest, best first. */
  recommended: readonly ValidationView[];
  /** Views that still hold the plane in the picture but measure worse; estimates from them are marked. */
  usable: readonly ValidationView[];
  placement: CameraPlacement;
  /** What to do to get the first recommended view, in the client's words. */
  instruction: string;
  /** Why this view, with the report's figures where they decide it. */
  reason: string;
}

/**
 * The little-finger side, not the thumb side, for flexion seen from the side. scripts/accuracy/report.md (held-out
 * renders, seed 20261202, lite model, after kinarc-correction-2): MCP flexion MAE 3.8 deg from the ulnar side against
 * 8.6 from the radial side; PIP 5.1 against 7.1; wrist flexion/extension 9.8 against 32.7. DIP is the exception (13.5
 * against 12.7, within the noise of either); it keeps the ulnar side so one set-up serves every finger joint. The
 * report's wrist section (seed 20261203, read against a neutral reading, raw) agrees for the wrist: MAE 9.4 from the
 * ulnar side against 13.5 from the radial side (lite), 4.6 against 26.3 (full). [Our reading of why, not measured:
 * from the thumb side the index finger hides the others and the thumb crosses the palm.]
 */
const ULNAR_SIDE_REASON =
  "held-out renders read flexion better from the little-finger side (MAE after correction, lite model: MCP 3.8 vs 8.6 deg, PIP 5.1 vs 7.1, wrist 9.8 vs 32.7; DIP about even; scripts/accuracy/report.md)";

const WORDS = {
  ulnarSide:
    "Put the camera level with your hand on its little-finger side, so it sees the hand edge-on. Turn your hand so the little finger faces the camera.",
  radialFromAbove:
    "With your hand resting on its little-finger edge, put the camera above it looking down, so it sees the thumb side of the hand, with the hand filling about half of the picture.",
  backFromAbove:
    "Lay your hand flat, palm down, and put the camera above it looking down at the back of your hand, a little in front of your fingertips (a phone on a stand across the table works well).",
  flatOfHand: "Put the camera level with your hand, facing the back or the palm, so it sees the whole flat of the hand.",
  thumbSide: "Put the camera level with your hand on the thumb side, so it sees the thumb from the side.",
} as const;

function policyFor(motion: MotionId, condition: Condition, digit: Digit | null): ViewPolicy {
  const joint = MOTIONS[motion].joint;
  const sideways = motion === "finger.abduction" || motion === "finger.adduction" || motion === "wrist.radial_deviation" || motion === "wrist.ulnar_deviation";
  if (sideways) {
    // Deviation and spreading happen in the plane of the palm: the camera must face the back or the palm.
    if (condition === "gravity_minimized") {
      return {
        recommended: ["down", "back"],
        usable: ["oblique"],
        placement: "overhead",
        instruction: WORDS.backFromAbove,
        reason: "the hand lies flat and moves in the plane of the table; the looking-down view is the one the report validates (wrist deviation MAE 4.4 deg after correction, lite)",
      };
    }
    return {
      recommended: ["back", "palm"],
      usable: ["oblique", "down"],
      placement: "side",
      instruction: WORDS.flatOfHand,
      reason: "the hand rests on its edge and moves in a vertical plane through the palm; the camera faces the flat of the hand",
    };
  }
  if (digit === "thumb") {
    // The thumb flexes across the palm about an axis between the wrist, the thumb side and the palm [our geometry,
    // vision/angles thumbHingeAxis]; the report holds no thumb test motion, so no side is preferred by data. From the
    // little-finger side or from above the back of the hand the palm hides the thumb.
    return {
      recommended: ["radial", "palm"],
      usable: ["oblique", "back"],
      placement: "side",
      instruction: WORDS.thumbSide,
      reason: "the thumb's plane of flexion faces the thumb side and the palm; the report has no thumb test motion to rank them",
    };
  }
  if (condition === "gravity_minimized") {
    // The test position rests the hand or forearm on its little-finger edge (lib/motions/catalog.ts) and the motion
    // slides along the table: only a camera above it puts the plane in the picture, and that camera sees the thumb
    // side, the worse of the two side views in the report. Estimates keep that view's larger uncertainty.
    return {
      recommended: ["radial"],
      usable: ["ulnar"],
      placement: "overhead",
      instruction: WORDS.radialFromAbove,
      reason: `the hand rests on its little-finger edge and slides on the table, so a camera above sees the thumb side; ${ULNAR_SIDE_REASON}, so these estimates carry the thumb side's wider uncertainty`,
    };
  }
  return {
    recommended: ["ulnar"],
    usable: ["radial"],
    placement: "side",
    instruction: WORDS.ulnarSide,
    reason: `the ${joint === "wrist" ? "hand" : "finger"} moves in a vertical plane, seen edge-on from the side; ${ULNAR_SIDE_REASON}`,
  };
}

export function viewPolicy(motion: MotionId, condition: Condition, digit: Digit | null): ViewPolicy {
  return policyFor(motion, condition, digit);
}

/**
 * How a measured view serves the motion: `recommended`; `usable` (the plane is in the picture but the report's error
 * is larger); `poor` (the motion runs toward or away from the camera, where the landmarks' depth is weakest).
 */
export type ViewQuality = "recommended" | "usable" | "poor";

export function viewQuality(policy: ViewPolicy, view: ValidationView): ViewQuality {
  if (policy.recommended.includes(view)) return "recommended";
  if (policy.usable.includes(view)) return "usable";
  return "poor";
}

const VIEW_WORDS: Record<ValidationView, string> = {
  palm: "your palm",
  back: "the back of your hand",
  radial: "the thumb side of your hand",
  ulnar: "the little-finger side of your hand",
  oblique: "your hand at a slant",
  down: "the back of your hand from above",
};

const VIEW_NAMES: Record<ValidationView, string> = {
  palm: "palm view",
  back: "back-of-hand view",
  radial: "thumb-side view",
  ulnar: "little-finger-side view",
  oblique: "slanted view",
  down: "looking-down view",
};

/** A view's name for notes a therapist reads: "thumb-side view". */
export function viewName(view: ValidationView): string {
  return VIEW_NAMES[view];
}

/** A plain description of a view, for the client's set-up checks: "the thumb side of your hand". */
export function describeView(view: ValidationView): string {
  return VIEW_WORDS[view];
}

/**
 * What to tell the client when the measured view is not the recommended one: what the camera sees now, then how to
 * move the camera or turn the hand. Words only name the hand's own sides, so they hold for either hand and for a
 * mirrored preview alike. Empty when the view is recommended.
 */
export function viewInstruction(policy: ViewPolicy, measured: ValidationView): string {
  const quality = viewQuality(policy, measured);
  if (quality === "recommended") return "";
  const target = policy.recommended[0];
  const now = `The camera sees ${describeView(measured)}.`;
  // The opposite side view: a quarter turn will not do, the camera (or the client) has to go round the hand.
  if (target === "ulnar" && measured === "radial") {
    return `${now} Move the camera round to the little-finger side of your hand, or turn so your little finger faces the camera: angles read more truly from that side.`;
  }
  if ((target === "ulnar" || target === "radial") && measured !== "ulnar" && measured !== "radial") {
    const edge = target === "ulnar" ? "little-finger" : "thumb";
    const where = policy.placement === "overhead" ? "Put the camera straight above your hand" : "Lower the camera to the height of your hand";
    return `${now} ${where} and turn your hand so its ${edge} edge faces the camera: the joint should bend across the picture, not toward the camera.`;
  }
  return `${now} ${policy.instruction}`;
}

/** The view most frames saw (strictly more than half), or null when no view holds a majority. */
export function majorityView(views: readonly (ValidationView | null)[]): ValidationView | null {
  const counts = new Map<ValidationView, number>();
  let seen = 0;
  for (const v of views) {
    if (!v) continue;
    seen += 1;
    counts.set(v, (counts.get(v) ?? 0) + 1);
  }
  for (const [v, n] of counts) if (n * 2 > seen) return v;
  return null;
}

/**
 * How much of the picture the hand should fill, as the hand's longer side over the picture's shorter side (`handSpan`).
 * - `minHandSpan`: below a fifth the landmarks' pixel jitter becomes several degrees of finger angle [reasoning: at
 *   480 px a finger segment is then under 25 px, and 1-2 px of jitter turns it by 2-5 degrees].
 * - `thumbSideFingerSpan`: finger flexion seen from the thumb side (a camera above a hand resting on its little-finger
 *   edge). On the calibration clips (seeds 77000407-77000408, thumb side, four-finger MCP, PIP and DIP flexion, both
 *   hand models; nothing fitted on them; scripts/accuracy/detection-scan.ts), hands filling more than 0.6 of the
 *   picture were lost: the full model found 88% of frames at 0.6-0.7 and 43% above 0.7, against 91-100% below 0.6;
 *   and DIP read worst above 0.6 (both models together, readings' frame MAE averaged, 8.9 deg) and below 0.4
 *   (8.1 deg, a fingertip's bone a few dozen pixels long) against 5.7-6.7 deg between. Held out, seeds 20261225,
 *   20261226 and 20261228 (framed so, each read once): both models MCP 3.0-3.1, PIP 3.6-4.1, DIP 5.6-6.6 deg,
 *   98-100% of frames found by each model (scripts/accuracy/README.md, "Framing from the thumb side"). From the little-finger
 *   side no such loss was seen (seeds 77000407 and 20261222: every span band 100% found by one model or the other).
 */
export const FRAMING = {
  minHandSpan: 0.2,
  thumbSideFingerSpan: { min: 0.4, max: 0.6 },
  /**
   * Wrist flexion/extension from the thumb side: the same upper bound, the usual lower one. Calibration wrist clips
   * (seeds 77000407-77000408, 40 clips, both models; scripts/accuracy/detection-scan.ts): every clip up to 0.6 was
   * found in 99-100% of frames by each model, above it the full model found 75% (0.6-0.7) and 18% (above 0.7).
   */
  thumbSideWristSpan: { min: 0.2, max: 0.6 },
} as const;

/** The hand's longer side in the picture over the picture's shorter side; `image` in 0-1 of `width` and `height`. */
export function handSpan(image: readonly (readonly number[])[], width: number, height: number): number {
  if (image.length === 0) throw new Error("image: expected the hand's landmarks, got none");
  const xs = image.map((p) => p[0]);
  const ys = image.map((p) => p[1]);
  const shorter = Math.min(width, height) || 1;
  return Math.max((Math.max(...xs) - Math.min(...xs)) * width, (Math.max(...ys) - Math.min(...ys)) * height) / shorter;
}

/**
 * The hand spans a motion, test position and digit are read at: where the recommended view is the thumb side, the
 * thumb-side band of a finger's MCP, PIP or DIP motion or of the wrist's; else at least `minHandSpan` with no upper
 * bound but the picture's edges (the thumb's own motions were not measured for framing). The set-up check holds a
 * live attempt to it; an upload outside it carries a warning (analyzeCapture).
 */
export function handSpanBand(motion: MotionId, condition: Condition, digit: Digit | null): { min: number; max: number } {
  const joint = MOTIONS[motion].joint;
  const thumbSide = digit !== "thumb" && policyFor(motion, condition, digit).recommended[0] === "radial";
  if (thumbSide && (joint === "mcp" || joint === "pip" || joint === "dip")) return FRAMING.thumbSideFingerSpan;
  if (thumbSide && joint === "wrist") return FRAMING.thumbSideWristSpan;
  return { min: FRAMING.minHandSpan, max: Infinity };
}
