/**
 * Render speed of the hand render harness: milliseconds a frame (draw, JPEG encode and transfer to Node) for
 * random labelled frames, in the batch size the render jobs use. Prints figures; asserts nothing.
 *
 *   npx tsx scripts/accuracy/bench-render.ts [--frames 120]
 */
import { parseArgs } from "node:util";
import { HandRenderer } from "./renderer";
import { loadHandRig } from "./rig-files";
import { frameSeeds, randomFrame } from "./scene";

async function main(): Promise<void> {
  const { values } = parseArgs({ options: { frames: { type: "string" } } });
  const frameCount = Number(values.frames ?? 120);
  if (!Number.isInteger(frameCount) || frameCount < 12) throw new Error(`--frames: expected a whole number of at least 12; got ${values.frames}`);
  const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };
  const startedAt = performance.now();
  const renderer = await HandRenderer.start();
  try {
    const startMs = performance.now() - startedAt;
    const specs = frameSeeds(5, frameCount + 12).map((seed) => randomFrame(rigs, seed).spec);
    await renderer.render(specs.slice(0, 12)); // warm-up: shader compile, first texture uploads
    const batchMs: number[] = [];
    let bytes = 0;
    for (let start = 12; start < specs.length; start += 12) {
      const t0 = performance.now();
      const images = await renderer.render(specs.slice(start, start + 12));
      batchMs.push((performance.now() - t0) / images.length);
      bytes += images.reduce((sum, image) => sum + image.length, 0);
    }
    batchMs.sort((a, b) => a - b);
    const mean = batchMs.reduce((a, b) => a + b, 0) / batchMs.length;
    console.log(`renderer: ${await renderer.glRenderer()}`);
    console.log(`start (build check, Chromium, meshes): ${startMs.toFixed(0)} ms`);
    console.log(`frames: ${frameCount} at 640x480, batches of 12`);
    console.log(`ms a frame: mean ${mean.toFixed(1)}, median batch ${batchMs[Math.floor(batchMs.length / 2)].toFixed(1)}, best batch ${batchMs[0].toFixed(1)}`);
    console.log(`JPEG size: mean ${(bytes / frameCount / 1024).toFixed(1)} KiB`);
  } finally {
    await renderer.close();
  }
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exitCode = 2;
});
