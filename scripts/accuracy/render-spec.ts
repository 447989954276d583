/**
 * What the render page needs to draw one frame. Plain JSON: Node computes every transform (so the truth and the
 * picture come from the same numbers) and the page only draws.
 */
export interface RenderFrameSpec {
  side: "left" | "right";
  widthPx: number;
  heightPx: number;
  /** Column-major 4x4 armature-frame matrix per rig joint name. */
  boneMatrices: Record<string, number[]>;
  camera: {
    /** Column-major camera-to-world matrix. */
    matrixWorld: number[];
    verticalFovDeg: number;
    nearM: number;
    farM: number;
  };
  skin: { colorHex: string; roughness: number };
  /** A skin-coloured capsule standing in for the forearm, which the hand mesh lacks. */
  forearm: { matrix: number[]; radiusM: number; lengthM: number; widthScale: number } | null;
  background: { kind: "plain"; colorHex: string } | { kind: "gradient"; topHex: string; bottomHex: string };
  lighting: {
    hemisphere: { skyHex: string; groundHex: string; intensity: number };
    /** Directions point from the light toward the scene, in world (armature) coordinates. */
    key: { direction: [number, number, number]; intensity: number; colorHex: string };
    fill: { direction: [number, number, number]; intensity: number };
  };
  jpegQuality: number;
}

/** The page's API, installed on `window` once the meshes are loaded. */
export interface RenderPageApi {
  ready: Promise<void>;
  /** Renders each spec in turn; returns JPEG data URLs. */
  renderFrames(specs: RenderFrameSpec[]): string[];
}
