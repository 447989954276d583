/** Types of the live tracking stream shared by the page, the worker and the consumers (engine, overlay, tests). */

export type LandmarkXYZ = [number, number, number];

/** The person's anatomical side, already corrected for the camera image not being a mirror. */
export type HandSide = "left" | "right";

/** One processed camera frame. `hand`/`image` are null when no hand was found. */
export interface TrackedFrame {
  /** Milliseconds since the capture started: the clip's media time, or for a camera the time since `start()`. */
  t: number;
  /** Confidence of the handedness classification, 0-1; 0 when no hand was found. */
  score: number;
  handedness: HandSide | null;
  /** 21 hand landmarks in metres, origin near the hand's centre, camera axes (x right, y down, z away). */
  hand: LandmarkXYZ[] | null;
  /** The same 21 landmarks in the image: x, y in 0-1 of width and height (unmirrored), z relative depth. */
  image: LandmarkXYZ[] | null;
  /** Unit vector from elbow to wrist in the pose model's world axes, when the elbow was seen recently. */
  forearm?: LandmarkXYZ;
  /** The picture's width over its height (what `image` x and y are fractions of), when the video reported its size. */
  imageAspect?: number;
  /**
   * The same picture read by the full hand model too, at the same `t`, when the tracker was asked to pair
   * (`HandTracker.setPaired`); a capture then keeps both models' frames (vision/model-pair.ts).
   */
  fullModel?: TrackedFrame;
}

/** Per-frame cost, kept apart from the frame stream so benchmarks and the UI can read it without touching results. */
export interface FrameTiming {
  t: number;
  /** Time inside the hand landmarker. */
  landmarksMs: number;
  /** Time inside the pose landmarker on frames where it ran. */
  poseMs: number | null;
  /** Time inside the second (full) hand landmarker on frames it read. */
  pairMs: number | null;
  /** From grabbing the frame to the result reaching the page (includes transfer to and from the worker). */
  roundTripMs: number;
}

export type ModelVariant = "lite" | "full";

export interface TrackerOptions {
  /** Hand model: the lighter one keeps a steady frame rate on laptops and phones. Default "lite". */
  handModel?: ModelVariant;
  /** Run the pose landmarker for the forearm direction (wrist motions). Default false. */
  forearm?: boolean;
  poseModel?: ModelVariant;
  /** Pose is slower than hands and the forearm moves little between frames: run it at most this often. Default 200. */
  poseIntervalMs?: number;
  /** Prefix of `/models` and `/mediapipe/wasm`; default the page's origin. */
  assetBaseUrl?: string;
  /** True when frames are flipped left-right before detection (never so for raw camera or file frames; a selfie preview is mirrored only on screen). */
  inputMirrored?: boolean;
  /** Upper bound of processed frames per second. Default 30. */
  maxFps?: number;
  /** "auto" tries a worker and falls back to the main thread; the others force one. Default "auto". */
  thread?: "auto" | "worker" | "main";
  /**
   * The hand landmarker's three confidence floors (palm detection, hand presence, tracking), each in (0, 1).
   * Default: the library's own (0.5 each).
   */
  minConfidence?: number;
}

export interface TrackerStats {
  thread: "worker" | "main";
  processedFrames: number;
  skippedFrames: number;
  framesWithHand: number;
  /** Milliseconds from `start()` to the first frame with a hand, null until then. */
  firstHandAfterMs: number | null;
  /** Current minimum spacing between processed frames, set by the frame governor. */
  frameIntervalMs: number;
}
