import { describe, expect, it } from "vitest";
import { spliceReport } from "./splice-report";

const REPORT = [
  "# Report",
  "",
  "## Seed 11 (10 clips per motion)",
  "",
  "Old note.",
  "",
  "- PIP flexion, radial, lite: misses (MAE 7.48)",
  "- wrist flexion, radial, lite: meets (MAE 1.69)",
  "",
  "| motion | view | model | reading | MAE ° |",
  "| --- | --- | --- | --- | ---: |",
  "| PIP flexion | radial | lite | engine | 7.48 |",
  "| wrist flexion | radial | lite | engine | 1.69 |",
  "",
  "## Seed 12 (10 clips per motion)",
  "",
  "| PIP flexion | radial | lite | engine | 5.00 |",
  "",
  "## Wrist readings without a straight-wrist reading",
  "",
  "| PIP flexion | radial | lite | engine | 99 |",
].join("\n");

describe("spliceReport", () => {
  it("replaces the rows, lines and note the new reading has, within the same seed, and keeps the rest", () => {
    const fresh = ["## Seed 11 (10 clips per motion)", "", "New note.", "", "- PIP flexion, radial, lite: meets (MAE 4.90)", "", "| PIP flexion | radial | lite | engine | 4.90 |"].join("\n");
    const { text, replaced } = spliceReport(REPORT, fresh);
    expect(replaced).toBe(3);
    expect(text).toContain("New note.");
    expect(text).not.toContain("Old note.");
    expect(text).toContain("- PIP flexion, radial, lite: meets (MAE 4.90)");
    expect(text).toContain("| PIP flexion | radial | lite | engine | 4.90 |");
    // The wrist's rows, the other seed's row and the row outside any seed section stand.
    expect(text).toContain("| wrist flexion | radial | lite | engine | 1.69 |");
    expect(text).toContain("| PIP flexion | radial | lite | engine | 5.00 |");
    expect(text).toContain("| PIP flexion | radial | lite | engine | 99 |");
    expect(text.split("\n")).toHaveLength(REPORT.split("\n").length);
  });

  it("refuses a new row the report lacks, naming it", () => {
    const fresh = ["## Seed 11 (10 clips per motion)", "", "| DIP flexion | radial | lite | engine | 9.0 |"].join("\n");
    expect(() => spliceReport(REPORT, fresh)).toThrow(/none for "11 row DIP flexion \| radial \| lite \| engine"/);
  });
});
