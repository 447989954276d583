import { MOTIONS, type Condition, type Digit, type MotionId, type Side } from "@/lib/motions/catalog";
import { createLivePipeline, type LiveUpdate, type LivePipelineOptions, type MeasurementMethod, type PipelineFrame } from "./pipeline";
import type { PlaneReading } from "./plane";
import { median, type Repetition } from "./reps";
import type { ValidationView } from "./uncertainty";
import type { Vec3 } from "./vec";
import { handSpan, handSpanBand, type ViewQuality } from "./view-policy";
import { neutralReading, type ForearmSource, type NeutralFrame, type NeutralReading } from "./wrist-axis";

/** What the analyzer needs from a capture; the parsed capture file (lib/capture) has this shape. */
export interface CaptureInput {
  motion: MotionId;
  side: Side;
  digit: Digit | null;
  condition: Condition;
  gravity?: Vec3 | null;
  frames: readonly PipelineFrame[];
  /** The picture's width over its height, when the frames carry picture points (`image`). */
  imageAspect?: number;
  /** The tested finger bent on its own, the others held straight (LivePipelineOptions.oneFinger). */
  oneFinger?: boolean;
  /** Frames of a neutral reading taken before the attempt (wrist straight, forearm resting still), when one was. */
  neutral?: { frames: readonly NeutralFrame[] } | null;
}

export interface TrackingLimits {
  /** Fewer usable frames than this share marks the capture's tracking as poor. */
  minUsableFraction: number;
  /** A mean tracker score below this marks it poor too. */
  minMeanScore: number;
}

// A quarter of frames lost, or a mean score under 0.7, is where angles start to come from too few frames to trust
// the hold plateau [common practice for hand-tracking confidence gating; tune with field data].
export const DEFAULT_TRACKING_LIMITS: TrackingLimits = { minUsableFraction: 0.75, minMeanScore: 0.7 };

export interface CaptureAnalysis {
  motion: MotionId;
  side: Side;
  digit: Digit | null;
  condition: Condition;
  /** Read as one finger tested on its own (wider uncertainty, a warning). */
  oneFinger: boolean;
  frames: number;
  usableFrames: number;
  meanScore: number;
  reps: number;
  repetitions: Repetition[];
  /** Start, peak and arc of the best repetition (by the motion's graded measure); null when no repetition was found. */
  startDeg: number | null;
  peakDeg: number | null;
  arcDeg: number | null;
  plane: PlaneReading | null;
  /** Whether the plane check agrees with the condition the capture declares. */
  planeAgrees: boolean;
  trackingOk: boolean;
  method: MeasurementMethod;
  /** 90% interval half-width (degrees) of startDeg, peakDeg and each repetition's angles (vision/uncertainty.ts). */
  uncertaintyDeg: number | null;
  /** The camera view most usable frames saw, null when none held a majority. */
  view: ValidationView | null;
  /** How that view serves the motion and test position (vision/view-policy.ts); `poor` and `usable` add a warning. */
  viewQuality: ViewQuality | null;
  recommendedViews: readonly ValidationView[];
  /** Wrist motions: where the forearm line came from in most usable frames; null for finger motions. */
  forearmSource: ForearmSource | null;
  /** The neutral reading the engine took from the capture's neutral frames, null when there were none or it was refused. */
  neutral: Pick<NeutralReading, "usableFrames" | "frames" | "durationMs" | "spreadDeg" | "view"> | null;
  correctionVersion: string | null;
  warnings: string[];
}

export type AnalyzeOptions = Omit<LivePipelineOptions, "motion" | "side" | "digit" | "condition" | "gravity" | "neutral"> & {
  tracking?: Partial<TrackingLimits>;
  /** Sees each frame's reading in order (the accuracy tools compare them with the truth frame by frame). */
  onUpdate?: (update: LiveUpdate, frameIndex: number) => void;
};

/** How long at the start of a capture its framing is judged over: the still start before the motion, milliseconds. */
export const START_FRAMING_MS = 1000;

/**
 * The hand's span at the start of a capture (vision/view-policy.ts handSpan): the median over the frames with
 * picture points in its first `START_FRAMING_MS`, or null when no frame has them. What the set-up check would have
 * measured before a live attempt started.
 */
export function startHandSpan(capture: Pick<CaptureInput, "frames" | "imageAspect">): number | null {
  const withImage = capture.frames.filter((frame) => frame.image && frame.image.length === 21);
  if (withImage.length === 0) return null;
  return median(
    withImage
      .filter((frame) => frame.t - withImage[0].t <= START_FRAMING_MS)
      .map((frame) => handSpan(frame.image!, frame.imageAspect ?? capture.imageAspect ?? 4 / 3, 1)),
  );
}

/**
 * A warning when the capture started with the hand outside the span the set-up check asks for this motion from the
 * thumb side (an upload, which no set-up check held), else null.
 */
export function framingWarning(capture: Pick<CaptureInput, "frames" | "imageAspect" | "motion" | "condition" | "digit">): string | null {
  const span = startHandSpan(capture);
  if (span === null) return null;
  const band = handSpanBand(capture.motion, capture.condition, capture.digit);
  if (band.max === Infinity) return null;
  const pct = (x: number) => `${Math.round(x * 100)}%`;
  if (span > band.max) {
    return `the hand filled ${pct(span)} of the picture at the start, more than the ${pct(band.max)} the set-up check allows from this side: in Kinarc's rendered test clips hands framed that close were lost more often; readings may be less sure`;
  }
  if (span < band.min) {
    const why =
      MOTIONS[capture.motion].joint === "wrist"
        ? "the landmarks' pixel jitter then weighs more"
        : "in Kinarc's rendered test clips hands framed that far read the fingertip joints less surely";
    return `the hand filled ${pct(span)} of the picture at the start, less than the ${pct(band.min)} the set-up check asks from this side: ${why}`;
  }
  return null;
}

/** A warning when the test plane the capture was read in is not the one it declares, else null. */
export function planeWarning(condition: Condition, plane: PlaneReading | null): string | null {
  if (!plane || plane.verdict === condition) return null;
  return `declared ${condition} but the test plane reads ${plane.verdict} (axis ${plane.axisToGravityDeg.toFixed(0)} deg from gravity)`;
}

/** The best repetition is the one that went furthest by the measure the motion is graded on. */
export function bestRepetition(motion: MotionId, repetitions: readonly Repetition[]): Repetition | null {
  const measure = MOTIONS[motion].gradedOn === "arc" ? (r: Repetition) => r.arcDeg : (r: Repetition) => r.peakDeg;
  let best: Repetition | null = null;
  for (const rep of repetitions) if (!best || measure(rep) > measure(best)) best = rep;
  return best;
}

/** Runs a whole capture through the same pipeline the live view uses, then sums it up. */
export function analyzeCapture(capture: CaptureInput, { onUpdate, ...options }: AnalyzeOptions = {}): CaptureAnalysis {
  // The neutral reading is taken again here from its frames, so the server reads the same forearm line the browser did.
  const neutral = capture.neutral?.frames.length ? neutralReading(capture.neutral.frames, capture.side) : null;
  const isWrist = MOTIONS[capture.motion].joint === "wrist";
  const pipeline = createLivePipeline({
    neutral: neutral?.ok && isWrist ? neutral.reading : null,
    ...options,
    motion: capture.motion,
    side: capture.side,
    digit: capture.digit,
    condition: capture.condition,
    oneFinger: capture.oneFinger === true,
    gravity: capture.gravity ?? null,
    imageAspect: capture.imageAspect ?? null,
  });
  capture.frames.forEach((frame, index) => {
    const update = pipeline.push(frame);
    onUpdate?.(update, index);
  });
  const summary = pipeline.summary();
  const limits = { ...DEFAULT_TRACKING_LIMITS, ...options.tracking };

  const best = bestRepetition(capture.motion, summary.repetitions);

  const warnings = [...summary.warnings];
  if (neutral && !neutral.ok && isWrist) warnings.push(`neutral reading not used: ${neutral.problem}`);
  const framing = framingWarning(capture);
  if (framing) warnings.push(framing);
  const planeAgrees = summary.plane?.verdict === capture.condition;
  const plane = planeWarning(capture.condition, summary.plane);
  if (plane) warnings.push(plane);
  const usableFraction = summary.frames ? summary.usableFrames / summary.frames : 0;
  const trackingOk = usableFraction >= limits.minUsableFraction && summary.meanScore >= limits.minMeanScore;

  return {
    motion: capture.motion,
    side: capture.side,
    digit: capture.digit,
    condition: capture.condition,
    oneFinger: summary.oneFinger,
    frames: summary.frames,
    usableFrames: summary.usableFrames,
    meanScore: summary.meanScore,
    reps: summary.repetitions.length,
    repetitions: summary.repetitions,
    startDeg: best ? best.startDeg : null,
    peakDeg: best ? best.peakDeg : null,
    arcDeg: best ? best.arcDeg : null,
    plane: summary.plane,
    planeAgrees,
    trackingOk,
    method: summary.method,
    uncertaintyDeg: summary.uncertaintyDeg,
    view: summary.view,
    viewQuality: summary.viewQuality,
    recommendedViews: summary.recommendedViews,
    forearmSource: summary.forearmSource,
    neutral:
      neutral?.ok && isWrist
        ? { usableFrames: neutral.reading.usableFrames, frames: neutral.reading.frames, durationMs: neutral.reading.durationMs, spreadDeg: neutral.reading.spreadDeg, view: neutral.reading.view }
        : null,
    correctionVersion: summary.correctionVersion,
    warnings,
  };
}
