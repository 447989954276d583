import path from "node:path";
import { defineConfig } from "vitest/config";

// Browser suites: playwright-core drives Debian's Chromium against the built app.
// One file at a time: the machine has two cores and every suite starts its own server.
export default defineConfig({
  resolve: { alias: { "@": path.resolve(__dirname) } },
  test: {
    include: ["tests/e2e/**/*.test.ts"],
    // Tests of the support code need no app or browser; they run with the unit tests.
    exclude: ["tests/e2e/support/**"],
    environment: "node",
    pool: "forks",
    fileParallelism: false,
    testTimeout: 120_000,
    hookTimeout: 180_000,
    globalSetup: ["tests/e2e/global-setup.ts"],
  },
});
