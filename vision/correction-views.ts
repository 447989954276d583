import type { Side } from "@/lib/motions/catalog";
import type { HandAxes } from "./angles";
import { INDEX_MCP, LITTLE_MCP, MIDDLE_MCP, THUMB_IP, THUMB_MCP, THUMB_TIP, WRIST, type HandLandmarks } from "./landmarks";

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

/**
 * When a hand counts as seen side-on in the picture. A hand seen from the palm or the back shows its width about 0.8 of
 * its length (index to little-finger knuckle about 7-8 cm, wrist to middle knuckle about 9-10 cm [common anthropometry,
 * from memory]); side-on the width nearly vanishes (training clips, seed 77000401: 0.01-0.34). The thumb rests in front
 * of the palm, so its side of the long axis in the picture is the palm's side: at least 10 mm off the axis, or the
 * picture is not side-on enough to tell. Training clips (seeds 77000401-77000402, 71 side-on straight-wrist holds):
 * 6.9-49 mm, the right side every time. It was 5 mm until held-out seed 20261209 showed a left hand at 5.9 mm read on
 * the wrong side (its extension read as flexion); 10 mm is our margin over that, not a fit. Kinarc's rule.
 */
export const SIDE_ON_LIMITS = { maxWidthRatio: 0.45, minThumbOffsetM: 0.01 } as const;

/** The wrist-to-middle-knuckle direction in the picture plane (world x and y; unit) and its length, or null when it has none. */
export function pictureLongAxis(hand: HandLandmarks): { u: [number, number]; length: number } | null {
  const x = hand[MIDDLE_MCP][0] - hand[WRIST][0];
  const y = hand[MIDDLE_MCP][1] - hand[WRIST][1];
  const length = Math.hypot(x, y);
  return length > 1e-9 ? { u: [x / length, y / length], length } : null;
}

/**
 * One frame's hand as the picture shows it, from the world landmarks' x and y (the camera's picture axes): the
 * wrist-to-middle-knuckle direction `u` (unit), the in-picture width (index to little-finger knuckle) over that length,
 * and the thumb's mean offset (MCP, IP, tip) from the long axis toward (-u_y, u_x), the long axis turned a quarter
 * clockwise on screen, in metres (signed). Null when the hand has no length in the picture.
 */
export function pictureSideOnFigures(hand: HandLandmarks): { u: [number, number]; widthRatio: number; thumbOffsetM: number } | null {
  const axis = pictureLongAxis(hand);
  if (!axis) return null;
  const { u, length } = axis;
  const widthRatio = Math.hypot(hand[INDEX_MCP][0] - hand[LITTLE_MCP][0], hand[INDEX_MCP][1] - hand[LITTLE_MCP][1]) / length;
  let thumb = 0;
  for (const k of [THUMB_MCP, THUMB_IP, THUMB_TIP]) thumb += (-u[1] * (hand[k][0] - hand[WRIST][0]) + u[0] * (hand[k][1] - hand[WRIST][1])) / 3;
  return { u, widthRatio, thumbOffsetM: thumb };
}

/**
 * The view of one frame. Seen side-on (SIDE_ON_LIMITS, in the picture) the hand's width lies along the depth, which
 * the landmark model places least surely, so the 3-D axes can turn the palm toward the camera when it faces sideways:
 * on training clips from the thumb side (seed 77000401, gravity minimized) the 3-D rule named a fifth of the lite
 * model's PIP frames "palm", whose fit then read them 18 degrees off against 4 for the frames it named "radial".
 * Where the picture contradicts the 3-D view, the picture decides: the 3-D axes name a face (palm, back) or an edge
 * while the picture shows the hand side-on. Then the edge comes from the palm's side of the long axis (where the
 * thumb sits) and the hand's side: the radial axis (index side) points toward the camera or away (vision/angles.ts
 * handAxes: for a right hand palmar = radial x long, so radial = long x palmar; for a left hand radial = palmar x
 * long). A hand turned part way (oblique, or from above) shows a width in between, so a narrow picture does not
 * contradict those views and they stand, as does every view where the picture is not side-on.
 */
export function viewOfHand(hand: HandLandmarks, axes: HandAxes, side: Side): ValidationView {
  const fromAxes = viewOfAxes(axes);
  if (fromAxes === "oblique" || fromAxes === "down") return fromAxes;
  const picture = pictureSideOnFigures(hand);
  if (picture && picture.widthRatio <= SIDE_ON_LIMITS.maxWidthRatio && Math.abs(picture.thumbOffsetM) >= SIDE_ON_LIMITS.minThumbOffsetM) {
    // (long x palmar) along the line of sight has the sign of the thumb's turn; the radial axis is that (right hand) or
    // its opposite (left), and it faces the camera when it points toward -z.
    const radialZ = (side === "right" ? 1 : -1) * Math.sign(picture.thumbOffsetM);
    return radialZ < 0 ? "radial" : "ulnar";
  }
  return fromAxes;
}
