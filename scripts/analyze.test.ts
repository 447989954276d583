import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { CaptureFormatError } from "@/lib/capture/parse";
import { analyzeCapture } from "@/vision/analyze-capture";
import { buildSyntheticCapture, type SyntheticCapture } from "@/vision/testing/synthetic-hand";
import { UsageError, analyzeFiles } from "./analyze";

// Forearm level, palm up: wrist flexion works against gravity; thumb up: the same motion is gravity-minimized
// (test positions in shared/notes/clinical-references.md). Right hand: a left hand lies mirrored.
const palmUp = { forearmDistal: [1, 0, 0] as const, forearmRadial: [0, 0, -1] as const, wrist: [0, 0, 0.5] as const };
const thumbUp = { forearmDistal: [1, 0, 0] as const, forearmRadial: [0, -1, 0] as const, wrist: [0, 0, 0.5] as const };

function capture(peakDeg: number, condition: "against_gravity" | "gravity_minimized", extra: Partial<SyntheticCapture> = {}): SyntheticCapture {
  const placement = condition === "against_gravity" ? palmUp : thumbUp;
  return { ...buildSyntheticCapture({ motion: "wrist.flexion", side: "right", digit: null, condition, placement, reps: [{ peakDeg }, { peakDeg }], noiseMm: 1, seed: peakDeg }), ...extra };
}

function run(files: Record<string, unknown>, args: string[] = []) {
  const texts = Object.fromEntries(Object.entries(files).map(([name, value]) => [name, typeof value === "string" ? value : JSON.stringify(value)]));
  return analyzeFiles([...args, ...Object.keys(files)], (f) => {
    if (!(f in texts)) throw Object.assign(new Error("missing"), { code: "ENOENT" });
    return texts[f];
  });
}

describe("analyze command", () => {
  it("reports each capture and grades the set: 60 of 80 deg against gravity is 3- (Daniels: more than half)", () => {
    const out = run({ "ag.json": capture(60, "against_gravity"), "gm.json": capture(78, "gravity_minimized") });
    expect(out.captures).toHaveLength(2);
    expect(out.captures[0]).toMatchObject({ file: "ag.json", motion: "wrist.flexion", side: "right", digit: null, reps: 2, plane: { verdict: "against_gravity" } });
    expect(Math.abs(out.captures[0].peakDeg! - 60)).toBeLessThan(3);
    // A synthetic capture carries no neutral frames: the wrist is read against a forearm line, and the JSON says which.
    expect(["pose", "capture-start"]).toContain(out.captures[0].forearmSource);
    expect(out.captures[1].plane!.verdict).toBe("gravity_minimized");
    expect(out.reference.endRangeDeg).toBe(80);
    expect(out.grade).toMatchObject({ scale: "daniels", value: "3-", ceiling: false });
    // Every capture states its method, correction and uncertainty; each repetition carries the uncertainty too.
    for (const c of out.captures) {
      expect(c.method === "world3d" ? c.correctionVersion : c.method).toBe(c.method === "world3d" ? null : `world3d+${c.correctionVersion}`);
      expect(c.uncertaintyDeg).toBeGreaterThan(0);
      for (const r of c.repetitions) expect(r.uncertaintyDeg).toBe(c.uncertaintyDeg);
    }
  });

  it("uses --reference over the table, and the capture's passive range when given", () => {
    expect(run({ "ag.json": capture(60, "against_gravity") }, ["--reference", "64"]).grade.value).toBe("3");
    expect(run({ "ag.json": capture(60, "against_gravity", { passiveRangeDeg: 64 } as Partial<SyntheticCapture>) }).reference.endRangeDeg).toBe(64);
    expect(run({ "ag.json": capture(60, "against_gravity") }, ["--scale", "mrc"]).grade).toMatchObject({ scale: "mrc", value: "2" });
  });

  it("reads a finger tested on its own with the single-finger error, says so, and grades near a line as uncertain", () => {
    // Seen from the little-finger side; gravity points up the picture, so the finger bends upward against it.
    const side = { forearmDistal: [0, -1, 0] as const, forearmRadial: [0, 0, 1] as const, wrist: [0, 0, 0.5] as const };
    const pip = buildSyntheticCapture({ motion: "pip.flexion", side: "right", digit: "ring", condition: "against_gravity", placement: side, reps: [{ peakDeg: 60 }, { peakDeg: 60 }], noiseMm: 0.3, seed: 5, gravity: [0, -1, 0] });
    const together = run({ "p.json": pip }).captures[0];
    const alone = run({ "p.json": { ...pip, oneFinger: true } });
    expect(together.oneFinger).toBe(false);
    expect(alone.captures[0].oneFinger).toBe(true);
    expect(alone.captures[0].peakDeg).toBe(together.peakDeg);
    expect(alone.captures[0].uncertaintyDeg!).toBeGreaterThan(40);
    expect(alone.captures[0].warnings.some((w: string) => w.startsWith("one finger tested on its own"))).toBe(true);
    // A reading of about 50 of the catalog's 100 deg PIP range (AAOS) with +-40 deg or more straddles both the 50% and
    // the full-range (90%) lines of the Daniels grades: the grade asks for the range to be confirmed in person.
    const note = alone.grade.inPerson.find((n: { reason: string }) => n.reason === "uncertain");
    expect(note?.detail).toMatch(/straddles the 50% range line .* straddles the full-range \(90%\) line/);
  });

  it("says which hand models a capture holds, and reads both when it carries the full model's frames", () => {
    const side = { forearmDistal: [0, -1, 0] as const, forearmRadial: [0, 0, 1] as const, wrist: [0, 0, 0.5] as const };
    const spec = { motion: "pip.flexion", side: "right", digit: "ring", condition: "against_gravity", placement: side, noiseMm: 0.3, gravity: [0, -1, 0] } as const;
    const lite = buildSyntheticCapture({ ...spec, reps: [{ peakDeg: 60 }, { peakDeg: 60 }], seed: 5 });
    const full = buildSyntheticCapture({ ...spec, reps: [{ peakDeg: 64 }, { peakDeg: 64 }], seed: 6 });
    const one = run({ "p.json": lite }).captures[0];
    const two = run({ "p.json": { ...lite, fullModel: { frames: full.frames } } }).captures[0];
    expect(one.handModels).toEqual(["lite"]);
    expect(two.handModels).toEqual(["lite", "full"]);
    // Between the two models' own peaks, each read by its own model's fits.
    const fullAlone = analyzeCapture(full, { handModel: "full" }).peakDeg!;
    expect(two.peakDeg!).toBeGreaterThan(Math.min(one.peakDeg!, fullAlone));
    expect(two.peakDeg!).toBeLessThan(Math.max(one.peakDeg!, fullAlone));
  });

  it("rejects mixed motions naming the second file and the field", () => {
    const other = { ...capture(40, "against_gravity"), motion: "wrist.extension" };
    expect(() => run({ "a.json": capture(60, "against_gravity"), "b.json": other })).toThrow(
      new CaptureFormatError("b.json", null, "motion", 'expected "wrist.flexion" like a.json, got "wrist.extension"'),
    );
  });

  it("rejects bad options", () => {
    expect(() => run({ "a.json": capture(60, "against_gravity") }, ["--scale", "kendall"])).toThrow(UsageError);
    expect(() => run({ "a.json": capture(60, "against_gravity") }, ["--reference", "-3"])).toThrow(/--reference: expected degrees/);
  });
});

describe("analyze command as a process", () => {
  const dir = mkdtempSync(path.join(tmpdir(), "kinarc-analyze-"));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const cli = (...files: string[]) =>
    spawnSync(process.execPath, ["--import", "tsx", path.join(__dirname, "analyze.ts"), ...files], {
      cwd: path.join(__dirname, ".."),
      encoding: "utf8",
      env: { ...process.env, VITEST: "" },
    });

  it("exits 0 with one JSON object on stdout for good input, and 2 with one stderr line and no stdout for bad input", () => {
    const good = path.join(dir, "good.json");
    writeFileSync(good, JSON.stringify(capture(60, "against_gravity")));
    const ok = cli(good);
    expect(ok.status).toBe(0);
    expect(JSON.parse(ok.stdout).grade.value).toBe("3-");

    const broken = capture(60, "against_gravity");
    broken.frames[7].hand = broken.frames[7].hand!.slice(0, 20);
    const bad = path.join(dir, "bad.json");
    writeFileSync(bad, JSON.stringify(broken));
    const result = cli(good, bad);
    expect(result.status).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr.trim().split("\n")).toEqual([`${bad}: frames[7].hand: expected 21 landmarks [x, y, z], got an array of 20`]);

    const notJson = path.join(dir, "not.json");
    writeFileSync(notJson, "{");
    const r2 = cli(notJson);
    expect(r2.status).toBe(2);
    expect(r2.stdout).toBe("");
    expect(r2.stderr.trim().split("\n")).toHaveLength(1);
  });
});
