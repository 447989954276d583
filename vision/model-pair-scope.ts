/**
 * Which clips are read by both hand models (vision/model-pair.ts), and how its notes read. Kept apart from the engine
 * so a page can ask without loading it.
 */
import type { Digit, MotionId } from "@/lib/motions/catalog";

/** The motions the two-model reading was measured on: four-finger flexion clips (scripts/accuracy/README.md). */
const MEASURED_MOTIONS: readonly MotionId[] = ["mcp.flexion", "pip.flexion", "dip.flexion"];

/** Whether a clip of this motion and digit should be tracked by both models: a finger's (not the thumb's) MCP, PIP or DIP flexion. */
export function readsWithBothModels(motion: MotionId, digit: Digit | null): boolean {
  return MEASURED_MOTIONS.includes(motion) && digit !== null && digit !== "thumb";
}

/** How the engine's note on an attempt whose two models disagree about the peak begins (pages pick it out by it). */
export const MODELS_DISAGREE_NOTE = "the two hand models disagree";
