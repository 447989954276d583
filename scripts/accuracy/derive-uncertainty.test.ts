import { existsSync, readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { UNCERTAINTY_TABLE } from "@/vision/uncertainty";
import { CORRECTION_VERSION } from "@/vision/correction";
import {
  ABS_ERROR_SD_PER_MEAN,
  CLIP_REPORT_FILES,
  correctionClearlyHelps,
  deriveCommittedTable,
  deriveUncertaintyTable,
  parsePairCells,
  BOTH_BY_FINGER_HEADER,
  parseAccuracyReport,
  parseClipFingerRows,
  parseClipReports,
  parseWithoutStraightWrist,
  readClipFingerRows,
  readClipRows,
  readHandShapeRows,
  ONE_FINGER_CLIP_REPORT_FILES,
  REPORT_FILE,
  withDeclinedFigures,
} from "./derive-uncertainty";

describe("uncertainty table from the accuracy report", () => {
  const report = parseAccuracyReport(readFileSync(REPORT_FILE, "utf8"));

  it("the committed table is exactly what the committed report gives (re-run derive-uncertainty after the report)", () => {
    expect(deriveCommittedTable()).toEqual(UNCERTAINTY_TABLE);
    // Without the clip reports' wrist rows, the one-finger reports and the side-on held-out rows, the rest of the table is the same.
    const { withoutStraightWristReading, pairs, fingerAlone, cells, ...rest } = UNCERTAINTY_TABLE;
    const withoutLone = fingerAlone?.map((cell) => Object.fromEntries(Object.entries(cell).filter(([key]) => key !== "byDigit")));
    const withoutDeclined = cells.map((cell) => Object.fromEntries(Object.entries(cell).filter(([key]) => key !== "declinedBySideFit")));
    expect(deriveUncertaintyTable(report, readHandShapeRows(), CORRECTION_VERSION, readClipRows(), null, readClipFingerRows())).toEqual({ ...rest, cells: withoutDeclined, fingerAlone: withoutLone });
    expect(cells.filter((c) => c.declinedBySideFit).every((c) => c.view === "radial" || c.view === "ulnar")).toBe(true);
    // The one-finger reports give each finger they measured its own lone figure, from the little-finger side only
    // (the little finger from seeds 20261229-20261230 in every joint and model).
    const measured = parseClipFingerRows(ONE_FINGER_CLIP_REPORT_FILES.filter((f) => existsSync(f)).map((f) => readFileSync(f, "utf8")));
    const lone = (fingerAlone ?? []).flatMap((c) => (c.byDigit ?? []).map((f) => ({ cell: c, figure: f })));
    for (const { cell, figure } of lone) {
      expect(cell.view).toBe("ulnar");
      const row = measured.find((r) => `${r.group}|${r.view}|${r.model}|${r.digit}` === `${cell.group}|${cell.view}|${cell.model}|${figure.digit}`)!;
      expect(figure.clipMaeDeg).toBe(row.engineMaeDeg);
      expect(figure.clipPeakMaeDeg).toBe(row.enginePeakMaeDeg);
    }
    for (const group of ["MCP flexion", "PIP flexion", "DIP flexion"]) {
      for (const model of ["lite", "full"]) expect(lone.some(({ cell, figure }) => cell.group === group && cell.model === model && figure.digit === "little")).toBe(true);
    }
    // Both clip reports are split by finger ("By finger"): the thumb side (gravity minimized) and the little-finger side.
    const split = UNCERTAINTY_TABLE.cells.filter((c) => c.byDigit).map((c) => `${c.group}|${c.view}|${c.model}`);
    for (const group of ["MCP flexion", "PIP flexion", "DIP flexion"]) {
      for (const view of ["radial", "ulnar"]) for (const model of ["lite", "full"]) expect(split).toContain(`${group}|${view}|${model}`);
    }
    expect(withoutStraightWristReading).toBeDefined();
    // The two-model report gives both sides' three finger joints, the thumb side split by finger.
    expect(pairs?.map((c) => `${c.group}|${c.view}|${c.byDigit?.length ?? 0}`).sort()).toEqual([
      "DIP flexion|radial|4",
      "DIP flexion|ulnar|0",
      "MCP flexion|radial|4",
      "MCP flexion|ulnar|0",
      "PIP flexion|radial|4",
      "PIP flexion|ulnar|0",
    ]);
  });

  it("takes the two-model cells from the held-out seeds' 'both' rows against gravity only, the worst seed", () => {
    const header = "| motion | seed | reading | readings | detected | MAE ° | slope |\n| --- | --- | --- | ---: | ---: | ---: | ---: |";
    const markdown = [
      "## Seeds 20261201, 20261202, 77000401, against gravity",
      "",
      header,
      "| pip.flexion | 20261201 | lite | 40 | 100% | 9.00 | 0.9 |",
      "| pip.flexion | 20261201 | both | 40 | 100% | 3.00 | 0.9 |",
      "| pip.flexion | 20261202 | both | 40 | 100% | 4.00 | 0.9 |",
      "| pip.flexion | 77000401 | both | 40 | 100% | 8.00 | 0.9 |",
      "| pip.flexion | all | both | 120 | 100% | 5.00 | 0.9 |",
      "",
      "## Seeds 20261203, gravity minimized",
      "",
      header,
      "| pip.flexion | 20261203 | both | 40 | 100% | 7.00 | 0.9 |",
      "",
    ].join("\n");
    // 2.06 x 4.00 (the worse held-out seed; training seeds, the pooled row and the thumb side left out).
    expect(parsePairCells(markdown)).toEqual([{ group: "PIP flexion", view: "ulnar", models: ["lite", "full"], seeds: 2, clipMaeDeg: 4, uncertaintyDeg: 8.2 }]);
    expect(() => parsePairCells(markdown.replace("| 4.00 |", "| - |"))).toThrow(/pip.flexion, 20261202, both.*MAE °/);
    // With a peak P90 column: the worse held-out seed's, only where every held-out seed gave one.
    const withPeaks = markdown
      .replace(/\| slope \|\n\| --- \| --- \| --- \| ---: \| ---: \| ---: \| ---: \|/g, "| slope | peak P90 ° |\n| --- | --- | --- | ---: | ---: | ---: | ---: | ---: |")
      .replace(/(\| (?:20261201|20261202|20261203|77000401|all) \| (?:both|lite) \| .*\| 0\.9 \|)/g, (row) => `${row} ${row.includes("20261202") ? "11.5" : row.includes("77000401") ? "30" : "6.0"} |`);
    expect(parsePairCells(withPeaks)[0]).toMatchObject({ clipMaeDeg: 4, clipPeakP90Deg: 11.5 });
    expect(parsePairCells(withPeaks.replace("| 0.9 | 11.5 |", "| 0.9 | - |"))[0].clipPeakP90Deg).toBeUndefined();
  });

  it("makes a thumb-side two-model cell only where every seed was split by finger, each finger from its own worst seed", () => {
    const header = "| motion | seed | reading | readings | detected | MAE ° | slope |\n| --- | --- | --- | ---: | ---: | ---: | ---: |";
    const fingers = (seed: number, maes: number[]) =>
      [BOTH_BY_FINGER_HEADER, "| --- | --- | --- | ---: | ---: | ---: |", ...["index", "middle", "ring", "little"].map((f, i) => `| mcp.flexion | ${seed} | ${f} | 10 | 100% | ${maes[i].toFixed(2)} |`)].join("\n");
    const section = (seed: number, mae: number, split: number[] | null) =>
      [`## Seeds ${seed}, gravity minimized`, "", header, `| mcp.flexion | ${seed} | both | 40 | 100% | ${mae.toFixed(2)} | 0.9 |`, "", ...(split ? [fingers(seed, split), ""] : [])].join("\n");
    const both = [section(20261201, 5, [3, 4, 6, 7]), section(20261202, 6, [4, 3, 5, 9])].join("\n");
    const [cell] = parsePairCells(both);
    expect(cell).toMatchObject({ group: "MCP flexion", view: "radial", seeds: 2, clipMaeDeg: 6, uncertaintyDeg: 12.4 });
    // 2.06 x each finger's worse seed: index 4, middle 4, ring 6, little 9.
    expect(cell.byDigit!.map((f) => [f.digit, f.clipMaeDeg, f.uncertaintyDeg])).toEqual([["index", 4, 8.2], ["middle", 4, 8.2], ["ring", 6, 12.4], ["little", 9, 18.6]]);
    // With frame P90 columns (the "both" rows and the by-finger table): floors under the cell's and each finger's interval.
    const withP90 = (seed: number, mae: number, p90: number, split: number[], fingerP90: number[]) =>
      [
        `## Seeds ${seed}, gravity minimized`,
        "",
        "| motion | seed | reading | readings | detected | MAE ° | slope | frame P90 ° |\n| --- | --- | --- | ---: | ---: | ---: | ---: | ---: |",
        `| mcp.flexion | ${seed} | both | 40 | 100% | ${mae.toFixed(2)} | 0.9 | ${p90} |`,
        "",
        `${BOTH_BY_FINGER_HEADER} both: frame P90 ° |`,
        "| --- | --- | --- | ---: | ---: | ---: | ---: |",
        ...["index", "middle", "ring", "little"].map((f, i) => `| mcp.flexion | ${seed} | ${f} | 10 | 100% | ${split[i].toFixed(2)} | ${fingerP90[i]} |`),
        "",
      ].join("\n");
    const [floored] = parsePairCells([withP90(20261201, 5, 16, [3, 4, 6, 7], [6, 9, 20, 14]), withP90(20261202, 6, 11, [4, 3, 5, 9], [7, 8, 12, 25])].join("\n"));
    // 2.06 x 6 = 12.4 < 16 (the worse seed's P90); per finger the worse of 2.06 x MAE and its own worst P90.
    expect(floored).toMatchObject({ clipMaeDeg: 6, clipFramesP90Deg: 16, uncertaintyDeg: 16 });
    expect(floored.byDigit!.map((f) => [f.digit, f.clipFramesP90Deg, f.uncertaintyDeg])).toEqual([["index", 7, 8.2], ["middle", 9, 9], ["ring", 20, 20], ["little", 25, 25]]);
    // One seed not split by finger: no thumb-side cell at all.
    expect(parsePairCells([section(20261201, 5, [3, 4, 6, 7]), section(20261202, 6, null)].join("\n"))).toEqual([]);
  });

  it("pools the wrist readings made without a straight-wrist reading over the reports, weighting each row by its detected frames", () => {
    const table = (rows: string[]) =>
      ["| forearm line | model | readings | frames | detected | bias ° | MAE ° | peak MAE ° | clips |", "| --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | --- |", ...rows].join("\n");
    // 100 detected frames at 30 and 300 at 10: (3000 + 3000) / 400 = 15.
    const pooled = parseWithoutStraightWrist([
      table(["| capture-start | lite | 1 | 200 | 50% | -30 | 30 | 31 | a |"]),
      "# another report\n\n" + table(["| capture-start | full | 2 | 300 | 100% | -10 | 10 | 12 | b, c |"]),
    ]);
    expect(pooled).toEqual({ readings: 3, maeDeg: 15 });
    expect(parseWithoutStraightWrist(["# none\n"])).toBeNull();
    expect(() => parseWithoutStraightWrist([table(["| capture-start | lite | 1 | 200 | 50% | -30 | n/a | 31 | a |"])])).toThrow(
      /wrist row "capture-start, lite": expected a number of degrees for MAE °, got "n\/a"/,
    );
    // The motion rows' parser skips that table.
    expect(parseClipReports([table(["| capture-start | lite | 1 | 200 | 50% | -30 | 30 | 31 | a |"])])).toEqual([]);
  });

  it("reads the clip reports' engine and raw rows, the worse over their seeds", () => {
    const rows = readClipRows();
    // scripts/accuracy/clip-report.md: PIP flexion, ulnar, lite, engine 3.90, 3.81, 3.93 and 3.38 (seeds 20261210, 20261209,
    // 20261207, 20261205); clip-report-pip-dip-follows.md (the DIP bending along, read under kinarc-correction-10):
    // 4.32 and 4.40 (seeds 77000412, 20261238); the fresh check of 20261239: 4.70 (the PIP alone, clip-report-pip-check.md,
    // the worst) and 4.13 (the DIP along).
    const pip = rows.find((r) => r.group === "PIP flexion" && r.view === "ulnar" && r.model === "lite")!;
    const engineMaes = CLIP_REPORT_FILES.flatMap((file) =>
      [...readFileSync(file, "utf8").matchAll(/^\| PIP flexion \| ulnar \| lite \| engine \|(?:[^|]*\|){4}\s*([\d.]+)\s*\|/gm)].map((m) => Number(m[1])),
    );
    expect(engineMaes.length).toBeGreaterThanOrEqual(5);
    expect(pip.engineMaeDeg).toBe(Math.max(...engineMaes));
    expect(pip.engineMaeDeg).toBe(4.7);
    expect(pip.rawMaeDeg).toBeGreaterThan(pip.engineMaeDeg);
    // The gravity-minimized report adds the thumb-side view.
    expect(rows.some((r) => r.view === "radial" && r.group === "MCP flexion")).toBe(true);
  });

  it("splits a clip-measured cell by finger only where every seed that measured it was split", () => {
    // Two seeds of the thumb-side MCP cell (lite), each with its engine rows and its finger table; a third without one below.
    const motionTable = (mae: number) =>
      [
        "| motion | view | model | reading | readings | frames | detected | bias ° | MAE ° | slope |",
        "| --- | --- | --- | --- | ---: | ---: | ---: | ---: | ---: | ---: |",
        `| MCP flexion | radial | lite | engine | 40 | 100 | 99% | 0.1 | ${mae} | 0.9 |`,
        `| MCP flexion | radial | lite | raw | 40 | 100 | 99% | 0.1 | 30 | 0.9 |`,
      ].join("\n");
    const fingerTable = (maes: number[]) =>
      [
        "### By finger (engine)",
        "",
        "| motion | view | model | finger | readings | detected | bias ° | MAE ° | slope | within 10° | peak MAE ° | within stated ± |",
        "| --- | --- | --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |",
        ...["index", "middle", "ring", "little"].map((finger, i) => `| MCP flexion | radial | lite | ${finger} | 10 | 100% | 0.0 | ${maes[i]} | 1.00 | 90% | 3.0 | 90% |`),
      ].join("\n");
    const seedA = `## Seed 1\n\n${motionTable(8)}\n\n${fingerTable([3, 4, 9, 16])}\n`;
    const seedB = `## Seed 2\n\n${motionTable(7)}\n\n${fingerTable([2, 5, 12, 11])}\n`;
    // The finger table is not read as motion rows, and the motion rows count their seeds.
    expect(parseClipReports([seedA, seedB])).toEqual([{ group: "MCP flexion", view: "radial", model: "lite", engineMaeDeg: 8, rawMaeDeg: 30, seeds: 2 }]);
    const fingers = parseClipFingerRows([seedA, seedB]);
    expect(fingers.map((r) => [r.digit, r.engineMaeDeg, r.seeds])).toEqual([
      ["index", 3, 2],
      ["middle", 5, 2],
      ["ring", 12, 2],
      ["little", 16, 2],
    ]);
    const cellOf = (table: ReturnType<typeof deriveUncertaintyTable>) => table.cells.find((c) => c.group === "MCP flexion" && c.view === "radial" && c.model === "lite")!;
    const split = cellOf(deriveUncertaintyTable(report, [], CORRECTION_VERSION, parseClipReports([seedA, seedB]), null, fingers));
    // The still figure is the floor: report.md's corrected thumb-side MCP (lite) is 5.3, above the index finger's 3.
    expect(split.correctedMaeDeg).toBe(5.3);
    expect(split.byDigit?.map((f) => [f.digit, f.uncertaintyDeg])).toEqual([
      ["index", Math.round(2.0615 * 5.3 * 10) / 10],
      ["middle", Math.round(2.0615 * 5.3 * 10) / 10],
      ["ring", Math.round(2.0615 * 12 * 10) / 10],
      ["little", Math.round(2.0615 * 16 * 10) / 10],
    ]);
    // The pooled figure stays for readings of no one finger: the worse seed's engine MAE, 8.
    expect(split.uncertaintyDeg).toBe(Math.round(2.0615 * 8 * 10) / 10);
    // A third seed without a finger table: the cell is not split.
    const unsplit = cellOf(deriveUncertaintyTable(report, [], CORRECTION_VERSION, parseClipReports([seedA, seedB, `## Seed 3\n\n${motionTable(6)}\n`]), null, fingers));
    expect(unsplit.byDigit).toBeUndefined();
  });

  it("takes a cell's peak figure from the reports' peak P90, the worst seed, only where every seed gave one", () => {
    // A seed's table; with the P90s null, as a report written before the column was added.
    const seed = (n: number, engineP90: string | null, rawP90: string | null) =>
      [
        `## Seed ${n}`,
        "",
        `| motion | view | model | reading | readings | frames | detected | bias ° | MAE ° | peak MAE ° |${engineP90 === null ? "" : " peak P90 ° |"}`,
        `| --- | --- | --- | --- | ---: | ---: | ---: | ---: | ---: | ---: |${engineP90 === null ? "" : " ---: |"}`,
        `| wrist flexion (+) / extension (-) | ulnar | lite | engine | 20 | 100 | 99% | 0.1 | 2 | 4 |${engineP90 === null ? "" : ` ${engineP90} |`}`,
        `| wrist flexion (+) / extension (-) | ulnar | lite | raw | 20 | 100 | 99% | 0.1 | 3 | 5 |${rawP90 === null ? "" : ` ${rawP90} |`}`,
      ].join("\n");
    const [row] = parseClipReports([seed(1, "9.5", "12"), seed(2, "14.3", "11")]);
    expect(row).toMatchObject({ engineMaeDeg: 2, seeds: 2, enginePeakP90Deg: 14.3, rawPeakP90Deg: 12 });
    const cell = deriveUncertaintyTable(report, [], CORRECTION_VERSION, [row]).cells.find((c) => c.group === row.group && c.view === "ulnar" && c.model === "lite")!;
    expect([cell.clipPeakP90Deg, cell.clipRawPeakP90Deg]).toEqual([14.3, 12]);
    // A seed whose report predates the column, or whose readings found no peak ("-"): no figure rather than a partial one.
    const [partial] = parseClipReports([seed(1, "9.5", "12"), seed(3, null, null)]);
    expect(partial.seeds).toBe(2);
    expect(partial.enginePeakP90Deg).toBeUndefined();
    expect(parseClipReports([seed(1, "9.5", "12"), seed(2, "-", "-")])[0].enginePeakP90Deg).toBeUndefined();
    expect(() => parseClipReports([seed(1, "n/a", "12")])).toThrow(/motion row "wrist flexion \(\+\) \/ extension \(-\), ulnar, lite, engine": expected a number of degrees for peak P90 °, got "n\/a"/);
  });

  it("keeps a cell's and a finger's interval at least their frames' P90, the worst seed, only where every seed gave one", () => {
    const seed = (n: number, engineP90: string | null, fingerP90s: number[] | null) =>
      [
        `## Seed ${n}`,
        "",
        `| motion | view | model | reading | readings | frames | detected | bias ° | MAE ° |${engineP90 === null ? "" : " frame P90 ° |"}`,
        `| --- | --- | --- | --- | ---: | ---: | ---: | ---: | ---: |${engineP90 === null ? "" : " ---: |"}`,
        `| PIP flexion | radial | lite | engine | 40 | 100 | 99% | 0.1 | 6 |${engineP90 === null ? "" : ` ${engineP90} |`}`,
        `| PIP flexion | radial | lite | raw | 40 | 100 | 99% | 0.1 | 20 |${engineP90 === null ? "" : " 41.5 |"}`,
        "",
        `| motion | view | model | finger | readings | detected | bias ° | MAE ° |${fingerP90s === null ? "" : " frame P90 ° |"}`,
        `| --- | --- | --- | --- | ---: | ---: | ---: | ---: |${fingerP90s === null ? "" : " ---: |"}`,
        ...["index", "middle", "ring", "little"].map((f, i) => `| PIP flexion | radial | lite | ${f} | 10 | 100% | 0.0 | ${4 + i} |${fingerP90s === null ? "" : ` ${fingerP90s[i]} |`}`),
      ].join("\n");
    const cellOf = (markdowns: string[]) =>
      deriveUncertaintyTable(report, [], CORRECTION_VERSION, parseClipReports(markdowns), null, parseClipFingerRows(markdowns)).cells.find(
        (c) => c.group === "PIP flexion" && c.view === "radial" && c.model === "lite",
      )!;
    const both = cellOf([seed(1, "20.5", [9, 10, 30, 12]), seed(2, "18", [8, 11, 14, 35])]);
    // report.md's still figure for the cell (the method the engine uses there), above the clips' MAE of 6.
    const still = both.correctionHelps ? both.correctedMaeDeg! : Math.max(both.rawMaeDeg, both.rawAnyPoseMaeDeg ?? 0);
    expect(2.0615 * Math.max(still, 6)).toBeLessThan(20.5);
    // The normal rule on the worse MAE falls short of the frames' P90 of 20.5, which stands.
    expect([both.clipFramesP90Deg, both.clipRawFramesP90Deg, both.uncertaintyDeg]).toEqual([20.5, 41.5, 20.5]);
    // Each finger: the worse of the normal rule on its own MAE and its own worst-seed P90.
    expect(both.byDigit!.map((f) => f.clipFramesP90Deg)).toEqual([9, 11, 30, 35]);
    expect(both.byDigit!.map((f) => f.uncertaintyDeg)).toEqual([9, 11, 30, 35].map((p90, i) => Math.round(Math.max(p90, 2.0615 * Math.max(still, 4 + i)) * 10) / 10));
    // A seed without the column: no frame figure, the normal rule alone.
    const older = cellOf([seed(1, "20.5", [9, 10, 30, 12]), seed(2, null, null)]);
    expect(older.clipFramesP90Deg).toBeUndefined();
    expect(older.byDigit!.every((f) => f.clipFramesP90Deg === undefined)).toBe(true);
    expect(older.uncertaintyDeg).toBe(Math.round(2.0615 * Math.max(still, 6) * 10) / 10);
  });

  it("names the clip row whose MAE is not a number", () => {
    const table = [
      "| motion | view | model | reading | readings | frames | detected | bias ° | MAE ° | slope |",
      "| --- | --- | --- | --- | ---: | ---: | ---: | ---: | ---: | ---: |",
      "| PIP flexion | ulnar | lite | engine | 40 | 100 | 99% | 0.1 | x | 0.9 |",
    ].join("\n");
    expect(() => parseClipReports([table])).toThrow(/motion row "PIP flexion, ulnar, lite, engine": expected a number of degrees for MAE °, got "x"/);
  });

  it("reads the report's own rows: PIP flexion, ulnar view, lite model, 27.3 raw and 4.2 corrected", () => {
    const find = (method: "raw 3-D" | "corrected") => report["test motions"][method].find((r) => r.group === "PIP flexion" && r.view === "ulnar" && r.model === "lite")!;
    // Figures as the report prints them; the check is that parsing lands on that row's MAE column.
    expect(find("raw 3-D").maeDeg).toBe(27.3);
    expect(find("corrected").maeDeg).toBe(4.2);
    const cell = UNCERTAINTY_TABLE.cells.find((c) => c.group === "PIP flexion" && c.view === "ulnar" && c.model === "lite")!;
    expect(cell.source).toBe("test motions");
    expect(cell.correctionHelps).toBe(true);
  });

  it("reads the single-finger rows: DIP flexion, radial view, full model, 58.3 raw and 40.1 corrected, read as the four-finger cell is", () => {
    const find = (method: "raw 3-D" | "corrected") => report["single finger"][method].find((r) => r.group === "DIP flexion" && r.view === "radial" && r.model === "full")!;
    expect(find("raw 3-D").maeDeg).toBe(58.3);
    expect(find("corrected").maeDeg).toBe(40.1);
    // Every single-finger cell takes the method the engine uses in the four-finger cell of the same group, view and model.
    expect(UNCERTAINTY_TABLE.fingerAlone?.length).toBe(report["single finger"]["raw 3-D"].length);
    for (const alone of UNCERTAINTY_TABLE.fingerAlone ?? []) {
      const cell = UNCERTAINTY_TABLE.cells.find((c) => c.group === alone.group && c.view === alone.view && c.model === alone.model)!;
      expect(alone.maeDeg).toBe(cell.correctionHelps ? alone.correctedMaeDeg : alone.rawMaeDeg);
      expect(alone.uncertaintyDeg).toBeCloseTo(2.06 * alone.maeDeg, 0);
    }
  });

  it("gives a lone finger its own interval where one-finger clips measured it: frames and peaks, the worst seed; none without every seed's peak", () => {
    const lone = (seed: number, mae: number, p90: number, peak: string) =>
      [
        `## Seed ${seed}`,
        "",
        "### By finger (engine)",
        "",
        "| motion | view | model | finger | readings | detected | bias ° | MAE ° | slope | within 10° | peak MAE ° | frame P90 ° | within stated ± |",
        "| --- | --- | --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |",
        `| PIP flexion | ulnar | lite | little | 6 | 100% | -1.0 | ${mae} | 0.95 | 90% | ${peak} | ${p90} | 95% |`,
      ].join("\n");
    const alone = (markdowns: string[]) =>
      deriveUncertaintyTable(report, [], CORRECTION_VERSION, [], null, [], [], parseClipFingerRows(markdowns)).fingerAlone!;
    const cellOf = (cells: ReturnType<typeof alone>, view: string) => cells.find((c) => c.group === "PIP flexion" && c.view === view && c.model === "lite")!;
    const rows = parseClipFingerRows([lone(1, 5, 9, "7"), lone(2, 4, 14, "3")]);
    expect(rows).toEqual([{ group: "PIP flexion", view: "ulnar", model: "lite", digit: "little", engineMaeDeg: 5, seeds: 2, engineFramesP90Deg: 14, enginePeakMaeDeg: 7 }]);
    const measured = alone([lone(1, 5, 9, "7"), lone(2, 4, 14, "3")]);
    // Frames: 2.06 x 5 = 10.3, never narrower than the frame P90 14; peaks: 2.06 x 7 = 14.4, the wider.
    expect(cellOf(measured, "ulnar").byDigit).toEqual([{ digit: "little", clipMaeDeg: 5, clipFramesP90Deg: 14, clipPeakMaeDeg: 7, uncertaintyDeg: Math.round(2.0615 * 7 * 10) / 10 }]);
    // The cell's own figure (report.md's single-finger stills) stays for the other fingers, and other views are untouched.
    expect(cellOf(measured, "ulnar").uncertaintyDeg).toBe(cellOf(alone([]), "ulnar").uncertaintyDeg);
    expect(cellOf(measured, "radial").byDigit).toBeUndefined();
    // A seed whose lone readings never found a peak ("-"): no figure of the finger's own.
    expect(cellOf(alone([lone(1, 5, 9, "7"), lone(2, 4, 14, "-")]), "ulnar").byDigit).toBeUndefined();
  });

  it("every test-motion row of the report is a cell; random-pose rows fill the rest", () => {
    for (const row of report["test motions"]["raw 3-D"]) {
      const cell = UNCERTAINTY_TABLE.cells.find((c) => c.group === row.group && c.view === row.view && c.model === row.model)!;
      expect(cell.source).toBe("test motions");
      expect(cell.rawMaeDeg).toBe(row.maeDeg);
    }
    expect(UNCERTAINTY_TABLE.cells.some((c) => c.source === "random poses")).toBe(true);
  });

  it("applies the correction only where it wins by more than two standard errors of the raw MAE", () => {
    // |e| of a normal error: mean sigma*sqrt(2/pi), SD sigma*sqrt(1-2/pi); their ratio is sqrt(pi/2-1) (half-normal
    // distribution, e.g. Leone, Nelson & Nottingham, Technometrics 3(4), 1961).
    expect(ABS_ERROR_SD_PER_MEAN).toBeCloseTo(Math.sqrt(1 - 2 / Math.PI) / Math.sqrt(2 / Math.PI), 12);
    // 160 samples at 39.7: SE 2.37, so 36.3 (a 3.4 degree win) is within noise and 34.9 is not.
    expect(correctionClearlyHelps(39.7, 36.3, 160)).toBe(false);
    expect(correctionClearlyHelps(39.7, 34.9, 160)).toBe(true);
    expect(correctionClearlyHelps(27.6, 5.1, 140)).toBe(true);
    // The committed table follows the rule in every cell.
    for (const c of UNCERTAINTY_TABLE.cells) {
      expect(c.correctionHelps).toBe(c.correctedMaeDeg !== null && correctionClearlyHelps(c.rawMaeDeg, c.correctedMaeDeg, c.samples));
    }
  });

  it("names the table that is missing", () => {
    expect(() => parseAccuracyReport("# nothing here\n")).toThrow(/expected a table "test motions \/ raw 3-D"/);
  });

  it("names the row whose MAE is not a number", () => {
    const broken = readFileSync(REPORT_FILE, "utf8").replace("| MCP flexion | radial | lite | 144 | 89% | 5.7 | 14.8 |", "| MCP flexion | radial | lite | 144 | 89% | 5.7 | abc |");
    expect(() => parseAccuracyReport(broken)).toThrow(/MCP flexion, radial, lite.*expected a number of degrees for MAE, got "abc"/);
  });
});

describe("declined frames seen side-on (withDeclinedFigures, the side-on whole-hand shapes' held-out rows)", () => {
  const cell = { ...UNCERTAINTY_TABLE.cells.find((c) => c.group === "MCP flexion" && c.view === "ulnar" && c.model === "full")!, declinedBySideFit: undefined };
  const row = (correctionHelps: boolean, rawMaeDeg: number | null = 20) => ({
    group: "MCP flexion",
    view: "ulnar",
    model: "full",
    declined: { samples: 100, rawMaeDeg, rawP90Deg: rawMaeDeg === null ? null : 30, afterMaeDeg: 5, afterP90Deg: 12, correctionHelps },
  });

  it("gives the cell the normal rule on their MAE, never narrower than their P90, for raw and (where it helps) the side-on fit", () => {
    const [out] = withDeclinedFigures([cell], [row(true)]);
    // 2.06 x 20 = 41.2 is wider than the P90 of 30; 2.06 x 5 = 10.3 narrower than the P90 of 12.
    expect(out.declinedBySideFit).toMatchObject({ samples: 100, sideOnFitHelps: true, rawUncertaintyDeg: 41.2, sideOnFitUncertaintyDeg: 12 });
    expect(withDeclinedFigures([cell], [row(false)])[0].declinedBySideFit).toMatchObject({ sideOnFitHelps: false, sideOnFitUncertaintyDeg: null });
    // The input cells are not changed.
    expect(cell.declinedBySideFit).toBeUndefined();
  });

  it("adds nothing for a row with no declined frame, and refuses a row whose cell the table lacks", () => {
    expect(withDeclinedFigures([cell], [row(true, null)])[0].declinedBySideFit).toBeUndefined();
    expect(() => withDeclinedFigures([cell], [{ ...row(true), view: "palm" }])).toThrow(/no cell MCP flexion \| palm \| full/);
  });
});
