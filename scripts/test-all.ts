import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, rmSync } from "node:fs";
import path from "node:path";
import { localEnv } from "./lib/local-stack";

/**
 * `npm test`: every check Kinarc has, in order — typecheck, lint, unit and integration tests, the production build,
 * browser tests — and one closing line `N passed, N failed` summed over all of them. Installs Debian's Chromium and
 * ffmpeg when they are missing and we are root; otherwise stops and says how.
 */
const ROOT = path.resolve(__dirname, "..");
const REPORTS = path.join(ROOT, "tests/.cache/reports");

interface Tally {
  passed: number;
  failed: number;
  skipped: number;
}
const total: Tally = { passed: 0, failed: 0, skipped: 0 };
const lines: string[] = [];

function run(cmd: string, args: string[], env: Record<string, string> = {}): number {
  const result = spawnSync(cmd, args, { cwd: ROOT, stdio: "inherit", env: { ...process.env, ...env } });
  return result.status ?? 1;
}

function ensureSystemPackages() {
  const missing = [
    ["/usr/bin/chromium", "chromium"],
    ["/usr/bin/ffmpeg", "ffmpeg"],
  ].filter(([file]) => !existsSync(file));
  if (!missing.length) return;
  const names = missing.map(([, pkg]) => pkg);
  if (process.getuid?.() !== 0) {
    console.error(`Browser tests need Debian packages: ${names.join(" ")}. Install them with:\n  sudo apt-get update && sudo apt-get install -y ${names.join(" ")}`);
    process.exit(1);
  }
  console.log(`Installing ${names.join(", ")} from Debian…`);
  if (run("apt-get", ["update", "-qq"]) !== 0 || run("apt-get", ["install", "-y", "-qq", ...names], { DEBIAN_FRONTEND: "noninteractive" }) !== 0) {
    console.error(`Could not install ${names.join(" ")} with apt-get.`);
    process.exit(1);
  }
}

/** A check that is one pass or one failure (typecheck, lint, build). */
function check(label: string, cmd: string, args: string[], env: Record<string, string> = {}) {
  console.log(`\n▶ ${label}`);
  const ok = run(cmd, args, env) === 0;
  total[ok ? "passed" : "failed"] += 1;
  lines.push(`${label}: ${ok ? "passed" : "FAILED"}`);
  return ok;
}

/** A vitest run; its JSON report gives the counts. A run that crashes before reporting counts as one failure. */
function vitest(label: string, args: string[], env: Record<string, string> = {}) {
  console.log(`\n▶ ${label}`);
  const report = path.join(REPORTS, `${label.replace(/\W+/g, "-")}.json`);
  rmSync(report, { force: true });
  const node = process.execPath;
  const code = run(node, ["node_modules/vitest/vitest.mjs", "run", ...args, "--reporter=default", "--reporter=json", `--outputFile.json=${report}`], env);
  if (!existsSync(report)) {
    total.failed += 1;
    lines.push(`${label}: crashed before reporting (exit ${code})`);
    return;
  }
  const r = JSON.parse(readFileSync(report, "utf8")) as {
    testResults: { status: string; assertionResults: { status: string }[] }[];
  };
  let passed = 0;
  let failed = 0;
  let skipped = 0;
  for (const file of r.testResults) {
    const statuses = file.assertionResults.map((a) => a.status);
    const fileFailed = file.status === "failed";
    passed += statuses.filter((s) => s === "passed").length;
    if (fileFailed && !statuses.includes("failed")) {
      // The file failed outside any test (setup, import, hook): each of its tests that did not pass failed, or the
      // file counts once when it had none.
      failed += Math.max(1, statuses.filter((s) => s !== "passed").length);
    } else {
      failed += statuses.filter((s) => s === "failed").length;
      skipped += statuses.filter((s) => s === "skipped" || s === "pending" || s === "todo").length;
    }
  }
  total.passed += passed;
  total.failed += failed;
  total.skipped += skipped;
  lines.push(`${label}: ${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ""}`);
  if (code !== 0 && failed === 0) {
    total.failed += 1;
    lines.push(`${label}: exited ${code} without a failed test`);
  }
}

mkdirSync(REPORTS, { recursive: true });
ensureSystemPackages();
const node = process.execPath;
const tsx = ["node_modules/tsx/dist/cli.mjs"];
const env = { ...localEnv({ appPort: 3100, smtpPort: 2525, mailHttpPort: 2580, mediaPort: 7890, databaseUrl: "file:./tests/.cache/build.db" }), NODE_ENV: "test" };

check("typecheck", node, ["node_modules/typescript/bin/tsc", "--noEmit", "-p", "."]);
check("lint", node, ["node_modules/eslint/bin/eslint.js", "."]);
check("models", node, [...tsx, "scripts/build-models.ts"]);
vitest("unit and integration", []);
const built = check("build", node, ["node_modules/next/dist/bin/next", "build"], { ...env, NODE_ENV: "production" });
if (built) vitest("browser", ["-c", "vitest.e2e.config.ts"]);
else lines.push("browser: not run (the build failed)");

console.log("\n" + lines.join("\n"));
console.log(`${total.passed} passed, ${total.failed} failed${total.skipped ? `, ${total.skipped} skipped` : ""}`);
process.exit(total.failed > 0 ? 1 : 0);
