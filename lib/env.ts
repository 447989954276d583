import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { z } from "zod";

/**
 * The one place that reads process.env. Imported by next.config.mjs (so a bad value fails at build and start with a
 * clear message), drizzle.config.ts, scripts and server code.
 *
 * KINARC_DEPLOYMENT=local (demo, development, tests) fills safe defaults so a fresh clone runs with no .env file.
 * KINARC_DEPLOYMENT=production (the default whenever NODE_ENV=production and nothing else is said) refuses to start
 * without real secrets and names the one that is missing.
 */

const DEV_LIVEKIT_KEY = "devkey";
// Development-only signing secret for the local media server; a production deployment must not use it.
const DEV_LIVEKIT_SECRET = "kinarc-local-media-server-development-secret-0001";

// Development-only keys for the local payment stand-in (scripts/payment-fake); production refuses them.
const DEV_STRIPE_SECRET_KEY = "sk_test_kinarc_local_stand_in";
const DEV_STRIPE_WEBHOOK_SECRET = "whsec_kinarc_local_stand_in_0001";
/** Where the local payment stand-in listens unless told otherwise. */
const DEV_STRIPE_API_URL = "http://localhost:12111";

const deploymentSchema = z.enum(["local", "production"]);

const baseSchema = z.object({
  KINARC_DEPLOYMENT: deploymentSchema,
  DATABASE_URL: z
    .string()
    .regex(/^(file:|libsql:|https?:|wss?:)/, "must be a file: URL or a libSQL server URL (libsql://, https://, ws://)"),
  DATABASE_AUTH_TOKEN: z.string().optional(),
  AUTH_SECRET: z.string().min(32, "must be at least 32 characters"),
  APP_URL: z.url("must be an absolute URL such as https://kinarc.example-clinic.org"),
  SMTP_URL: z.string().regex(/^smtps?:\/\//, "must be an smtp:// or smtps:// URL"),
  MAIL_FROM: z.string().min(3),
  LIVEKIT_URL: z.string().regex(/^wss?:\/\//, "must be a ws:// or wss:// URL"),
  LIVEKIT_API_KEY: z.string().min(1),
  LIVEKIT_API_SECRET: z.string().min(32, "must be at least 32 characters"),
  STAFF_IDLE_MINUTES: z.coerce.number().int("must be a whole number of minutes").min(5).max(720),
  STRIPE_SECRET_KEY: z.string().regex(/^(sk|rk)_(test|live)_/, "must be a Stripe secret key (sk_test_…, sk_live_…)"),
  STRIPE_WEBHOOK_SECRET: z.string().regex(/^whsec_/, "must be a webhook signing secret (whsec_…)"),
  /** Unset in production (the SDK's own endpoint); the local stand-in's base URL otherwise. */
  STRIPE_API_URL: z.url("must be an absolute URL such as http://localhost:12111").optional(),
  STORAGE_DRIVER: z.enum(["disk", "s3"], { error: 'must be "disk" or "s3"' }),
  UPLOADS_DIR: z.string().min(1),
  S3_ENDPOINT: z.url("must be an absolute URL such as https://s3.eu-west-1.amazonaws.com").optional(),
  S3_REGION: z.string().min(1),
  S3_BUCKET: z.string().optional(),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
});

export type Env = z.infer<typeof baseSchema>;

function dataDir(): string {
  return path.resolve(process.cwd(), "data");
}

/** A development AUTH_SECRET kept in data/ so sessions survive restarts of a local install. */
function localAuthSecret(): string {
  const file = path.join(dataDir(), "auth-secret");
  if (existsSync(file)) return readFileSync(file, "utf8").trim();
  mkdirSync(dataDir(), { recursive: true });
  const secret = randomBytes(32).toString("base64url");
  writeFileSync(file, secret + "\n", { mode: 0o600 });
  return secret;
}

export class EnvError extends Error {}

export function readEnv(source: Record<string, string | undefined> = process.env): Env {
  const deploymentRaw = source.KINARC_DEPLOYMENT ?? (source.NODE_ENV === "production" ? "production" : "local");
  const deployment = deploymentSchema.safeParse(deploymentRaw);
  if (!deployment.success) {
    throw new EnvError(`KINARC_DEPLOYMENT: expected "local" or "production", got "${deploymentRaw}"`);
  }
  const local = deployment.data === "local";
  const port = source.PORT ?? "3000";
  const raw = {
    KINARC_DEPLOYMENT: deployment.data,
    DATABASE_URL: source.DATABASE_URL ?? (local ? "file:./data/kinarc.db" : undefined),
    DATABASE_AUTH_TOKEN: source.DATABASE_AUTH_TOKEN || undefined,
    AUTH_SECRET: source.AUTH_SECRET ?? (local ? localAuthSecret() : undefined),
    APP_URL: source.APP_URL ?? source.AUTH_URL ?? (local ? `http://localhost:${port}` : undefined),
    SMTP_URL: source.SMTP_URL ?? (local ? "smtp://127.0.0.1:1025" : undefined),
    MAIL_FROM: source.MAIL_FROM ?? "Kinarc <no-reply@kinarc.test>",
    LIVEKIT_URL: source.LIVEKIT_URL ?? (local ? "ws://localhost:7880" : undefined),
    LIVEKIT_API_KEY: source.LIVEKIT_API_KEY ?? (local ? DEV_LIVEKIT_KEY : undefined),
    LIVEKIT_API_SECRET: source.LIVEKIT_API_SECRET ?? (local ? DEV_LIVEKIT_SECRET : undefined),
    STAFF_IDLE_MINUTES: source.STAFF_IDLE_MINUTES ?? "30",
    STRIPE_SECRET_KEY: source.STRIPE_SECRET_KEY ?? (local ? DEV_STRIPE_SECRET_KEY : undefined),
    STRIPE_WEBHOOK_SECRET: source.STRIPE_WEBHOOK_SECRET ?? (local ? DEV_STRIPE_WEBHOOK_SECRET : undefined),
    STRIPE_API_URL: source.STRIPE_API_URL || (local ? DEV_STRIPE_API_URL : undefined),
    STORAGE_DRIVER: source.STORAGE_DRIVER ?? "disk",
    UPLOADS_DIR: source.UPLOADS_DIR ?? path.join(dataDir(), "uploads"),
    S3_ENDPOINT: source.S3_ENDPOINT || undefined,
    S3_REGION: source.S3_REGION ?? "us-east-1",
    S3_BUCKET: source.S3_BUCKET || undefined,
    S3_ACCESS_KEY_ID: source.S3_ACCESS_KEY_ID || undefined,
    S3_SECRET_ACCESS_KEY: source.S3_SECRET_ACCESS_KEY || undefined,
  };
  const parsed = baseSchema.safeParse(raw);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => {
      const key = String(issue.path[0]);
      const value = raw[key as keyof typeof raw];
      return value === undefined ? `${key}: missing (required when KINARC_DEPLOYMENT=production)` : `${key}: ${issue.message}`;
    });
    throw new EnvError(`Kinarc cannot start; fix these environment variables:\n  ${lines.join("\n  ")}`);
  }
  if (!local && parsed.data.LIVEKIT_API_SECRET === DEV_LIVEKIT_SECRET) {
    throw new EnvError("LIVEKIT_API_SECRET: the development secret is not allowed when KINARC_DEPLOYMENT=production");
  }
  if (!local && (parsed.data.STRIPE_SECRET_KEY === DEV_STRIPE_SECRET_KEY || parsed.data.STRIPE_WEBHOOK_SECRET === DEV_STRIPE_WEBHOOK_SECRET)) {
    throw new EnvError("STRIPE_SECRET_KEY / STRIPE_WEBHOOK_SECRET: the local stand-in's keys are not allowed when KINARC_DEPLOYMENT=production");
  }
  if (parsed.data.STORAGE_DRIVER === "s3") {
    const missing = (["S3_BUCKET", "S3_ACCESS_KEY_ID", "S3_SECRET_ACCESS_KEY"] as const).filter((k) => !parsed.data[k]);
    if (missing.length) throw new EnvError(`Kinarc cannot start; STORAGE_DRIVER=s3 also needs:\n  ${missing.map((k) => `${k}: missing`).join("\n  ")}`);
  }
  return parsed.data;
}

let cached: Env | undefined;

/** The validated environment, read once per process. */
export function env(): Env {
  cached ??= readEnv();
  return cached;
}

export const LOCAL_DEFAULTS = {
  DEV_LIVEKIT_KEY,
  DEV_LIVEKIT_SECRET,
  DEV_STRIPE_SECRET_KEY,
  DEV_STRIPE_WEBHOOK_SECRET,
  DEV_STRIPE_API_URL,
} as const;
