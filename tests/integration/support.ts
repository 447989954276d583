import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { openDatabase, type Database } from "@/db";
import { migrateDatabase } from "../../scripts/migrate";

export interface TempDb {
  db: Database;
  url: string;
  close(): void;
}

/** A real libSQL database in a temporary file, migrated with the project's migrations. */
export async function tempDatabase(): Promise<TempDb> {
  const dir = mkdtempSync(path.join(os.tmpdir(), "kinarc-db-"));
  const url = `file:${path.join(dir, "test.db")}`;
  await migrateDatabase(url);
  const { db, client } = openDatabase(url);
  return {
    db,
    url,
    close() {
      client.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
