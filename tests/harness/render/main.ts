import {
  CanvasTexture,
  CapsuleGeometry,
  Color,
  DirectionalLight,
  HemisphereLight,
  Matrix4,
  Mesh,
  MeshStandardMaterial,
  PerspectiveCamera,
  Scene,
  SkinnedMesh,
  SRGBColorSpace,
  WebGLRenderer,
  type Bone,
  type Object3D,
} from "three";
import { GLTFLoader } from "three/addons/loaders/GLTFLoader.js";
import type { RenderFrameSpec, RenderPageApi } from "../../../scripts/accuracy/render-spec";

// Draws what Node specifies and nothing else: every pose, camera and light is computed by scripts/accuracy so
// the truth written beside each frame and the picture share the same numbers.

const canvas = document.getElementById("view") as HTMLCanvasElement;
// No multisampling: on software WebGL it nearly doubles the time per frame (about 45 against 25 ms measured here).
const renderer = new WebGLRenderer({ canvas, antialias: false, preserveDrawingBuffer: true });
renderer.setPixelRatio(1);
renderer.outputColorSpace = SRGBColorSpace;

const scene = new Scene();
const camera = new PerspectiveCamera(40, 4 / 3, 0.01, 10);
camera.matrixAutoUpdate = false;

const hemisphere = new HemisphereLight();
const keyLight = new DirectionalLight();
const fillLight = new DirectionalLight();
scene.add(hemisphere, keyLight, keyLight.target, fillLight, fillLight.target);

const skin = new MeshStandardMaterial({ color: 0xd8a07c, roughness: 0.6, metalness: 0 });
const forearm = new Mesh(new CapsuleGeometry(0.025, 0.2, 8, 24), skin);
let forearmShape = "0.025x0.2";
forearm.matrixAutoUpdate = false;
scene.add(forearm);

interface LoadedHand {
  root: Object3D;
  bones: Map<string, Bone>;
}
const hands = new Map<string, LoadedHand>();

async function loadHand(side: "left" | "right"): Promise<LoadedHand> {
  const gltf = await new GLTFLoader().loadAsync(`./hand-meshes/${side}.glb`);
  const bones = new Map<string, Bone>();
  gltf.scene.traverse((node) => {
    if ((node as SkinnedMesh).isSkinnedMesh) {
      const mesh = node as SkinnedMesh;
      mesh.material = skin;
      // The rest-pose bounds do not cover a posed hand; culling would drop flexed fingers.
      mesh.frustumCulled = false;
      for (const bone of mesh.skeleton.bones) bones.set(bone.name, bone);
    }
  });
  gltf.scene.visible = false;
  scene.add(gltf.scene);
  return { root: gltf.scene, bones };
}

let backgroundTexture: CanvasTexture | null = null;
function setBackground(spec: RenderFrameSpec["background"]): void {
  backgroundTexture?.dispose();
  backgroundTexture = null;
  if (spec.kind === "plain") {
    scene.background = new Color(spec.colorHex);
    return;
  }
  const paint = document.createElement("canvas");
  paint.width = 4;
  paint.height = 256;
  const context = paint.getContext("2d")!;
  const gradient = context.createLinearGradient(0, 0, 0, 256);
  gradient.addColorStop(0, spec.topHex);
  gradient.addColorStop(1, spec.bottomHex);
  context.fillStyle = gradient;
  context.fillRect(0, 0, 4, 256);
  backgroundTexture = new CanvasTexture(paint);
  backgroundTexture.colorSpace = SRGBColorSpace;
  scene.background = backgroundTexture;
}

function placeLight(light: DirectionalLight, direction: [number, number, number], intensity: number): void {
  // A directional light shines from its position toward its target; only the difference matters.
  light.position.set(-direction[0], -direction[1], -direction[2]);
  light.target.position.set(0, 0, 0);
  light.intensity = intensity;
}

function renderFrame(spec: RenderFrameSpec): string {
  if (canvas.width !== spec.widthPx || canvas.height !== spec.heightPx) renderer.setSize(spec.widthPx, spec.heightPx, false);
  for (const [side, hand] of hands) hand.root.visible = side === spec.side;
  const hand = hands.get(spec.side);
  if (!hand) throw new Error(`render page: no mesh for side '${spec.side}'`);
  for (const [name, elements] of Object.entries(spec.boneMatrices)) {
    const bone = hand.bones.get(name);
    if (!bone) throw new Error(`render page: the ${spec.side} mesh has no bone '${name}'`);
    bone.matrix.fromArray(elements);
    bone.matrix.decompose(bone.position, bone.quaternion, bone.scale);
  }
  camera.fov = spec.camera.verticalFovDeg;
  camera.aspect = spec.widthPx / spec.heightPx;
  camera.near = spec.camera.nearM;
  camera.far = spec.camera.farM;
  camera.updateProjectionMatrix();
  camera.matrixWorld.fromArray(spec.camera.matrixWorld);
  camera.matrixWorldInverse.copy(camera.matrixWorld).invert();

  skin.color.set(spec.skin.colorHex);
  skin.roughness = spec.skin.roughness;
  forearm.visible = spec.forearm !== null;
  if (spec.forearm) {
    const { radiusM, lengthM, widthScale } = spec.forearm;
    const shape = `${radiusM}x${lengthM}`;
    if (shape !== forearmShape) {
      forearm.geometry.dispose();
      forearm.geometry = new CapsuleGeometry(radiusM, lengthM, 8, 24);
      forearmShape = shape;
    }
    // The capsule's long axis is its local Y; widening local X flattens it like a forearm near the wrist.
    forearm.matrix.fromArray(spec.forearm.matrix).multiply(new Matrix4().makeScale(widthScale, 1, 1));
    forearm.matrixWorldNeedsUpdate = true;
  }
  setBackground(spec.background);
  const light = spec.lighting;
  hemisphere.color.set(light.hemisphere.skyHex);
  hemisphere.groundColor.set(light.hemisphere.groundHex);
  hemisphere.intensity = light.hemisphere.intensity;
  keyLight.color.set(light.key.colorHex);
  placeLight(keyLight, light.key.direction, light.key.intensity);
  placeLight(fillLight, light.fill.direction, light.fill.intensity);

  renderer.render(scene, camera);
  return canvas.toDataURL("image/jpeg", spec.jpegQuality);
}

const api: RenderPageApi = {
  ready: Promise.all([loadHand("left"), loadHand("right")]).then(([left, right]) => {
    hands.set("left", left);
    hands.set("right", right);
  }),
  renderFrames: (specs) => specs.map(renderFrame),
};
(window as unknown as { kinarcRender: RenderPageApi }).kinarcRender = api;
