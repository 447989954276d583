import type { ModelVariant } from "./types";

/** Where the app serves what `npm run models` builds: bundles under /models, the tasks wasm under /mediapipe/wasm. */
export function modelUrls(assetBaseUrl: string, handModel: ModelVariant, poseModel: ModelVariant | null) {
  const base = assetBaseUrl.replace(/\/$/, "");
  return {
    wasmBaseUrl: `${base}/mediapipe/wasm`,
    handModelUrl: `${base}/models/hand_landmarker_${handModel}.task`,
    poseModelUrl: poseModel ? `${base}/models/pose_landmarker_${poseModel}.task` : null,
  };
}
