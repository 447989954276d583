import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { parseHandRig, type HandRig, type HandSide } from "./rig";

const require = createRequire(import.meta.url);

/** Folder of the MIT-licensed generic hand meshes inside the installed npm package. */
export function handMeshFolder(): string {
  const packageJson = require.resolve("@webxr-input-profiles/assets/package.json");
  return path.join(path.dirname(packageJson), "dist", "profiles", "generic-hand");
}

export function handMeshPath(side: HandSide): string {
  return path.join(handMeshFolder(), `${side}.glb`);
}

export function loadHandRig(side: HandSide): HandRig {
  return parseHandRig(new Uint8Array(readFileSync(handMeshPath(side))), side);
}
