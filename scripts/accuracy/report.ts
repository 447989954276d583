import type { Vec3 } from "@/vision/vec";
import { hasGroupFit } from "@/vision/correction";
import type { FingerPicture } from "@/vision/estimator";
import { applyCorrection, type CorrectionModel } from "./correction";
import { estimateAngles, type AngleEstimate } from "./estimates";
import { getPoseAngle, type PoseKey } from "./hand-pose";
import { JOINT_GROUPS, type JointGroup } from "./joint-groups";
import { CAMERA_VIEWS, IMAGE_HEIGHT_PX, IMAGE_WIDTH_PX, type CameraView, type FrameTruth } from "./scene";
import { summarizeErrors, type ErrorSummary } from "./stats";

export type AngleMethod = "3-D" | "image plane" | "corrected";

/** One still as a tracker saw it. `hand` is null when no hand was found. */
export interface TrackedStill {
  truth: FrameTruth;
  /** The motion a motion-set still shows (scripts/accuracy/motion-sets.ts). */
  motion?: string;
  /** The joints that move in a single-finger still: only these are scored. */
  movingKeys?: PoseKey[];
  /** The named whole-hand shape of a hand-shape still (motion-sets.ts handShapeFrame). */
  shape?: string;
  model: string;
  hand: Vec3[] | null;
  /** The same landmarks in the image: x, y in 0-1 of width and height. Absent in sets saved before it was kept. */
  image?: Vec3[] | null;
  score: number;
}

export interface AccuracyRow {
  joint: string;
  view: CameraView;
  model: string;
  method: AngleMethod;
  summary: ErrorSummary;
  /** Mean error of the engine on the exact landmarks: the part of the bias owed to the rig's landmark convention. */
  perfectTrackerBiasDeg: number | null;
}

function scoredKeys(still: TrackedStill, group: JointGroup): readonly PoseKey[] {
  return still.movingKeys ? group.keys.filter((key) => still.movingKeys!.includes(key)) : group.keys;
}

function pick(
  estimate: AngleEstimate | null | undefined,
  method: AngleMethod,
  correct: (estimate: AngleEstimate) => number | null,
): number | null {
  if (!estimate) return null;
  if (method === "corrected") return correct(estimate);
  return method === "3-D" ? estimate.deg : estimate.imagePlaneDeg;
}

/**
 * Rows per joint group, view, model and method ("corrected" too when a correction is given). The forearm line given
 * to the engine for wrist angles is the render's true one, so wrist rows measure the hand's landmarks only.
 */
/** A rendered still's tracked picture points (the renders are IMAGE_WIDTH_PX x IMAGE_HEIGHT_PX), or null when not kept. */
export function stillPicture(still: Pick<TrackedStill, "image">): FingerPicture | null {
  return still.image ? { image: still.image, aspect: IMAGE_WIDTH_PX / IMAGE_HEIGHT_PX } : null;
}

/** The render's exact picture points as the tracker reports them: fractions of the picture's width and height. */
function truthPicture(truth: FrameTruth): FingerPicture {
  return { image: truth.landmarksImagePx.map(([x, y]) => [x / IMAGE_WIDTH_PX, y / IMAGE_HEIGHT_PX]), aspect: IMAGE_WIDTH_PX / IMAGE_HEIGHT_PX };
}

export function accuracyRows(
  stills: readonly TrackedStill[],
  correction: CorrectionModel | null = null,
  groups: readonly JointGroup[] = JOINT_GROUPS,
): AccuracyRow[] {
  const models = [...new Set(stills.map((s) => s.model))];
  const estimated = stills.map((still) => ({
    still,
    tracked: still.hand ? estimateAngles(still.hand, still.truth.side, still.truth.forearmCameraDir, stillPicture(still)) : null,
    perfect: estimateAngles(still.truth.landmarksCameraM, still.truth.side, still.truth.forearmCameraDir, truthPicture(still.truth)),
  }));
  const rows: AccuracyRow[] = [];
  const methods: AngleMethod[] = correction ? ["3-D", "image plane", "corrected"] : ["3-D", "image plane"];
  for (const method of methods) {
    for (const group of groups) {
      for (const view of CAMERA_VIEWS) {
        for (const model of models) {
          const inCell = estimated.filter((e) => e.still.model === model && e.still.truth.view === view);
          if (inCell.length === 0) continue;
          // As the engine does: where the correction has a fit but declines a frame (the finger estimator outside its
          // training domain), the raw 3-D angle stands.
          const corrector = (key: PoseKey) => (estimate: AngleEstimate) =>
            correction ? (applyCorrection(correction, model, key, estimate) ?? (hasGroupFit(correction, model, group.label) ? estimate.deg : null)) : null;
          const samples = inCell.flatMap((e) =>
            scoredKeys(e.still, group).map((key) => ({
              truthDeg: getPoseAngle(e.still.truth.commandedDeg, key),
              estimateDeg: e.tracked ? pick(e.tracked[key], method, corrector(key)) : null,
            })),
          );
          // A perfect tracker has no corrected reading of its own (the correction is fitted to a real one).
          const perfect = summarizeErrors(
            method === "corrected"
              ? []
              : inCell.flatMap((e) =>
                  scoredKeys(e.still, group).map((key) => ({
                    truthDeg: getPoseAngle(e.still.truth.commandedDeg, key),
                    estimateDeg: pick(e.perfect[key], method, corrector(key)),
                  })),
                ),
          );
          rows.push({ joint: group.label, view, model, method, summary: summarizeErrors(samples), perfectTrackerBiasDeg: perfect.biasDeg });
        }
      }
    }
  }
  return rows;
}

function fixed(value: number | null, digits = 1): string {
  return value === null ? "-" : value.toFixed(digits);
}

function percent(value: number | null): string {
  return value === null ? "-" : `${Math.round(value * 100)}%`;
}

/** A Markdown table per angle method. */
export function accuracyMarkdown(rows: readonly AccuracyRow[]): string {
  const sections: string[] = [];
  for (const method of [...new Set(rows.map((row) => row.method))]) {
    const lines = [
      method === "corrected" ? "### After correction" : `### Raw landmarks, ${method} angles`,
      "",
      "| joint | view | model | samples | detected | bias ° | MAE ° | slope | within 5° | within 10° | perfect-tracker bias ° |",
      "| --- | --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |",
    ];
    for (const row of rows.filter((r) => r.method === method)) {
      const s = row.summary;
      lines.push(
        `| ${row.joint} | ${row.view} | ${row.model} | ${s.samples} | ${percent(s.detectionRate)} | ${fixed(s.biasDeg)} | ` +
          `${fixed(s.meanAbsoluteErrorDeg)} | ${fixed(s.slope, 2)} | ${percent(s.within5)} | ${percent(s.within10)} | ${fixed(row.perfectTrackerBiasDeg)} |`,
      );
    }
    sections.push(lines.join("\n"));
  }
  return sections.join("\n\n");
}

/**
 * The tracked frame that stands for each still of a stills clip: still i covers media time [i*holdMs, (i+1)*holdMs).
 * The first video frame of a still is skipped when later ones were processed, because a tracker that follows the
 * hand between frames may still be looking where the previous still's hand was. Among the rest, the last with a
 * hand is taken.
 */
export function framesForStills<F extends { t: number; hand: unknown | null }>(
  frames: readonly F[],
  stillCount: number,
  holdMs: number,
  fps: number,
): (F | null)[] {
  const framePeriodMs = 1000 / fps;
  return Array.from({ length: stillCount }, (_, still) => {
    const start = still * holdMs;
    const inWindow = frames.filter((f) => f.t >= start - 0.5 && f.t < start + holdMs - 0.5);
    const settled = inWindow.filter((f) => f.t >= start + framePeriodMs - 0.5);
    const candidates = settled.length ? settled : inWindow;
    const withHand = candidates.filter((f) => f.hand !== null);
    return withHand.length ? withHand[withHand.length - 1] : null;
  });
}
