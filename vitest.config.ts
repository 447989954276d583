import path from "node:path";
import { defineConfig } from "vitest/config";

// Unit tests sit beside the module they test; integration suites live in tests/integration.
// Browser suites (tests/e2e) have their own config (their support code's own tests run here): they need a built app and Chromium.
export default defineConfig({
  resolve: { alias: { "@": path.resolve(__dirname) } },
  test: {
    include: ["vision/**/*.test.ts", "lib/**/*.test.ts", "db/**/*.test.ts", "scripts/**/*.test.ts", "tests/integration/**/*.test.ts", "tests/e2e/support/**/*.test.ts"],
    environment: "node",
    pool: "forks",
    testTimeout: 30_000,
    // next-auth imports "next/server" without an extension, which Node's ESM resolver refuses; let Vite resolve it.
    server: { deps: { inline: ["next-auth"] } },
  },
});
