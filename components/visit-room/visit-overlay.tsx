"use client";

import { HandOverlay } from "@/components/tracking/hand-overlay";
import { getReferenceEndRange, type Digit, type MotionId } from "@/lib/motions/catalog";
import type { TelemetryFrame } from "@/lib/visits/telemetry";

/**
 * The therapist's overlay: the same drawing as the client's own view, fed by telemetry instead of a camera. The
 * client's landmarks are in their unmirrored camera picture, and the therapist sees that picture unmirrored.
 */
export function VisitOverlay({ frame, motion, digit, videoWidth, videoHeight }: { frame: TelemetryFrame | null; motion: MotionId | null; digit: Digit | null; videoWidth: number; videoHeight: number }) {
  if (!frame || !motion || !videoWidth) return null;
  return (
    <HandOverlay
      image={frame.image}
      videoWidth={videoWidth}
      videoHeight={videoHeight}
      fit="contain"
      mirrored={false}
      motion={motion}
      digit={digit}
      angleDeg={frame.angleDeg}
      targetDeg={getReferenceEndRange(motion, digit)?.endRangeDeg ?? null}
      faded={frame.quality !== "ok"}
    />
  );
}
