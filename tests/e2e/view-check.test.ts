/**
 * The set-up's view check on rendered stills of known view, through the app's own tracking code: stills of a hand in
 * each of the six views (scripts/accuracy renders: the MIT-licensed rigged hand of @webxr-input-profiles/assets drawn
 * with three), held in a webm clip, tracked by vision/live in headless Chromium (tests/harness/tracking), then
 * classified by the engine (vision/view-policy measureView) and judged by the set-up checks. Truth is each still's
 * rendered camera view. No app server: the harness serves the tracking page on its own port.
 */
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runSetupChecks } from "@/lib/tracking/setup-checks";
import type { TrackedFrame } from "@/vision/live/types";
import { measureView } from "@/vision/view-policy";
import type { Vec3 } from "@/vision/vec";
import { renderStillsClip } from "@/scripts/accuracy/render-jobs";
import { HandRenderer } from "@/scripts/accuracy/renderer";
import { framesForStills } from "@/scripts/accuracy/report";
import { loadHandRig } from "@/scripts/accuracy/rig-files";
import { viewCheckFrames, type WristSetFrame } from "@/scripts/accuracy/wrist-set";
import { launchChromium, openHarnessPage, startHarnessServer, waitForFrames } from "../harness/tracking-harness";

/** Ports 4320-4329 belong to the render and accuracy tools; this suite takes 4327. */
const PORT = 4327;
const HOLD_MS = 200;
const FPS = 15;
const RATE = 0.3;
const PER_VIEW = 4;

let folder: string;
let stills: WristSetFrame[];
let tracked: (TrackedFrame | null)[];
let allFrames: TrackedFrame[];

beforeAll(async () => {
  folder = mkdtempSync(path.join(os.tmpdir(), "kinarc-view-check-"));
  const rigs = { left: loadHandRig("left"), right: loadHandRig("right") };
  stills = viewCheckFrames(rigs, 31_337, PER_VIEW);
  const clip = path.join(folder, "views.webm");
  const renderer = await HandRenderer.start();
  try {
    await renderStillsClip(renderer, stills.map((s) => s.spec), clip, { holdMs: HOLD_MS, fps: FPS });
  } finally {
    await renderer.close();
  }
  const server = await startHarnessServer({ port: PORT, allowDirs: [folder] });
  const browser = await launchChromium();
  try {
    const page = await openHarnessPage(browser, server, { clip: server.fileUrl(clip), rate: RATE, model: "lite", thread: "worker" });
    await waitForFrames(page, Number.MAX_SAFE_INTEGER, (stills.length * HOLD_MS) / RATE + 120_000);
    await page.waitForTimeout(1000);
    allFrames = await page.evaluate(() => window.kinarcHarness.frames);
  } finally {
    await browser.close();
    await server.close();
  }
  tracked = framesForStills(allFrames, stills.length, HOLD_MS, FPS);
}, 600_000);

afterAll(() => {
  if (folder) rmSync(folder, { recursive: true, force: true });
});

describe("measured view on tracked renders of known view", () => {
  it("names the rendered view of most stills, the little-finger side view nearly always", () => {
    const byView = new Map<string, { detected: number; correct: number }>();
    stills.forEach((still, i) => {
      const frame = tracked[i];
      const row = byView.get(still.truth.view) ?? { detected: 0, correct: 0 };
      if (frame?.hand) {
        row.detected += 1;
        if (measureView(frame.hand as Vec3[], still.truth.side) === still.truth.view) row.correct += 1;
      }
      byView.set(still.truth.view, row);
    });
    const detected = [...byView.values()].reduce((n, r) => n + r.detected, 0);
    const correct = [...byView.values()].reduce((n, r) => n + r.correct, 0);
    console.log(`view check: ${correct}/${detected} tracked stills named right; ${[...byView].map(([v, r]) => `${v} ${r.correct}/${r.detected}`).join(", ")}`);
    expect(detected).toBeGreaterThanOrEqual(stills.length * 0.75);
    expect(correct / detected).toBeGreaterThanOrEqual(0.7);
    // On 288 tracked stills (scripts/accuracy/report.md, wrist section) the ulnar side view was named right 93% of
    // the time and the thumb side 59% (often read as the palm); a back view mostly reads as oblique or down.
    const ulnar = byView.get("ulnar")!;
    expect(ulnar.detected).toBeGreaterThanOrEqual(PER_VIEW - 1);
    expect(ulnar.correct).toBeGreaterThanOrEqual(ulnar.detected - 1);
    const radial = byView.get("radial")!;
    expect(radial.correct * 2).toBeGreaterThanOrEqual(radial.detected);
  });

  it("the set-up check passes the little-finger side for finger flexion lifted up and says what to change from the thumb side", () => {
    const windowOf = (i: number) => allFrames.filter((f) => f.t >= i * HOLD_MS && f.t < (i + 1) * HOLD_MS && f.hand);
    const verdict = (view: string) =>
      stills
        .map((still, i) => ({ still, frames: windowOf(i) }))
        .filter(({ still, frames }) => still.truth.view === view && frames.length > 0)
        .map(({ still, frames }) => {
          // The check needs a few frames; a still's frames repeated stand for a hand held there.
          const held = Array.from({ length: 12 }, (_, k) => ({ ...frames[k % frames.length], t: k * 33 }));
          return runSetupChecks({
            frames: held, side: still.truth.side, motion: "pip.flexion", condition: "against_gravity", digit: "index",
            lumaMean: 120, videoWidth: 640, videoHeight: 480, displayMirrored: true, gravitySource: "none",
          }).find((c) => c.id === "view")!;
        });
    const ulnar = verdict("ulnar");
    const radial = verdict("radial");
    expect(ulnar.length).toBeGreaterThanOrEqual(PER_VIEW - 1);
    expect(ulnar.filter((c) => c.status === "ok").length).toBeGreaterThanOrEqual(ulnar.length - 1);
    // From the thumb side (or where it reads as the palm) the check is advice that points to the little-finger side.
    expect(radial.filter((c) => c.status === "advice" && /little.finger/.test(c.instruction)).length * 2).toBeGreaterThanOrEqual(radial.length);
  });
});
