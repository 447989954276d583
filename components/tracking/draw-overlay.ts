/**
 * Draws the hand overlay on a 2-D canvas context: skeleton, the tested joint's angle as an arc with its number, and
 * the target end-range as a dashed arc. No React and no camera: the same function draws the client's own view and a
 * remote client's telemetry in the therapist's view, and the benchmark times it.
 */
import type { Digit, MotionId } from "@/lib/motions/catalog";
import { arcGeometry, arcSpan, contentRect, HAND_BONES, jointLandmarks, toScreen, type ObjectFit } from "@/lib/tracking/overlay-geometry";

export interface OverlayData {
  /** 21 image landmarks, x and y as 0-1 of the unmirrored picture; null draws nothing. */
  image: readonly (readonly number[])[] | null;
  videoWidth: number;
  videoHeight: number;
  fit: ObjectFit;
  /** The video is shown mirrored (selfie view); landmarks are flipped to match. */
  mirrored: boolean;
  motion: MotionId;
  digit: Digit | null;
  angleDeg: number | null;
  /** The reference end-range, drawn as a dashed arc. */
  targetDeg: number | null;
  /** Dims the drawing when the frame was not usable for measuring. */
  faded?: boolean;
}

// Kinarc's palette (tailwind.config.ts): tide for the live reading, sand for the target, white bones with a dark edge
// so they show on any skin and background.
const COLORS = { bone: "rgba(255,255,255,0.9)", boneEdge: "rgba(11,47,43,0.55)", joint: "#23857c", arc: "#1b6f67", arcFill: "rgba(35,133,124,0.25)", target: "#e8dcc7", label: "#0b2f2b" };

export function drawHandOverlay(ctx: CanvasRenderingContext2D | OffscreenCanvasRenderingContext2D, boxWidth: number, boxHeight: number, data: OverlayData): void {
  ctx.clearRect(0, 0, boxWidth, boxHeight);
  const { image } = data;
  if (!image || image.length !== 21) return;
  const rect = contentRect(data.videoWidth, data.videoHeight, boxWidth, boxHeight, data.fit);
  const points = image.map((p) => toScreen(p, rect, data.mirrored));
  const scale = Math.max(1, Math.min(boxWidth, boxHeight) / 360);
  ctx.save();
  ctx.globalAlpha = data.faded ? 0.45 : 1;
  ctx.lineCap = "round";
  ctx.lineJoin = "round";

  for (const [width, color] of [
    [4 * scale, COLORS.boneEdge],
    [2 * scale, COLORS.bone],
  ] as const) {
    ctx.beginPath();
    for (const [a, b] of HAND_BONES) {
      ctx.moveTo(points[a][0], points[a][1]);
      ctx.lineTo(points[b][0], points[b][1]);
    }
    ctx.strokeStyle = color;
    ctx.lineWidth = width;
    ctx.stroke();
  }
  ctx.fillStyle = COLORS.joint;
  ctx.beginPath();
  for (const [x, y] of points) {
    ctx.moveTo(x + 2.5 * scale, y);
    ctx.arc(x, y, 2.5 * scale, 0, Math.PI * 2);
  }
  ctx.fill();

  const joint = jointLandmarks(data.motion, data.digit);
  const vertex = points[joint.vertex];
  const shownDeg = data.angleDeg ?? 0;
  const arc = arcGeometry({ from: joint.from === null ? null : points[joint.from], vertex, to: points[joint.to] }, shownDeg);
  const radius = arc.radius * Math.max(1, scale * 0.8);

  if (data.targetDeg !== null && joint.from !== null) {
    const target = arcSpan(arc, data.targetDeg);
    ctx.setLineDash([4 * scale, 4 * scale]);
    ctx.strokeStyle = COLORS.target;
    ctx.lineWidth = 2 * scale;
    ctx.beginPath();
    ctx.arc(vertex[0], vertex[1], radius + 6 * scale, target.startRad, target.endRad, target.anticlockwise);
    ctx.stroke();
    ctx.setLineDash([]);
  }

  if (data.angleDeg !== null) {
    const span = arcSpan(arc, data.angleDeg);
    ctx.fillStyle = COLORS.arcFill;
    ctx.beginPath();
    ctx.moveTo(vertex[0], vertex[1]);
    ctx.arc(vertex[0], vertex[1], radius, span.startRad, span.endRad, span.anticlockwise);
    ctx.closePath();
    ctx.fill();
    ctx.strokeStyle = COLORS.arc;
    ctx.lineWidth = 3 * scale;
    ctx.beginPath();
    ctx.arc(vertex[0], vertex[1], radius, span.startRad, span.endRad, span.anticlockwise);
    ctx.stroke();

    // The number sits beside the joint on the side away from the bend, where it covers neither finger segment.
    const labelRad = arc.startRad - (arc.direction * Math.PI) / 2;
    const labelX = vertex[0] + Math.cos(labelRad) * (radius + 26 * scale);
    const labelY = vertex[1] + Math.sin(labelRad) * (radius + 26 * scale);
    const text = `${Math.round(data.angleDeg)}°${data.targetDeg !== null ? ` / ${Math.round(data.targetDeg)}°` : ""}`;
    ctx.font = `600 ${Math.round(14 * scale)}px system-ui, sans-serif`;
    ctx.textAlign = "center";
    ctx.textBaseline = "middle";
    const width = ctx.measureText(text).width + 10 * scale;
    const height = 20 * scale;
    ctx.fillStyle = "rgba(255,255,255,0.88)";
    ctx.fillRect(labelX - width / 2, labelY - height / 2, width, height);
    ctx.fillStyle = COLORS.label;
    ctx.fillText(text, labelX, labelY);
  }
  ctx.restore();
}
