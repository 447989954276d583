import { existsSync } from "node:fs";
import { CHROMIUM_PATH } from "./support/browser";

// Browser suites need Debian's Chromium; `npm test` installs it when it can. Fail early with the fix.
export default function setup() {
  if (!existsSync(CHROMIUM_PATH)) {
    throw new Error(`Chromium not found at ${CHROMIUM_PATH}. Install it with: apt-get update && apt-get install -y chromium`);
  }
}
