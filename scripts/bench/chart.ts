/**
 * Chart API benchmark: a client with 5,000 attempts (made by the measurement engine from synthetic captures, then
 * spread over a year of sessions), the built app on a local port, and autocannon (a general-purpose HTTP load tool
 * from the registry) sending GET /api/v1/clients/:id/chart from 50 concurrent connections. Prints the latency
 * percentiles of every response (the goal is p95 under 50 ms) and the request rate. For comparison it also loads
 * GET /api/v1/appointments (signed in, one small query, no audited record read) and GET /api/auth/providers (no
 * Kinarc code): the floors set by the session check, the framework and the machine. Figures only.
 *
 *   npx tsx scripts/bench/chart.ts [--seconds 15] [--connections 50] [--attempts 5000] [--port 3190]
 * Needs a production build (.next); uses ports 3190/2591/2592/7891 unless told otherwise.
 */
import { mkdirSync, rmSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { eq } from "drizzle-orm";
import { openDatabase } from "@/db";
import { attempts, clients } from "@/db/schema";
import { DEMO_PASSWORD, seedDemo } from "@/db/seed/demo";
import { analyzeSynthetic, attemptRow } from "@/lib/chart/synthetic-attempts";
import { MOTIONS, SIDES, type MotionId } from "@/lib/motions/catalog";
import { migrateDatabase } from "../migrate";
import { hasBuild, ROOT, startLocalStack } from "../lib/local-stack";

const require = createRequire(import.meta.url);
interface AutocannonInstance {
  on(event: "response", listener: (client: unknown, statusCode: number, resBytes: number, responseTimeMs: number) => void): void;
}
interface AutocannonResult {
  requests: { average: number; total: number };
  non2xx: number;
  errors: number;
  timeouts: number;
}
const autocannon = require("autocannon") as (opts: Record<string, unknown>, done: (err: Error | null, result: AutocannonResult) => void) => AutocannonInstance;

function argument(name: string, fallback: number): number {
  const i = process.argv.findIndex((a) => a === `--${name}` || a.startsWith(`--${name}=`));
  if (i < 0) return fallback;
  const value = process.argv[i].includes("=") ? process.argv[i].split("=")[1] : process.argv[i + 1];
  return Number(value ?? fallback);
}

const SECONDS = argument("seconds", 15);
const CONNECTIONS = argument("connections", 50);
const ATTEMPTS = argument("attempts", 5000);
const PORT = argument("port", 3190);

function percentile(sorted: number[], p: number): number {
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[i];
}

async function makeDatabase(file: string) {
  for (const suffix of ["", "-wal", "-shm"]) rmSync(file + suffix, { force: true });
  const url = `file:${file}`;
  await migrateDatabase(url);
  const { db, client } = openDatabase(url);
  const seed = await seedDemo(db);
  const clientId = seed.clientIds!.dorian;
  const [record] = await db.select().from(clients).where(eq(clients.id, clientId));

  // A few dozen real analyses by the engine, each reused for many sessions (only the time and capture id differ).
  const wrist: MotionId[] = ["wrist.flexion", "wrist.extension", "wrist.radial_deviation", "wrist.ulnar_deviation"];
  const started = performance.now();
  const analyses: ReturnType<typeof analyzeSynthetic>[] = [];
  let seed2 = 500;
  for (const motion of [...wrist, "mcp.flexion", "pip.flexion"] as MotionId[]) {
    const digit = MOTIONS[motion].joint === "wrist" ? null : "index";
    for (const side of SIDES) {
      for (const fraction of [0.5, 0.8]) {
        const reference = motion.startsWith("wrist") ? 60 : 80;
        analyses.push(analyzeSynthetic({ motion, side, digit, condition: "against_gravity", peakDeg: Math.round(reference * fraction), seed: seed2++ }));
      }
    }
  }
  const analysisMs = performance.now() - started;
  const now = Date.now();
  const rows = Array.from({ length: ATTEMPTS }, (_, i) =>
    attemptRow(analyses[i % analyses.length], { clinicId: record.clinicId, clientId, recordedByUserId: null }, new Date(now - (ATTEMPTS - i) * 90 * 60_000), `bench-${i.toString().padStart(6, "0")}-chart`),
  );
  for (let i = 0; i < rows.length; i += 500) await db.insert(attempts).values(rows.slice(i, i + 500));
  client.close();
  return { url, clientId, analyses: analyses.length, analysisMs };
}

async function signIn(appUrl: string, email: string, password: string): Promise<string> {
  const csrf = await fetch(`${appUrl}/api/auth/csrf`);
  const cookies = csrf.headers.getSetCookie().map((c) => c.split(";")[0]);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await fetch(`${appUrl}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: cookies.join("; ") },
    body: new URLSearchParams({ csrfToken, email, password, callbackUrl: `${appUrl}/home` }),
  });
  const session = res.headers.getSetCookie().map((c) => c.split(";")[0]).find((c) => c.includes("session-token"));
  if (!session) throw new Error(`sign-in failed (${res.status})`);
  return [...cookies, session].join("; ");
}

async function load(label: string, url: string, cookie: string) {
  const times: number[] = [];
  const result = await new Promise<AutocannonResult>((resolve, reject) => {
    const instance = autocannon({ url, connections: CONNECTIONS, duration: SECONDS, headers: { cookie } }, (err, res) => (err ? reject(err) : resolve(res)));
    instance.on("response", (_client, _status, _bytes, ms) => times.push(ms));
  });
  times.sort((a, b) => a - b);
  console.log(
    `${label}: autocannon ${CONNECTIONS} connections for ${SECONDS} s: ${times.length} responses, ${result.requests.average.toFixed(0)} req/s, ` +
      `non-2xx ${result.non2xx}, errors ${result.errors}, timeouts ${result.timeouts}`,
  );
  console.log(
    `${label}: latency under load p50 ${percentile(times, 50).toFixed(1)} ms, p95 ${percentile(times, 95).toFixed(1)} ms, p99 ${percentile(times, 99).toFixed(1)} ms, max ${times.at(-1)?.toFixed(1)} ms (goal for the chart: p95 < 50 ms)`,
  );
}

async function main() {
  if (!hasBuild()) throw new Error("No production build in .next: run `npx next build` first.");
  const dir = path.join(ROOT, "tests/.cache/bench");
  mkdirSync(dir, { recursive: true });
  const { url, clientId, analyses, analysisMs } = await makeDatabase(path.join(dir, "chart.db"));
  console.log(`database: ${ATTEMPTS} attempts for one client from ${analyses} engine analyses (${(analysisMs / 1000).toFixed(1)} s of engine time)`);
  const stack = await startLocalStack({ appPort: PORT, smtpPort: PORT + 401, mailHttpPort: PORT + 402, mediaPort: PORT + 4701, databaseUrl: url, authSecret: "bench-secret-that-is-long-enough-0123456789abcdef" });
  try {
    const cookie = await signIn(stack.appUrl, "therapist@kinarc.test", DEMO_PASSWORD);
    const target = `${stack.appUrl}/api/v1/clients/${clientId}/chart`;
    const first = await fetch(target, { headers: { cookie } });
    if (!first.ok) throw new Error(`chart answered ${first.status}: ${await first.text()}`);
    const body = (await first.json()) as { rows: unknown[] };
    console.log(`chart: ${body.rows.length} motion rows with data, ${JSON.stringify(body).length} bytes`);

    // One at a time first: the cost of one request with nothing else running.
    const single: number[] = [];
    for (let i = 0; i < 100; i++) {
      const t0 = performance.now();
      await (await fetch(target, { headers: { cookie } })).arrayBuffer();
      single.push(performance.now() - t0);
    }
    single.sort((a, b) => a - b);
    console.log(`sequential (100 requests): p50 ${percentile(single, 50).toFixed(1)} ms, p95 ${percentile(single, 95).toFixed(1)} ms`);

    await load("chart", target, cookie);
    await load("floor: appointments", `${stack.appUrl}/api/v1/appointments`, cookie);
    // No Kinarc code at all: Auth.js's provider list, answered by the framework alone. What any route costs here.
    await load("floor: framework only", `${stack.appUrl}/api/auth/providers`, cookie);
  } finally {
    await stack.stop();
  }
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
