import { mkdirSync } from "node:fs";
import path from "node:path";
import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import { env } from "@/lib/env";
import * as schema from "./schema";
import { serializeWrites } from "./serialize";

export type Database = LibSQLDatabase<typeof schema>;
/** A transaction handle; queries that write take `DbOrTx` so callers can group writes in one transaction. */
export type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];
export type DbOrTx = Database | Tx;

/** Opens a libSQL client for a `file:` URL (creating its folder, which libSQL cannot) or a libSQL server URL. */
export function openDatabase(url: string, authToken?: string): { db: Database; client: Client } {
  if (url.startsWith("file:")) {
    const file = url.slice("file:".length);
    if (file && file !== ":memory:") mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
  }
  // libSQL opens a small pool of connections with foreign keys on; `timeout` (ms) waits out a concurrent writer
  // instead of failing with SQLITE_BUSY.
  const raw = createClient({ url, authToken, timeout: 5000 });
  // A libSQL server takes turns itself; the local synchronous driver needs this process to (see db/serialize.ts).
  const client = url.startsWith("file:") ? serializeWrites(raw) : raw;
  if (url.startsWith("file:")) {
    // WAL is a property of the file: readers go on while one writer commits.
    void client.execute("PRAGMA journal_mode = WAL").catch(() => undefined);
  }
  return { db: drizzle(client, { schema }), client };
}

// One client per process; cached on globalThis so dev-server hot reloads do not open a new one each time.
const globalForDb = globalThis as unknown as { kinarcDb?: { db: Database; client: Client } };

export function getDb(): Database {
  if (!globalForDb.kinarcDb) {
    const e = env();
    globalForDb.kinarcDb = openDatabase(e.DATABASE_URL, e.DATABASE_AUTH_TOKEN);
  }
  return globalForDb.kinarcDb.db;
}

export { schema };
