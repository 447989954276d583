import path from "node:path";
import { openDatabase } from "@/db";
import { DEMO_PASSWORD, DEMO_SIGN_INS, seedDemo } from "@/db/seed/demo";
import { env } from "@/lib/env";

export async function seedIfEmpty(): Promise<boolean> {
  const { db, client } = openDatabase(env().DATABASE_URL, env().DATABASE_AUTH_TOKEN);
  try {
    return (await seedDemo(db)).seeded;
  } finally {
    client.close();
  }
}

export function printSignIns(appUrl: string): void {
  console.log(`\nKinarc demo clinic (fictional) at ${appUrl}. Password for every sign-in: ${DEMO_PASSWORD}`);
  for (const u of DEMO_SIGN_INS) console.log(`  ${u.role.padEnd(10)} ${u.email}`);
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(__filename)) {
  seedIfEmpty()
    .then((seeded) => {
      console.log(seeded ? "Seeded the demo clinic." : "The database already has a clinic; nothing seeded.");
      if (seeded) printSignIns(env().APP_URL);
    })
    .catch((error) => {
      console.error(`Seeding failed: ${error instanceof Error ? error.message : String(error)}`);
      process.exit(1);
    });
}
