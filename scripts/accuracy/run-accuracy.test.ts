import { describe, expect, it } from "vitest";
import { withKeptSections } from "./run-accuracy";

describe("a new accuracy report keeps the sections other tools wrote", () => {
  it("carries a marked section over, once, after the new tables, and drops the old tables", () => {
    const section = "<!-- wrist-axis: begin (scripts/accuracy/wrist-axis.ts) -->\n## Wrist forearm line\n| a |\n<!-- wrist-axis: end -->";
    const previous = `# Angle accuracy\n\n## Old table\n| old |\n\n${section}\n`;
    const next = withKeptSections("# Angle accuracy\n\n## New table\n| new |\n", previous);
    expect(next).toContain("| new |");
    expect(next).not.toContain("| old |");
    expect(next.split("wrist-axis: begin")).toHaveLength(2);
    expect(next.indexOf("| new |")).toBeLessThan(next.indexOf(section));
  });

  it("leaves a report alone when the old one had no marked section", () => {
    expect(withKeptSections("# r\n", "# old\n")).toBe("# r\n");
  });
});
