import { eq, getTableName, is } from "drizzle-orm";
import { getTableConfig, SQLiteTable } from "drizzle-orm/sqlite-core";
import { strToU8, zipSync, type Zippable } from "fflate";
import type { DbOrTx } from "@/db";
import * as schema from "@/db/schema";
import { MissingBlob, type BlobStore } from "@/lib/storage";

/** Tables that hold a `client_id` column: found from the schema, so a table added later is exported without a change here. */
export function tablesWithClientId(): SQLiteTable[] {
  const values: unknown[] = Object.values(schema);
  return values.filter((v): v is SQLiteTable => is(v, SQLiteTable)).filter((t) => getTableConfig(t).columns.some((c) => c.name === "client_id"));
}

function clientIdColumn(table: SQLiteTable) {
  return getTableConfig(table).columns.find((c) => c.name === "client_id")!;
}

/** JSON for rows: dates as ISO 8601, binary columns left out (they are exported as files). */
function toJson(rows: unknown[]): Uint8Array {
  return strToU8(JSON.stringify(rows, (_k, v) => (v instanceof Date ? v.toISOString() : Buffer.isBuffer(v) || v instanceof Uint8Array ? undefined : v), 2));
}

const README = (clientName: string, at: Date) => `Everything Kinarc holds about ${clientName}, exported ${at.toISOString()}.

data/client.json         the client record
data/account.json        the sign-in account (no password or secret is exported)
data/<table>.json        every row that names this client, one file per table (dates in UTC, ISO 8601)
files/<upload id>.<ext>  files sent by or for the client; data/uploads.json holds each file's SHA-256
captures/<attempt id>.json.gz  the raw hand-tracking capture behind each measured attempt (gzip of JSON)

Angles are in degrees; amounts of money in the currency's minor unit (cents, pence).
`;

export interface ClientExport {
  zip: Uint8Array;
  files: string[];
}

/** A zip of JSON and files with every row in every table that names the client, the client's files and captures. */
export async function buildClientExport(db: DbOrTx, store: BlobStore, clientId: string, now = new Date()): Promise<ClientExport> {
  const [client] = await db.select().from(schema.clients).where(eq(schema.clients.id, clientId));
  if (!client) throw new Error(`No client ${clientId}`);
  const entries: Zippable = {};
  const root = "kinarc-export";
  entries[`${root}/README.txt`] = strToU8(README(`${client.givenName} ${client.familyName}`, now));
  entries[`${root}/data/client.json`] = toJson([client]);
  if (client.userId) {
    const [user] = await db
      .select({ id: schema.users.id, email: schema.users.email, name: schema.users.name, role: schema.users.role, lastSignInAt: schema.users.lastSignInAt, createdAt: schema.users.createdAt })
      .from(schema.users)
      .where(eq(schema.users.id, client.userId));
    entries[`${root}/data/account.json`] = toJson(user ? [user] : []);
  }
  for (const table of tablesWithClientId()) {
    const rows = await db.select().from(table).where(eq(clientIdColumn(table), clientId));
    entries[`${root}/data/${getTableName(table)}.json`] = toJson(rows);
  }
  const uploads = await db.select().from(schema.uploads).where(eq(schema.uploads.clientId, clientId));
  for (const u of uploads) {
    try {
      entries[`${root}/files/${u.id}.${u.extension}`] = [new Uint8Array(await store.get(u.storageKey)), { level: 0 }];
    } catch (error) {
      // A lost file must not block the client's right to the rest; the gap is stated in the export itself.
      if (!(error instanceof MissingBlob)) throw error;
      entries[`${root}/files/${u.id}.MISSING.txt`] = strToU8(`The stored file for upload ${u.id} (SHA-256 ${u.sha256}) was not found in storage when this export was made.\n`);
    }
  }
  const captures = await db
    .select({ attemptId: schema.attemptCaptures.attemptId, gzip: schema.attemptCaptures.gzip })
    .from(schema.attemptCaptures)
    .innerJoin(schema.attempts, eq(schema.attempts.id, schema.attemptCaptures.attemptId))
    .where(eq(schema.attempts.clientId, clientId));
  for (const c of captures) entries[`${root}/captures/${c.attemptId}.json.gz`] = [new Uint8Array(c.gzip), { level: 0 }];
  return { zip: zipSync(entries, { level: 6, mtime: now }), files: Object.keys(entries) };
}
