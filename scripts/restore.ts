import { existsSync, readFileSync } from "node:fs";
import { restoreDatabase } from "@/lib/backup";
import { env } from "@/lib/env";

// npm run db:restore -- FILE [--force]: replaces DATABASE_URL's file with a checked backup. Stop Kinarc first.
async function main() {
  const file = process.argv.slice(2).find((a) => !a.startsWith("--"));
  if (!file) throw new Error("Usage: npm run db:restore -- path/to/backup.db [--force]");
  const shaFile = `${file}.sha256`;
  const expectSha256 = existsSync(shaFile) ? readFileSync(shaFile, "utf8").split(/\s+/)[0] : undefined;
  const result = await restoreDatabase(file, env().DATABASE_URL, { force: process.argv.includes("--force"), expectSha256 });
  console.log(`Restored ${file} to ${result.file} (${result.migrations} migrations recorded). Run npm run db:migrate if the code is newer than the backup.`);
}

main().catch((error) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
