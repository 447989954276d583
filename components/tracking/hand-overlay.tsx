"use client";

import { useEffect, useRef, useState } from "react";
import { drawHandOverlay, type OverlayData } from "./draw-overlay";

/**
 * A canvas laid exactly over a video (place both in one `relative` box): draws the hand and the tested joint's angle
 * from data, so it serves the camera's own view and a remote client's telemetry alike. `fit` must match the video's
 * CSS object-fit, and `mirrored` its mirroring.
 */
export function HandOverlay({ className = "", ...data }: OverlayData & { className?: string }) {
  const canvasRef = useRef<HTMLCanvasElement>(null);
  const [box, setBox] = useState({ width: 0, height: 0, ratio: 1 });

  useEffect(() => {
    const canvas = canvasRef.current;
    if (!canvas) return;
    const observer = new ResizeObserver(([entry]) => {
      const { width, height } = entry.contentRect;
      setBox({ width, height, ratio: window.devicePixelRatio || 1 });
    });
    observer.observe(canvas);
    return () => observer.disconnect();
  }, []);

  useEffect(() => {
    const canvas = canvasRef.current;
    const ctx = canvas?.getContext("2d");
    if (!canvas || !ctx || box.width === 0) return;
    const pixelWidth = Math.round(box.width * box.ratio);
    const pixelHeight = Math.round(box.height * box.ratio);
    if (canvas.width !== pixelWidth || canvas.height !== pixelHeight) {
      canvas.width = pixelWidth;
      canvas.height = pixelHeight;
    }
    ctx.setTransform(box.ratio, 0, 0, box.ratio, 0, 0);
    drawHandOverlay(ctx, box.width, box.height, data);
  });

  return <canvas ref={canvasRef} aria-hidden="true" data-testid="hand-overlay" className={`pointer-events-none absolute inset-0 h-full w-full ${className}`} />;
}
