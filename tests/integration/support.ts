import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { openDatabase, type Database } from "@/db";
import { users } from "@/db/schema";
import { actorForUser, type Actor } from "@/lib/auth/guard";
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

/** The access actor of a seeded user, looked up by e-mail (the demo seed's sign-ins). */
export async function actorByEmail(db: Database, email: string): Promise<Actor> {
  const [u] = await db.select().from(users).where(eq(users.email, email));
  if (!u) throw new Error(`no user ${email} in the test database`);
  return (await actorForUser(db, u.id))!;
}
