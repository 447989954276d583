/**
 * Turns the tasks library's landmarker results into Kinarc's frame record. Pure: runs in the worker, on the main
 * thread and in unit tests.
 */
import type { HandSide, LandmarkXYZ, TrackedFrame } from "./types";

export interface PointLike {
  x: number;
  y: number;
  z: number;
  visibility?: number;
}

export interface CategoryLike {
  categoryName: string;
  score: number;
}

export interface HandResultLike {
  landmarks: PointLike[][];
  worldLandmarks: PointLike[][];
  handedness: CategoryLike[][];
}

export interface PoseResultLike {
  landmarks: PointLike[][];
  worldLandmarks: PointLike[][];
}

// BlazePose 33-point topology (MediaPipe Pose model card): 13/14 elbows, 15/16 wrists.
const POSE_ELBOWS = [13, 14] as const;
const POSE_WRISTS = [15, 16] as const;
// Below this the pose model itself marks a landmark as likely out of view or hidden [common practice: MediaPipe's
// own drawing utilities skip landmarks under 0.5 visibility].
const MIN_ELBOW_VISIBILITY = 0.5;

/**
 * The person's side from the hand landmarker's label. @mediapipe/tasks-vision 0.10.35 labels the hand as it is
 * in an unmirrored image (checked on Debian gcompris-qt-data's photos labelled left/right, every photo, palm and
 * back, open and fist; the library's maintainers describe the same change from the older solution, which assumed a
 * mirrored selfie image: google-ai-edge/mediapipe-samples#450). Camera and file frames reach the landmarker
 * unmirrored (a selfie preview is mirrored only on screen), so the label stands; frames flipped before detection
 * name the other hand.
 */
export function correctHandedness(label: string, inputMirrored: boolean): HandSide | null {
  const side = label.toLowerCase();
  if (side !== "left" && side !== "right") return null;
  if (!inputMirrored) return side;
  return side === "left" ? "right" : "left";
}

const toXYZ = (p: PointLike): LandmarkXYZ => [p.x, p.y, p.z];

export function handFrame(t: number, result: HandResultLike, inputMirrored: boolean): TrackedFrame {
  const world = result.worldLandmarks[0];
  const image = result.landmarks[0];
  const category = result.handedness[0]?.[0];
  if (!world || !image || world.length !== 21 || image.length !== 21) {
    return { t, score: 0, handedness: null, hand: null, image: null };
  }
  return {
    t,
    score: category?.score ?? 0,
    handedness: category ? correctHandedness(category.categoryName, inputMirrored) : null,
    hand: world.map(toXYZ),
    image: image.map(toXYZ),
  };
}

/**
 * Elbow-to-wrist unit vector of the arm whose pose wrist lies nearest the hand's wrist in the image. Choosing by
 * image position avoids depending on the pose model's left/right naming convention, and it picks the arm the hand
 * belongs to even when both arms are in view. Null when that elbow is not visible.
 */
export function forearmDirection(pose: PoseResultLike, handWristImage: LandmarkXYZ | null): LandmarkXYZ | null {
  const image = pose.landmarks[0];
  const world = pose.worldLandmarks[0];
  if (!image || !world || image.length < 17 || world.length < 17) return null;
  let arm = 0;
  if (handWristImage) {
    const distance = (i: number) => Math.hypot(image[POSE_WRISTS[i]].x - handWristImage[0], image[POSE_WRISTS[i]].y - handWristImage[1]);
    arm = distance(1) < distance(0) ? 1 : 0;
  } else {
    arm = (image[POSE_ELBOWS[1]].visibility ?? 0) > (image[POSE_ELBOWS[0]].visibility ?? 0) ? 1 : 0;
  }
  const elbowImage = image[POSE_ELBOWS[arm]];
  const inImage = elbowImage.x >= 0 && elbowImage.x <= 1 && elbowImage.y >= 0 && elbowImage.y <= 1;
  if (!inImage || (elbowImage.visibility ?? 0) < MIN_ELBOW_VISIBILITY) return null;
  const elbow = world[POSE_ELBOWS[arm]];
  const wrist = world[POSE_WRISTS[arm]];
  const d: LandmarkXYZ = [wrist.x - elbow.x, wrist.y - elbow.y, wrist.z - elbow.z];
  const length = Math.hypot(d[0], d[1], d[2]);
  if (!(length > 0)) return null;
  return [d[0] / length, d[1] / length, d[2] / length];
}
