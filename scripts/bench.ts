// npm run bench [-- NAME...] [-- --option ...]
// Runs every benchmark in scripts/bench/ in turn (or only those named: `engine`, `tracking`, ...), each in its own
// process so one's warm-up and memory don't colour the next. Options starting with -- go to every benchmark run.
import { spawnSync } from "node:child_process";
import { readdirSync } from "node:fs";
import path from "node:path";

const benchDir = path.join(__dirname, "bench");
const args = process.argv.slice(2);
const names = args.filter((a) => !a.startsWith("-"));
const passOn = args.filter((a) => a.startsWith("-") || !names.includes(a));
const available = readdirSync(benchDir)
  .filter((f) => f.endsWith(".ts") && !f.endsWith(".test.ts"))
  .map((f) => f.slice(0, -3))
  .sort();

const unknown = names.filter((n) => !available.includes(n.replace(/\.ts$/, "")));
if (unknown.length > 0) {
  process.stderr.write(`bench: no benchmark named ${unknown.join(", ")} (expected one of ${available.join(", ")})\n`);
  process.exit(2);
}
const chosen = names.length > 0 ? names.map((n) => n.replace(/\.ts$/, "")) : available;

let failed = 0;
for (const name of chosen) {
  process.stdout.write(`\n== ${name} ==\n`);
  const result = spawnSync(process.execPath, ["--import", "tsx", path.join(benchDir, `${name}.ts`), ...passOn], { stdio: "inherit" });
  if (result.status !== 0) {
    failed++;
    process.stdout.write(`${name}: exited with ${result.status ?? result.signal}\n`);
  }
}
process.exit(failed > 0 ? 1 : 0);
