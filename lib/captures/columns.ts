import type { CaptureAnalysis } from "@/vision/analyze-capture";

/** The attempt columns the engine's analysis fills: every stored number comes from here, never from the browser. */
export function measuredColumns(analysis: CaptureAnalysis, engineVersion: string) {
  return {
    motion: analysis.motion,
    side: analysis.side,
    digit: analysis.digit,
    condition: analysis.condition,
    frames: analysis.frames,
    usableFrames: analysis.usableFrames,
    reps: analysis.reps,
    startDeg: analysis.startDeg,
    peakDeg: analysis.peakDeg,
    arcDeg: analysis.arcDeg,
    uncertaintyDeg: analysis.uncertaintyDeg ?? null,
    planeVerdict: analysis.plane?.verdict ?? "unclear",
    axisToGravityDeg: analysis.plane?.axisToGravityDeg ?? null,
    planeVerified: analysis.planeAgrees,
    method: analysis.method,
    cameraView: analysis.view,
    viewQuality: analysis.viewQuality,
    forearmSource: analysis.forearmSource,
    oneFinger: analysis.oneFinger,
    engineVersion,
    correctionVersion: analysis.correctionVersion,
    warnings: analysis.warnings,
  };
}
