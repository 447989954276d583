import type { PoseKey } from "./hand-pose";

/** Joints pooled into one row: the four fingers share a row per joint, as a report per finger would be 4x longer. */
export interface JointGroup {
  label: string;
  keys: readonly PoseKey[];
}

export const JOINT_GROUPS: readonly JointGroup[] = [
  { label: "MCP flexion", keys: ["index.mcpFlexionDeg", "middle.mcpFlexionDeg", "ring.mcpFlexionDeg", "little.mcpFlexionDeg"] },
  { label: "PIP flexion", keys: ["index.pipFlexionDeg", "middle.pipFlexionDeg", "ring.pipFlexionDeg", "little.pipFlexionDeg"] },
  { label: "DIP flexion", keys: ["index.dipFlexionDeg", "middle.dipFlexionDeg", "ring.dipFlexionDeg", "little.dipFlexionDeg"] },
  { label: "finger abduction", keys: ["index.mcpAbductionDeg", "ring.mcpAbductionDeg", "little.mcpAbductionDeg"] },
  { label: "thumb MCP flexion", keys: ["thumb.mcpFlexionDeg"] },
  { label: "thumb IP flexion", keys: ["thumb.ipFlexionDeg"] },
  { label: "wrist flexion (+) / extension (-)", keys: ["wrist.flexionDeg"] },
  { label: "wrist radial (+) / ulnar (-) deviation", keys: ["wrist.radialDeviationDeg"] },
];
