import { Quaternion, Vector3 } from "three";

/** Hand side as seen by the client: the rig ships one mesh per side. */
export type HandSide = "left" | "right";

/**
 * The 25 joints of the WebXR hand skeleton as the rigged meshes name them. The rig calls the little finger
 * "pinky"; Kinarc's own types say `little` and map to these names only here.
 */
export const RIG_JOINT_NAMES = [
  "wrist",
  "thumb-metacarpal",
  "thumb-phalanx-proximal",
  "thumb-phalanx-distal",
  "thumb-tip",
  ...(["index", "middle", "ring", "pinky"] as const).flatMap((finger) =>
    (["metacarpal", "phalanx-proximal", "phalanx-intermediate", "phalanx-distal", "tip"] as const).map(
      (part) => `${finger}-finger-${part}` as const,
    ),
  ),
] as const;
export type RigJointName = (typeof RIG_JOINT_NAMES)[number];

export interface RigJointRest {
  name: RigJointName;
  /** Position in the armature frame, metres. */
  position: Vector3;
  /** Orientation in the armature frame (joints are flat children of the armature). */
  quaternion: Quaternion;
}

export interface HandRig {
  side: HandSide;
  joints: Record<RigJointName, RigJointRest>;
  /**
   * A hand built unlike the mesh (scripts/accuracy/hand-pose.ts `proportionedRig`): each bone's scale in its own
   * frame (x, y across the bone, z along it), which the render page applies to the skin bound to that bone. The
   * rest positions above are already moved to match. Absent for the mesh as shipped.
   */
  boneScales?: Partial<Record<RigJointName, [number, number, number]>>;
}

interface GltfNode {
  name?: string;
  translation?: [number, number, number];
  rotation?: [number, number, number, number];
  children?: number[];
}

const GLB_MAGIC = 0x46546c67; // "glTF"
const JSON_CHUNK = 0x4e4f534a; // "JSON"

/** Reads the JSON chunk of a binary glTF (glTF 2.0 spec, section "GLB File Format Specification"). */
export function readGlbJson(glb: Uint8Array): { nodes: GltfNode[]; skins?: { joints: number[] }[] } {
  const view = new DataView(glb.buffer, glb.byteOffset, glb.byteLength);
  if (glb.byteLength < 20 || view.getUint32(0, true) !== GLB_MAGIC) {
    throw new Error("hand rig: expected a binary glTF file (magic 'glTF' at byte 0)");
  }
  const chunkLength = view.getUint32(12, true);
  if (view.getUint32(16, true) !== JSON_CHUNK) {
    throw new Error("hand rig: expected the first GLB chunk to be JSON");
  }
  const text = new TextDecoder().decode(glb.subarray(20, 20 + chunkLength));
  return JSON.parse(text);
}

/**
 * Rest pose of every skeleton joint. The rig's joints are direct children of the armature (not a chain), so each
 * node's own translation and rotation already are its armature-frame rest transform.
 */
export function parseHandRig(glb: Uint8Array, side: HandSide): HandRig {
  const gltf = readGlbJson(glb);
  const byName = new Map<string, GltfNode>();
  for (const node of gltf.nodes) if (node.name) byName.set(node.name, node);
  const armature = gltf.nodes.find((node) => node.name === "Armature");
  if (!armature) throw new Error("hand rig: no node named 'Armature'");
  const joints = {} as Record<RigJointName, RigJointRest>;
  for (const name of RIG_JOINT_NAMES) {
    const node = byName.get(name);
    if (!node) throw new Error(`hand rig: joint '${name}' is missing`);
    const index = gltf.nodes.indexOf(node);
    if (!armature.children?.includes(index)) {
      throw new Error(`hand rig: joint '${name}' is not a direct child of the armature; the pose model assumes it is`);
    }
    const [x, y, z] = node.translation ?? [0, 0, 0];
    const [qx, qy, qz, qw] = node.rotation ?? [0, 0, 0, 1];
    joints[name] = { name, position: new Vector3(x, y, z), quaternion: new Quaternion(qx, qy, qz, qw).normalize() };
  }
  return { side, joints };
}
