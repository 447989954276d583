import { z } from "zod";
import { CONDITIONS, DIGITS, MOTIONS, MOTION_IDS, SIDES, digitAllowed, isOneFingerMotion } from "@/lib/motions/catalog";

// Capture file, format version 1: the one format for recorded attempts (browser recorder, uploads, fixtures, CLI).
// Landmarks are the tracker's world coordinates in metres, camera axes: x right, y down, z away from the camera, as
// seen in an unmirrored image (a mirrored selfie preview must be flipped back, x -> -x, before saving).

export const CAPTURE_FORMAT = "kinarc.capture";
export const CAPTURE_VERSION = 1;

const coordinate = z.number({ error: "expected a finite number" });
const point = z.tuple([coordinate, coordinate, coordinate], { error: "expected [x, y, z]" });

function nonZero(v: readonly number[]): boolean {
  return Math.hypot(v[0], v[1], v[2]) > 1e-9;
}

export const captureFrameSchema = z.object({
  t: z.number({ error: "expected milliseconds since the capture started" }).min(0, { error: "expected milliseconds >= 0" }),
  score: z.number({ error: "expected a tracker score from 0 to 1" }).min(0, { error: "expected a score from 0 to 1" }).max(1, { error: "expected a score from 0 to 1" }),
  hand: z.array(point, { error: "expected 21 landmarks [x, y, z] or null" }).length(21, { error: "expected 21 landmarks [x, y, z]" }).nullable(),
  forearm: point.refine(nonZero, { error: "expected a non-zero elbow-to-wrist direction" }).optional(),
  /**
   * Optional: the same 21 landmarks in the picture, [x, y] as 0-1 of its width and height (unmirrored), for drawing
   * the hand over a stored clip when it is reviewed, and (with the file's `imageAspect`) for the finger estimator's
   * picture features (vision/estimator.ts PICTURE_FEATURES).
   */
  image: z
    .array(z.tuple([coordinate, coordinate], { error: "expected [x, y]" }), { error: "expected 21 image points [x, y] or null" })
    .length(21, { error: "expected 21 image points [x, y]" })
    .nullable()
    .optional(),
});

/** The picture width/height ratios a capture may state (exclusive): wider or taller than any camera or clip. */
export const IMAGE_ASPECT_RANGE = [0.1, 10] as const;

export const captureSchema = z
  .object({
    format: z.literal(CAPTURE_FORMAT, { error: `expected "${CAPTURE_FORMAT}"` }),
    version: z.literal(CAPTURE_VERSION, { error: `expected version ${CAPTURE_VERSION}` }),
    motion: z.enum(MOTION_IDS, { error: `expected one of ${MOTION_IDS.join(", ")}` }),
    side: z.enum(SIDES, { error: 'expected "left" or "right"' }),
    digit: z.enum(DIGITS, { error: `expected one of ${DIGITS.join(", ")} or null` }).nullable(),
    condition: z.enum(CONDITIONS, { error: 'expected "against_gravity" or "gravity_minimized"' }),
    gravity: point.refine(nonZero, { error: "expected a non-zero gravity direction" }).optional(),
    /**
     * Optional: the tested finger bent on its own, the other three held straight (the engine reads it with the
     * single-finger validation error, vision/pipeline.ts). Only for a finger's MCP, PIP or DIP motion.
     */
    oneFinger: z.boolean({ error: "expected true or false" }).optional(),
    passiveRangeDeg: z
      .number({ error: "expected degrees" })
      .gt(0, { error: "expected degrees above 0" })
      .max(180, { error: "expected degrees up to 180" })
      .optional(),
    /** Optional: the picture's width over its height, which the frames' `image` points are fractions of. */
    imageAspect: z.number({ error: "expected the picture's width over its height" }).gt(IMAGE_ASPECT_RANGE[0], { error: `expected a width/height ratio above ${IMAGE_ASPECT_RANGE[0]}` }).lt(IMAGE_ASPECT_RANGE[1], { error: `expected a width/height ratio below ${IMAGE_ASPECT_RANGE[1]}` }).optional(),
    frames: z.array(captureFrameSchema, { error: "expected an array of frames" }).min(1, { error: "expected at least one frame" }),
    /**
     * Optional (older files have none): frames of a neutral reading taken just before the attempt, wrist straight and
     * forearm resting still, times from 0. For wrist motions the engine takes the forearm line from them
     * (vision/wrist-axis.ts) when the frames carry none of their own.
     */
    neutral: z
      .object({ frames: z.array(captureFrameSchema, { error: "expected an array of frames" }).min(1, { error: "expected at least one frame" }) }, { error: "expected { frames: [...] }" })
      .optional(),
    /**
     * Optional: the same clip tracked a second time with the full hand model (`frames` are the lite model's), the
     * same frames at the same times. The engine then reads both together (vision/model-pair.ts analyzeCapturePair).
     */
    fullModel: z
      .object({ frames: z.array(captureFrameSchema, { error: "expected an array of frames" }).min(1, { error: "expected at least one frame" }) }, { error: "expected { frames: [...] }" })
      .optional(),
  })
  .superRefine((capture, ctx) => {
    if (!digitAllowed(capture.motion, capture.digit)) {
      const def = MOTIONS[capture.motion];
      ctx.addIssue({
        code: "custom",
        path: ["digit"],
        message: def.joint === "wrist" ? `expected null for ${capture.motion}` : `expected one of ${def.digits.join(", ")} for ${capture.motion}`,
      });
    }
    if (capture.oneFinger && !isOneFingerMotion(capture.motion, capture.digit)) {
      ctx.addIssue({ code: "custom", path: ["oneFinger"], message: "expected true only for a finger's (not the thumb's) MCP, PIP or DIP motion" });
    }
    const second = capture.fullModel?.frames;
    if (second && second.length !== capture.frames.length) {
      ctx.addIssue({ code: "custom", path: ["fullModel", "frames"], message: `expected the same ${capture.frames.length} frames as frames, got ${second.length}` });
    } else if (second) {
      const i = second.findIndex((frame, k) => frame.t !== capture.frames[k].t);
      if (i >= 0) ctx.addIssue({ code: "custom", path: ["fullModel", "frames", i, "t"], message: `expected the time of frames[${i}] (${capture.frames[i].t})` });
    }
    for (let i = 1; i < capture.frames.length; i++) {
      if (capture.frames[i].t < capture.frames[i - 1].t) {
        ctx.addIssue({ code: "custom", path: ["frames", i, "t"], message: `expected time not earlier than the previous frame (${capture.frames[i - 1].t})` });
        break;
      }
    }
  });

export type CaptureFile = z.infer<typeof captureSchema>;
export type CaptureFrame = z.infer<typeof captureFrameSchema>;
