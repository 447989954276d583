/**
 * What goes into each model bundle, and the checksums of the registry files it is made from.
 * Source: the notes in shared/notes/hand-models.md (file locations, normalisation values from the older packages'
 * own graphs), checked against @mediapipe/hands 0.4.1675469240 and @mediapipe/pose 0.5.1675469404.
 */

export interface SourceFile {
  packageName: "@mediapipe/hands" | "@mediapipe/pose";
  file: string;
  sha256: string;
}

export const SOURCE_FILES = {
  handLandmarkLite: {
    packageName: "@mediapipe/hands",
    file: "hand_landmark_lite.tflite",
    sha256: "d7fde8ac11f8ce03f8663775bfc323f4fc9f2a38062b4f4efa142874ef5b2a48",
  },
  handLandmarkFull: {
    packageName: "@mediapipe/hands",
    file: "hand_landmark_full.tflite",
    sha256: "8c026882c9ec059ce0f8e75266bee5a9a23c341a40e0000df755374d3d1b9b68",
  },
  handsPackedAssets: {
    packageName: "@mediapipe/hands",
    file: "hands_solution_packed_assets.data",
    sha256: "bdce7b66bfc5b39ba86a47775c98e0b186fe73f8308c2279f852af4c89ffdf42",
  },
  handsPackedListing: {
    packageName: "@mediapipe/hands",
    file: "hands_solution_packed_assets_loader.js",
    sha256: "d05c073a62a0c8d2d21c18bc8f158424ece0078ea00a636e9527083b10ca1e17",
  },
  poseLandmarkLite: {
    packageName: "@mediapipe/pose",
    file: "pose_landmark_lite.tflite",
    sha256: "f17bfbecadb61c3be1baa8b8d851cc6619c870a87167b32848ad20db306b9d61",
  },
  poseLandmarkFull: {
    packageName: "@mediapipe/pose",
    file: "pose_landmark_full.tflite",
    sha256: "e9a5c5cb17f736fafd4c2ec1da3b3d331d6edbe8a0d32395855aeb2cdfd64b9f",
  },
  posePackedAssets: {
    packageName: "@mediapipe/pose",
    file: "pose_solution_packed_assets.data",
    sha256: "a63c614bef30d35947f13be361820b1e4e3bec9cfeebf4d11216a18373108e85",
  },
  posePackedListing: {
    packageName: "@mediapipe/pose",
    file: "pose_solution_packed_assets_loader.js",
    sha256: "d7aa29b7d8e11b5c97a58d719e982dd15c2de72995d95112d60492b854840a36",
  },
} as const satisfies Record<string, SourceFile>;

export type SourceId = keyof typeof SOURCE_FILES;

/** A model file: either a whole source file or one file listed inside a packed-assets blob. */
export type ModelSource =
  | { source: SourceId }
  | { packed: SourceId; listing: SourceId; filename: string };

export interface BundleEntry {
  /** Entry name the tasks library expects inside the bundle. */
  name: string;
  from: ModelSource;
  /** The model's input is (pixel - mean) / std. */
  mean: number;
  std: number;
}

export interface BundleRecipe {
  file: string;
  entries: BundleEntry[];
}

// Palm detector, hand landmarks and pose landmarks take pixels scaled to [0, 1]; the pose detector takes [-1, 1].
const UNIT_RANGE = { mean: 0, std: 255 };
const SIGNED_RANGE = { mean: 127.5, std: 127.5 };

const palmDetector = (filename: string): BundleEntry => ({
  name: "hand_detector.tflite",
  from: { packed: "handsPackedAssets", listing: "handsPackedListing", filename },
  ...UNIT_RANGE,
});
const poseDetector: BundleEntry = {
  name: "pose_detector.tflite",
  from: { packed: "posePackedAssets", listing: "posePackedListing", filename: "pose_detection.tflite" },
  ...SIGNED_RANGE,
};

export const MODEL_BUNDLES: BundleRecipe[] = [
  {
    file: "hand_landmarker_lite.task",
    entries: [
      palmDetector("palm_detection_lite.tflite"),
      { name: "hand_landmarks_detector.tflite", from: { source: "handLandmarkLite" }, ...UNIT_RANGE },
    ],
  },
  {
    file: "hand_landmarker_full.task",
    entries: [
      palmDetector("palm_detection_full.tflite"),
      { name: "hand_landmarks_detector.tflite", from: { source: "handLandmarkFull" }, ...UNIT_RANGE },
    ],
  },
  {
    file: "pose_landmarker_lite.task",
    entries: [poseDetector, { name: "pose_landmarks_detector.tflite", from: { source: "poseLandmarkLite" }, ...UNIT_RANGE }],
  },
  {
    file: "pose_landmarker_full.task",
    entries: [poseDetector, { name: "pose_landmarks_detector.tflite", from: { source: "poseLandmarkFull" }, ...UNIT_RANGE }],
  },
];

/** Bump when the bundle format changes so existing outputs are rebuilt. */
export const RECIPE_VERSION = 1;
