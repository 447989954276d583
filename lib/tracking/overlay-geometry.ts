/**
 * Geometry of the hand overlay, kept apart from drawing so it can be tested: where the video's picture lands in its
 * box (object-fit), where a landmark lands on screen (mirrored or not), which landmarks carry a motion's angle, and the
 * arc that shows it. Pure.
 */
import { DIGIT_CHAIN, WRIST } from "@/vision/landmarks";
import { MOTIONS, type Digit, type MotionId } from "@/lib/motions/catalog";

export interface Rect {
  x: number;
  y: number;
  width: number;
  height: number;
}

export type ObjectFit = "contain" | "cover";

/** Where a `videoWidth`x`videoHeight` picture is drawn inside a box under CSS `object-fit` (centred, as by default). */
export function contentRect(videoWidth: number, videoHeight: number, boxWidth: number, boxHeight: number, fit: ObjectFit): Rect {
  if (!(videoWidth > 0 && videoHeight > 0)) return { x: 0, y: 0, width: boxWidth, height: boxHeight };
  const scale = fit === "contain" ? Math.min(boxWidth / videoWidth, boxHeight / videoHeight) : Math.max(boxWidth / videoWidth, boxHeight / videoHeight);
  const width = videoWidth * scale;
  const height = videoHeight * scale;
  return { x: (boxWidth - width) / 2, y: (boxHeight - height) / 2, width, height };
}

/** A landmark's normalised image point (0-1 of the unmirrored picture) on screen. */
export function toScreen(point: readonly number[], rect: Rect, mirrored: boolean): [number, number] {
  const u = mirrored ? 1 - point[0] : point[0];
  return [rect.x + u * rect.width, rect.y + point[1] * rect.height];
}

/** The landmarks an angle is drawn on: the arc sits at `vertex` between the line `from`→`vertex` carried on and `vertex`→`to`. */
export interface JointLandmarks {
  from: number | null;
  vertex: number;
  to: number;
}

export function jointLandmarks(motion: MotionId, digit: Digit | null): JointLandmarks {
  const def = MOTIONS[motion];
  if (def.joint === "wrist") return { from: null, vertex: WRIST, to: DIGIT_CHAIN.middle[0] };
  const [base, second, third, tip] = DIGIT_CHAIN[digit ?? "index"];
  if (digit === "thumb") {
    // Thumb chain is [CMC, MCP, IP, tip].
    if (def.joint === "mcp") return { from: base, vertex: second, to: third };
    return { from: second, vertex: third, to: tip };
  }
  switch (def.joint) {
    case "mcp":
      return { from: WRIST, vertex: base, to: second };
    case "pip":
    case "ip":
      return { from: base, vertex: second, to: third };
    case "dip":
      return { from: second, vertex: third, to: tip };
  }
}

export interface ArcGeometry {
  centre: [number, number];
  radius: number;
  /** Screen angle (radians, y down) of the arc's zero: the proximal segment carried on past the joint. */
  startRad: number;
  /** +1 when the arc turns clockwise on screen, -1 counter-clockwise: toward the distal segment. */
  direction: 1 | -1;
}

/**
 * The arc for a joint seen on screen. Its zero is the proximal segment carried on (a goniometer's fixed arm); it turns
 * toward the distal segment. Without a proximal landmark (the wrist, whose forearm is often out of view), the zero is
 * the distal segment turned back by the angle, so the arc still shows the angle's size ending on the hand's line.
 */
export function arcGeometry(screen: { from: [number, number] | null; vertex: [number, number]; to: [number, number] }, angleDeg: number): ArcGeometry {
  const [vx, vy] = screen.vertex;
  const dx = screen.to[0] - vx;
  const dy = screen.to[1] - vy;
  const distalLength = Math.hypot(dx, dy);
  const radius = Math.max(18, Math.min(70, distalLength * 0.8));
  const distalRad = Math.atan2(dy, dx);
  if (!screen.from) {
    const direction = 1 as const;
    return { centre: [vx, vy], radius, startRad: distalRad - (direction * angleDeg * Math.PI) / 180, direction };
  }
  const ex = vx - screen.from[0];
  const ey = vy - screen.from[1];
  const cross = ex * dy - ey * dx;
  return { centre: [vx, vy], radius, startRad: Math.atan2(ey, ex), direction: cross < 0 ? -1 : 1 };
}

/** Start and end screen angles for `angleDeg` along the arc (negative angles turn the other way, e.g. hyperextension). */
export function arcSpan(arc: ArcGeometry, angleDeg: number): { startRad: number; endRad: number; anticlockwise: boolean } {
  const sweep = (arc.direction * angleDeg * Math.PI) / 180;
  return { startRad: arc.startRad, endRad: arc.startRad + sweep, anticlockwise: sweep < 0 };
}

/** The 21-point hand's bones, for drawing the skeleton (MediaPipe hand landmark topology). */
export const HAND_BONES: readonly (readonly [number, number])[] = [
  [0, 1], [1, 2], [2, 3], [3, 4],
  [0, 5], [5, 6], [6, 7], [7, 8],
  [5, 9], [9, 10], [10, 11], [11, 12],
  [9, 13], [13, 14], [14, 15], [15, 16],
  [13, 17], [0, 17], [17, 18], [18, 19], [19, 20],
];
