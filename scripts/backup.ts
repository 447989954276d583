import path from "node:path";
import { writeFileSync } from "node:fs";
import { backupDatabase } from "@/lib/backup";
import { env } from "@/lib/env";

// npm run db:backup [-- --out FILE]: an online, consistent copy of the database (the app may keep running).
async function main() {
  const e = env();
  const outArg = process.argv.find((a) => a.startsWith("--out="))?.slice(6);
  const stamp = new Date().toISOString().replace(/[-:]/g, "").replace("T", "-").slice(0, 15);
  const out = outArg ?? path.join("data", "backups", `kinarc-${stamp}.db`);
  const result = await backupDatabase(e.DATABASE_URL, out);
  writeFileSync(`${result.file}.sha256`, `${result.sha256}  ${path.basename(result.file)}\n`);
  console.log(`Backup written: ${result.file} (${result.bytes} bytes, SHA-256 ${result.sha256})`);
  if (e.STORAGE_DRIVER === "disk") console.log(`Uploaded files are not inside the database: back up ${e.UPLOADS_DIR} with your file backups.`);
}

main().catch((error) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
