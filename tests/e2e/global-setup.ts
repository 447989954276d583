import { existsSync } from "node:fs";
import { hasBuild, localEnv, runCommand } from "../../scripts/lib/local-stack";
import { CHROMIUM_PATH } from "./support/browser";
import { TEST_PORTS } from "./support/app";

// Browser suites need Debian's Chromium (`npm test` installs it when it can) and a built app (`npm test` builds it;
// when a suite is run alone and no build exists, build once here). Fail early with the fix.
export default async function setup() {
  if (!existsSync(CHROMIUM_PATH)) {
    throw new Error(`Chromium not found at ${CHROMIUM_PATH}. Install it with: apt-get update && apt-get install -y chromium`);
  }
  if (!hasBuild()) {
    const env = localEnv({ ...TEST_PORTS, databaseUrl: "file:./tests/.cache/build.db" });
    await runCommand(process.execPath, ["node_modules/next/dist/bin/next", "build"], env, "next build");
  }
}
