/**
 * Re-read part of a clip report without its other rows: the rows a new reading has replace the same rows of the report,
 * and everything else stands as written.
 *
 * Why: an engine change that touches the finger estimator leaves the wrist's readings as they were, and a report's
 * wrist clips may no longer be saved on this machine (rendering and tracking them again costs minutes a seed). Read the
 * finger motions again (`clip-validation.ts --reuse --motions mcp.flexion,pip.flexion,dip.flexion --out NEW`) and splice:
 *
 *   npx tsx scripts/accuracy/splice-report.ts --into scripts/accuracy/clip-report-gravity-minimized.md --from NEW
 *
 * Within each seed's section ("## Seed N ..."), a table row is known by its first four cells (motion, view, model and
 * the reading or finger), an acceptance line by the text before its colon, and the seed's note by its place (the first
 * paragraph under the heading). Every such line of NEW must replace one of the report's; a row NEW has that the report
 * lacks is an error, since the splice would then drop or misplace it. Lines NEW lacks stay as they were.
 */
import { readFileSync, writeFileSync } from "node:fs";
import { parseArgs } from "node:util";
import path from "node:path";

const SEED_HEADING = /^## Seed (\d+)\b/;

/** The key of a line that a splice may replace, or null for any other line. */
export function lineKey(line: string, seed: string | null, isNote: boolean): string | null {
  if (seed === null) return null;
  if (isNote) return `${seed} note`;
  if (line.startsWith("| ") && !line.startsWith("| ---") && !line.startsWith("| motion ")) {
    const cells = line.split("|").slice(1, 5).map((c) => c.trim());
    return cells.length === 4 ? `${seed} row ${cells.join(" | ")}` : null;
  }
  const bullet = /^- ([^:]+):/.exec(line);
  return bullet ? `${seed} bullet ${bullet[1]}` : null;
}

/** Each line with its key, in order (the seed section a line falls in, and whether it is the seed's note). */
function keyedLines(text: string): { line: string; key: string | null }[] {
  let seed: string | null = null;
  let noteOpen = false;
  return text.split("\n").map((line) => {
    const heading = SEED_HEADING.exec(line);
    if (heading || line.startsWith("## ")) {
      seed = heading ? heading[1] : null;
      noteOpen = Boolean(heading);
      return { line, key: null };
    }
    // The note: the first non-empty line under the seed's heading, unless that is a heading, a table or a bullet.
    const isNote = noteOpen && line.trim() !== "" && !/^[#|-]/.test(line);
    if (line.trim() !== "") noteOpen = false;
    return { line, key: lineKey(line, seed, isNote) };
  });
}

/** The report with every keyed line of `fresh` put in place of the report's line with the same key. */
export function spliceReport(report: string, fresh: string): { text: string; replaced: number } {
  const news = new Map<string, string>();
  for (const { line, key } of keyedLines(fresh)) {
    if (key === null) continue;
    if (news.has(key)) throw new Error(`--from: the key "${key}" appears twice`);
    news.set(key, line);
  }
  const used = new Set<string>();
  const out = keyedLines(report).map(({ line, key }) => {
    if (key === null || !news.has(key)) return line;
    used.add(key);
    return news.get(key)!;
  });
  const missing = [...news.keys()].filter((key) => !used.has(key));
  if (missing.length) throw new Error(`--into: expected a line for every row of --from; none for ${missing.slice(0, 5).map((k) => `"${k}"`).join(", ")}`);
  return { text: out.join("\n"), replaced: used.size };
}

function main(): void {
  const { values } = parseArgs({ options: { into: { type: "string" }, from: { type: "string" }, out: { type: "string" } } });
  if (!values.into) throw new Error("--into: expected the report to splice into");
  if (!values.from) throw new Error("--from: expected the new reading (a clip report of the same seeds)");
  const { text, replaced } = spliceReport(readFileSync(values.into, "utf8"), readFileSync(values.from, "utf8"));
  writeFileSync(values.out ?? values.into, text);
  console.log(`${replaced} lines replaced in ${values.out ?? values.into}`);
}

if (!process.env.VITEST && path.resolve(process.argv[1] ?? "") === path.resolve(__filename)) {
  try {
    main();
  } catch (error) {
    console.error(error instanceof Error ? error.message : error);
    process.exit(2);
  }
}
