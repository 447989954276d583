import path from "node:path";
import { parseArgs } from "node:util";
import type { PoseKey } from "./hand-pose";
import { renderRandomSet, renderSweepClip } from "./render-jobs";
import { HandRenderer, RENDER_OUTPUT_ROOT } from "./renderer";
import { loadHandRig } from "./rig-files";
import { CAMERA_VIEWS, type CameraView } from "./scene";
import { validateSweepOptions } from "./sweep";
import type { HandSide } from "./rig";

const USAGE = `Renders labelled hands with known joint angles (output under tests/.cache/renders/ unless --out).

  npm run -s render-hands -- set   --seed N --count N [--views palm,back,...] [--sides left,right] [--out DIR]
  npm run -s render-hands -- sweep --joint index.pipFlexionDeg[,middle.pipFlexionDeg,...] --from 0 --to 80 [--cycles 3] [--cycle-seconds 2]
                                   [--fps 30] [--view radial] [--side right] [--distance 0.45] [--seed 1]
                                   [--no-webm] [--name NAME] [--out DIR]

Views: ${CAMERA_VIEWS.join(", ")}.`;

function numberOption(values: Record<string, unknown>, field: string, fallback: number): number {
  const raw = values[field];
  if (raw === undefined) return fallback;
  const value = Number(raw);
  if (!Number.isFinite(value)) throw new Error(`--${field}: expected a number; got '${String(raw)}'`);
  return value;
}

function listOption<T extends string>(raw: unknown, field: string, allowed: readonly T[]): T[] | undefined {
  if (raw === undefined) return undefined;
  const items = String(raw).split(",").filter(Boolean);
  for (const item of items) {
    if (!allowed.includes(item as T)) throw new Error(`--${field}: expected some of ${allowed.join(", ")}; got '${item}'`);
  }
  return items as T[];
}

async function main(): Promise<void> {
  const { positionals, values } = parseArgs({
    allowPositionals: true,
    options: {
      seed: { type: "string" },
      count: { type: "string" },
      views: { type: "string" },
      sides: { type: "string" },
      out: { type: "string" },
      joint: { type: "string" },
      from: { type: "string" },
      to: { type: "string" },
      cycles: { type: "string" },
      "cycle-seconds": { type: "string" },
      fps: { type: "string" },
      view: { type: "string" },
      side: { type: "string" },
      distance: { type: "string" },
      name: { type: "string" },
      "no-webm": { type: "boolean" },
      help: { type: "boolean" },
    },
  });
  const mode = positionals[0];
  if (values.help || (mode !== "set" && mode !== "sweep")) {
    console.log(USAGE);
    process.exitCode = values.help ? 0 : 2;
    return;
  }
  // Every option is checked before Chromium starts, so a typo fails at once with the field named.
  if (mode === "set") {
    const seed = numberOption(values, "seed", 1);
    const count = numberOption(values, "count", 60);
    if (!Number.isInteger(seed)) throw new Error(`--seed: expected an integer; got ${seed}`);
    if (!Number.isInteger(count) || count <= 0) throw new Error(`--count: expected a positive whole number; got ${count}`);
    const options = {
      views: listOption<CameraView>(values.views, "views", CAMERA_VIEWS),
      sides: listOption<HandSide>(values.sides, "sides", ["left", "right"]),
    };
    const folder = values.out ?? path.join(RENDER_OUTPUT_ROOT, `set-${seed}`);
    const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };
    await withRenderer(async (renderer, glName) => {
      const result = await renderRandomSet(renderer, rigs, seed, count, folder, options);
      console.log(`${count} frames -> ${result.labelsFile} (${result.msPerFrame.toFixed(1)} ms a frame, ${glName})`);
    });
    return;
  }
  const options = validateSweepOptions({
    joints: (values.joint ?? "index.pipFlexionDeg").split(",").filter(Boolean) as PoseKey[],
    fromDeg: numberOption(values, "from", 0),
    toDeg: numberOption(values, "to", 80),
    cycles: numberOption(values, "cycles", 3),
    cycleSeconds: numberOption(values, "cycle-seconds", 2),
    fps: numberOption(values, "fps", 30),
    view: (values.view ?? "radial") as CameraView,
    side: (values.side ?? "right") as HandSide,
    distanceM: numberOption(values, "distance", 0.45),
    seed: numberOption(values, "seed", 1),
  });
  const jointsName = options.joints.length === 1 ? options.joints[0].replace(".", "-") : `${options.joints.length}x-${options.joints[0].split(".")[1]}`;
  const name = values.name ?? `${options.side}-${jointsName}-${options.view}-${options.seed}`;
  const folder = values.out ?? path.join(RENDER_OUTPUT_ROOT, "clips");
  await withRenderer(async (renderer, glName) => {
    const clip = await renderSweepClip(renderer, loadHandRig(options.side), options, folder, name, { webm: !values["no-webm"] });
    console.log(
      `${clip.frameCount} frames -> ${clip.mjpegFile}${clip.webmFile ? `, ${clip.webmFile}` : ""}, truth ${clip.truthFile} ` +
        `(${clip.msPerFrame.toFixed(1)} ms a frame, ${glName})`,
    );
  });
}

async function withRenderer(job: (renderer: HandRenderer, glName: string) => Promise<void>): Promise<void> {
  const renderer = await HandRenderer.start();
  try {
    await job(renderer, await renderer.glRenderer());
  } finally {
    await renderer.close();
  }
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exitCode = 2;
});
