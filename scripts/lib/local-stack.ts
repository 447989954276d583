import { spawn, type ChildProcess } from "node:child_process";
import { existsSync } from "node:fs";
import path from "node:path";
import { startMediaServer } from "../media-server/server";
import { startMailCatcher } from "../mail-catcher";
import { startPaymentFake } from "../payment-fake/server";
import { LOCAL_DEFAULTS } from "@/lib/env";

export const ROOT = path.resolve(__dirname, "../..");

export interface StackOptions {
  appPort: number;
  smtpPort: number;
  mailHttpPort: number;
  mediaPort: number;
  databaseUrl: string;
  /** The payment stand-in's port; by default appPort + 9111 (12111 for the demo on 3000). */
  paymentPort?: number;
  authSecret?: string;
  /** Print the server's output (the demo does; tests keep it quiet unless they fail). */
  verbose?: boolean;
}

export interface LocalStack {
  appUrl: string;
  mailUrl: string;
  mediaUrl: string;
  paymentUrl: string;
  env: Record<string, string>;
  output: () => string;
  stop: () => Promise<void>;
}

/** The environment a local Kinarc server runs with: local stand-ins for mail and video, the given database. */
export function localEnv(opts: StackOptions): Record<string, string> {
  const appUrl = `http://localhost:${opts.appPort}`;
  const e: Record<string, string> = {
    KINARC_DEPLOYMENT: "local",
    NODE_ENV: "production",
    NEXT_TELEMETRY_DISABLED: "1",
    PORT: String(opts.appPort),
    DATABASE_URL: opts.databaseUrl,
    // Next rewrites 127.0.0.1 to localhost inside route handlers, so Auth.js must be told the localhost origin.
    APP_URL: appUrl,
    AUTH_URL: appUrl,
    SMTP_URL: `smtp://127.0.0.1:${opts.smtpPort}`,
    LIVEKIT_URL: `ws://localhost:${opts.mediaPort}`,
    LIVEKIT_API_KEY: LOCAL_DEFAULTS.DEV_LIVEKIT_KEY,
    LIVEKIT_API_SECRET: LOCAL_DEFAULTS.DEV_LIVEKIT_SECRET,
    STRIPE_API_URL: `http://localhost:${paymentPort(opts)}`,
    STRIPE_SECRET_KEY: LOCAL_DEFAULTS.DEV_STRIPE_SECRET_KEY,
    STRIPE_WEBHOOK_SECRET: LOCAL_DEFAULTS.DEV_STRIPE_WEBHOOK_SECRET,
  };
  // A test database keeps its uploaded files beside it, so each suite starts with none.
  const dbFile = opts.databaseUrl.startsWith("file:") ? path.resolve(ROOT, opts.databaseUrl.slice(5)) : null;
  if (dbFile && dbFile !== path.join(ROOT, "data/kinarc.db")) e.UPLOADS_DIR = dbFile.replace(/\.db$/, "") + "-uploads";
  if (opts.authSecret) e.AUTH_SECRET = opts.authSecret;
  return e;
}

function paymentPort(opts: StackOptions): number {
  return opts.paymentPort ?? opts.appPort + 9111;
}

export function hasBuild(): boolean {
  return existsSync(path.join(ROOT, ".next", "BUILD_ID"));
}

export async function runCommand(cmd: string, args: string[], env: Record<string, string>, label: string): Promise<void> {
  await new Promise<void>((resolve, reject) => {
    const child = spawn(cmd, args, { cwd: ROOT, env: { ...process.env, ...env }, stdio: "inherit" });
    child.on("exit", (code) => (code === 0 ? resolve() : reject(new Error(`${label} failed (exit ${code})`))));
    child.on("error", reject);
  });
}

async function waitForHttp(url: string, child: ChildProcess, timeoutMs: number, output: () => string): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`Kinarc exited early (code ${child.exitCode}):\n${output()}`);
    try {
      const res = await fetch(url, { redirect: "manual" });
      if (res.status < 500) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`Kinarc did not answer at ${url} within ${timeoutMs} ms:\n${output()}`);
}

/** Starts the mail catcher, the media server and `next start` (which needs a finished `next build`). */
export async function startLocalStack(opts: StackOptions): Promise<LocalStack> {
  const env = localEnv(opts);
  const mail = await startMailCatcher({ smtpPort: opts.smtpPort, httpPort: opts.mailHttpPort, quiet: !opts.verbose });
  const media = await startMediaServer({ port: opts.mediaPort, apiKey: env.LIVEKIT_API_KEY, apiSecret: env.LIVEKIT_API_SECRET });
  const payment = await startPaymentFake({
    port: paymentPort(opts),
    secretKey: env.STRIPE_SECRET_KEY,
    webhookSecret: env.STRIPE_WEBHOOK_SECRET,
    webhookUrl: `${env.APP_URL}/api/v1/webhooks/payments`,
    quiet: !opts.verbose,
  });
  let log = "";
  const app = spawn(process.execPath, [path.join(ROOT, "node_modules/next/dist/bin/next"), "start", "-p", String(opts.appPort)], {
    cwd: ROOT,
    env: { ...process.env, ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  const keep = (chunk: Buffer) => {
    log = (log + chunk.toString()).slice(-20_000);
    if (opts.verbose) process.stdout.write(chunk);
  };
  app.stdout?.on("data", keep);
  app.stderr?.on("data", keep);
  const stop = async () => {
    if (app.exitCode === null) {
      app.kill("SIGTERM");
      await new Promise((r) => app.once("exit", r));
    }
    await payment.close();
    await media.close();
    await mail.close();
  };
  try {
    await waitForHttp(`${env.APP_URL}/sign-in`, app, 60_000, () => log);
  } catch (error) {
    await stop();
    throw error;
  }
  return {
    appUrl: env.APP_URL,
    mailUrl: `http://127.0.0.1:${opts.mailHttpPort}`,
    mediaUrl: media.url,
    paymentUrl: payment.url,
    env,
    output: () => log,
    stop,
  };
}
