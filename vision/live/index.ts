/**
 * Live hand tracking for the browser. Usage:
 *   const tracker = await createHandTracker({ forearm: true });
 *   const unsubscribe = tracker.subscribe((frame) => pipeline.push(frame));
 *   tracker.start(videoElement);
 * The measurement engine (`vision/`) turns `TrackedFrame`s into angles; this folder holds no angle maths.
 */
export { createHandTracker, type HandTracker } from "./tracker";
export { correctHandedness, forearmDirection, handFrame } from "./landmark-results";
export { FrameGovernor } from "./frame-governor";
export type { FrameTiming, HandSide, LandmarkXYZ, ModelVariant, TrackedFrame, TrackerOptions, TrackerStats } from "./types";
