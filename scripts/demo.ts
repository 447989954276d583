import { LOCAL_DEFAULTS } from "@/lib/env";
import { localEnv, runCommand, startLocalStack } from "./lib/local-stack";
import { startJobLoop } from "./jobs";
import { printSignIns } from "./seed";

/**
 * `npm run demo`: migrate, seed the fictional demo clinic if the database is empty, build the models and the app,
 * then serve Kinarc on http://localhost:3000 with every local stand-in (mail catcher, media server).
 */
const opts = {
  appPort: Number(process.env.PORT ?? 3000),
  smtpPort: 1025,
  mailHttpPort: 1080,
  mediaPort: 7880,
  databaseUrl: process.env.DATABASE_URL ?? "file:./data/kinarc.db",
  verbose: true,
};

async function main() {
  const env = localEnv(opts);
  Object.assign(process.env, { ...env, NODE_ENV: "development" });
  const step = (label: string, args: string[], extra: Record<string, string> = {}) =>
    runCommand(process.execPath, args, { ...env, ...extra }, label);
  await step("migrate", ["node_modules/tsx/dist/cli.mjs", "scripts/migrate.ts"]);
  await step("seed", ["node_modules/tsx/dist/cli.mjs", "scripts/seed.ts"]);
  await step("models", ["node_modules/tsx/dist/cli.mjs", "scripts/build-models.ts"]);
  await step("build", ["node_modules/next/dist/bin/next", "build"]);
  const stack = await startLocalStack(opts);
  // Reminders and missed visits, once a minute (production runs `npm run jobs` from cron instead).
  const stopJobs = startJobLoop(60);
  console.log(`\nKinarc is running at ${stack.appUrl}`);
  console.log(`  Local mail (development stand-in):  ${stack.mailUrl}`);
  console.log(`  Local media server (development stand-in): ${stack.mediaUrl}  key ${LOCAL_DEFAULTS.DEV_LIVEKIT_KEY}`);
  printSignIns(stack.appUrl);
  console.log("\nPress Ctrl+C to stop.");
  const shutdown = () => {
    stopJobs();
    stack.stop().finally(() => process.exit(0));
  };
  process.on("SIGINT", shutdown);
  process.on("SIGTERM", shutdown);
}

main().catch((error) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
