import { defineConfig } from "drizzle-kit";
import { env } from "./lib/env";

export default defineConfig({
  schema: "./db/schema.ts",
  out: "./db/migrations",
  dialect: "turso",
  dbCredentials: { url: env().DATABASE_URL, authToken: env().DATABASE_AUTH_TOKEN },
});
