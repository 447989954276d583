import path from "node:path";
import { migrate } from "drizzle-orm/libsql/migrator";
import { openDatabase } from "@/db";
import { env } from "@/lib/env";

/** Applies every pending migration in db/migrations (each in its own transaction). */
export async function migrateDatabase(url = env().DATABASE_URL, authToken = env().DATABASE_AUTH_TOKEN) {
  const { db, client } = openDatabase(url, authToken);
  try {
    await migrate(db, { migrationsFolder: path.resolve(__dirname, "../db/migrations") });
  } finally {
    client.close();
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(__filename)) {
  migrateDatabase()
    .then(() => console.log(`Database is up to date (${env().DATABASE_URL}).`))
    .catch((error) => {
      console.error(`Migration failed: ${error instanceof Error ? error.message : String(error)}`);
      process.exit(1);
    });
}
