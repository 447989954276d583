import type { HandAxes } from "./angles";

/** Camera views of the validation renders (scripts/accuracy/scene.ts CAMERA_VIEWS). */
export const VALIDATION_VIEWS = ["palm", "back", "radial", "ulnar", "oblique", "down"] as const;
export type ValidationView = (typeof VALIDATION_VIEWS)[number];

/**
 * Which validation view the camera has, from the hand's own axes: cosines of the palm normal, the radial axis and the
 * long axis (wrist to fingers) with the direction to the camera. The nearest of the views' directions in
 * scripts/accuracy/scene.ts VIEW_GEOMETRY (palm, ulnar, distal components) by cosine.
 */
const VIEW_DIRECTIONS: Record<ValidationView, [palm: number, radial: number, distal: number]> = {
  palm: [1, 0, 0],
  back: [-1, 0, 0],
  radial: [0, 1, 0],
  ulnar: [0, -1, 0],
  oblique: [-0.65, 0.65, 0.35],
  down: [-Math.sin((55 * Math.PI) / 180), 0, Math.cos((55 * Math.PI) / 180)],
};
export function viewFromHand(palmTowardCamera: number, radialTowardCamera: number, distalTowardCamera: number): ValidationView {
  let best: ValidationView = "palm";
  let bestCos = -Infinity;
  for (const view of VALIDATION_VIEWS) {
    const [p, r, d] = VIEW_DIRECTIONS[view];
    const cos = (p * palmTowardCamera + r * radialTowardCamera + d * distalTowardCamera) / Math.hypot(p, r, d);
    if (cos > bestCos) {
      best = view;
      bestCos = cos;
    }
  }
  return best;
}


/** The view of a frame from its hand axes (camera z points away from the camera, so "toward the camera" is -z). */
export function viewOfAxes(axes: HandAxes): ValidationView {
  return viewFromHand(-axes.palmarNormal[2], -axes.radialAxis[2], -axes.longAxis[2]);
}
