/**
 * The set-up check's advice from the thumb side, "show the palm for a moment, then turn back", through the app's own
 * tracking code: a rendered clip of a hand the tracker failed to find edge-on (training seed 77000410, a hand of
 * varied build; scripts/accuracy/README.md "Showing the palm first"), rendered as drawn and again opening with the
 * palm turned 30 degrees toward the camera (clip-validation.ts --turn-in), tracked frame by frame in headless
 * Chromium (tests/harness/tracking, step mode, the full model). Truth: every frame after the turn is the same picture
 * in both clips, so any difference is the turn's.
 */
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runSetupChecks } from "@/lib/tracking/setup-checks";
import type { TrackedFrame } from "@/vision/live/types";
import { CLIP_FPS, planClips, planRig, planSweep, TURN_IN_SECONDS, withTurnIn, type ClipPlan } from "@/scripts/accuracy/clip-validation";
import { renderSweepClip } from "@/scripts/accuracy/render-jobs";
import { HandRenderer } from "@/scripts/accuracy/renderer";
import { launchChromium, openHarnessPage, startHarnessServer } from "../harness/tracking-harness";

/** Ports 4320-4329 belong to the render and accuracy tools; this suite takes 4328. */
const PORT = 4328;
const SEED = 77_000_410;
/** The third MCP clip of that seed: the full model found 2% of its frames as drawn (the README's table). */
const CLIP = 2;
const TURN_FRAMES = Math.round(TURN_IN_SECONDS * CLIP_FPS);

let folder: string;
const tracked: Record<"plain" | "turned", TrackedFrame[]> = { plain: [], turned: [] };

async function render(renderer: HandRenderer, plan: ClipPlan): Promise<string> {
  // One cycle instead of the report's two: what the turn changes is whether the hand is found at the start.
  const clip = await renderSweepClip(renderer, planRig(plan), planSweep(plan, 1), folder, plan.name);
  return clip.webmFile!;
}

beforeAll(async () => {
  folder = mkdtempSync(path.join(os.tmpdir(), "kinarc-turn-in-"));
  const plain = planClips(SEED, CLIP + 1, "gravity_minimized", ["mcp.flexion"], undefined, false, null, undefined, "varied")[CLIP];
  const [turned] = withTurnIn([plain], SEED, 30);
  const renderer = await HandRenderer.start();
  const files = { plain: "", turned: "" };
  try {
    files.plain = await render(renderer, plain);
    files.turned = await render(renderer, turned);
  } finally {
    await renderer.close();
  }
  const server = await startHarnessServer({ port: PORT, allowDirs: [folder] });
  const browser = await launchChromium();
  try {
    for (const which of ["plain", "turned"] as const) {
      const page = await openHarnessPage(browser, server, { clip: server.fileUrl(files[which]), step: true, fps: CLIP_FPS, model: "full" });
      await page.waitForFunction(() => window.kinarcHarness?.status === "ended" || window.kinarcHarness?.status === "failed", null, { timeout: 300_000, polling: 500 });
      const state = await page.evaluate(() => window.kinarcHarness);
      if (state.status === "failed") throw new Error(`harness: ${state.error}`);
      tracked[which] = state.frames;
      await page.close();
    }
  } finally {
    await browser.close();
    await server.close();
  }
}, 900_000);

afterAll(() => {
  if (folder) rmSync(folder, { recursive: true, force: true });
});

const found = (frames: readonly TrackedFrame[]) => frames.filter((f) => f.hand).length / Math.max(1, frames.length);

describe("showing the palm first from the thumb side", () => {
  it("finds the hand during the turn and follows it edge-on to the end", () => {
    const plain = tracked.plain;
    const afterTurn = tracked.turned.slice(TURN_FRAMES);
    console.log(`turn-in: full model found ${Math.round(found(plain) * 100)}% of the plain clip's frames, ${Math.round(found(afterTurn) * 100)}% after the turn`);
    expect(afterTurn.length).toBe(plain.length);
    expect(found(tracked.turned.slice(0, TURN_FRAMES))).toBeGreaterThan(0);
    expect(found(afterTurn)).toBeGreaterThanOrEqual(0.95);
    expect(found(afterTurn)).toBeGreaterThan(found(plain));
  });

  it("while the hand is not found, the set-up check gives that advice", () => {
    const unseen = tracked.plain.find((f) => !f.hand) ?? { t: 0, score: 0, handedness: null, image: null };
    const [seen] = runSetupChecks({
      frames: [unseen],
      side: "right",
      motion: "mcp.flexion",
      condition: "gravity_minimized",
      digit: "index",
      lumaMean: 120,
      videoWidth: 640,
      videoHeight: 480,
      displayMirrored: true,
      gravitySource: "none",
    });
    expect(seen).toMatchObject({ id: "hand_seen", status: "fix" });
    expect(seen.instruction).toMatch(/palm up toward the camera for a moment/);
  });
});
