import { createHash } from "node:crypto";
import { copyFileSync, existsSync, mkdirSync, readFileSync, renameSync, rmSync, statSync } from "node:fs";
import path from "node:path";
import { createClient } from "@libsql/client";

export class BackupError extends Error {}

function filePath(url: string): string {
  if (!url.startsWith("file:")) throw new BackupError(`Only file: databases can be backed up here; got ${url.split(":")[0]}: (back up a libSQL server with its own tools).`);
  return path.resolve(url.slice("file:".length));
}

async function integrityOf(file: string): Promise<{ ok: boolean; detail: string; migrations: number }> {
  const client = createClient({ url: `file:${file}` });
  try {
    const check = await client.execute("PRAGMA integrity_check");
    const detail = check.rows.map((r) => String(Object.values(r)[0])).join("; ");
    const migrations = await client.execute("SELECT count(*) AS n FROM __drizzle_migrations").catch(() => null);
    return { ok: detail === "ok", detail, migrations: migrations ? Number(migrations.rows[0].n) : 0 };
  } catch (error) {
    return { ok: false, detail: (error as Error).message, migrations: 0 };
  } finally {
    client.close();
  }
}

export interface BackupResult {
  file: string;
  bytes: number;
  sha256: string;
}

/**
 * A consistent copy of a live database with SQLite's `VACUUM INTO` (an online backup: readers and writers carry on;
 * the copy is one transaction's snapshot, per the SQLite documentation of VACUUM INTO), checked with
 * `PRAGMA integrity_check` and written with its SHA-256 beside it.
 */
export async function backupDatabase(sourceUrl: string, outFile: string): Promise<BackupResult> {
  const source = filePath(sourceUrl);
  if (!existsSync(source)) throw new BackupError(`No database at ${source}.`);
  const target = path.resolve(outFile);
  if (existsSync(target)) throw new BackupError(`${target} already exists; choose a new name.`);
  mkdirSync(path.dirname(target), { recursive: true });
  const client = createClient({ url: `file:${source}`, timeout: 5000 });
  try {
    await client.execute({ sql: "VACUUM INTO ?", args: [target] });
  } finally {
    client.close();
  }
  const check = await integrityOf(target);
  if (!check.ok) {
    rmSync(target, { force: true });
    throw new BackupError(`The copy failed its integrity check (${check.detail}); nothing was kept.`);
  }
  const sha256 = createHash("sha256").update(readFileSync(target)).digest("hex");
  return { file: target, bytes: statSync(target).size, sha256 };
}

/**
 * Puts a backup in place of the database at `targetUrl`. Run with Kinarc stopped. The backup is checked first
 * (integrity, Kinarc's migrations table, and the SHA-256 if given); it is copied beside the target and renamed over it,
 * so a failure halfway leaves the old database untouched.
 */
export async function restoreDatabase(backupFile: string, targetUrl: string, opts: { force?: boolean; expectSha256?: string } = {}): Promise<{ file: string; migrations: number }> {
  const source = path.resolve(backupFile);
  if (!existsSync(source)) throw new BackupError(`No backup at ${source}.`);
  if (opts.expectSha256) {
    const actual = createHash("sha256").update(readFileSync(source)).digest("hex");
    if (actual !== opts.expectSha256) throw new BackupError(`The backup's SHA-256 is ${actual}, expected ${opts.expectSha256}: it changed since it was made.`);
  }
  const check = await integrityOf(source);
  if (!check.ok) throw new BackupError(`The backup failed its integrity check (${check.detail}); nothing was restored.`);
  if (check.migrations === 0) throw new BackupError("The backup has no Kinarc migrations table; it is not a Kinarc database.");
  const target = filePath(targetUrl);
  if (existsSync(target) && !opts.force) throw new BackupError(`${target} exists; pass --force to replace it (stop Kinarc first).`);
  mkdirSync(path.dirname(target), { recursive: true });
  const partial = `${target}.restoring`;
  copyFileSync(source, partial);
  for (const suffix of ["-wal", "-shm"]) rmSync(target + suffix, { force: true });
  renameSync(partial, target);
  return { file: target, migrations: check.migrations };
}
