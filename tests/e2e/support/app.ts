import { mkdirSync, rmSync } from "node:fs";
import path from "node:path";
import type { Browser, BrowserContext, BrowserContextOptions, Page } from "playwright-core";
import { DEMO_PASSWORD } from "@/db/seed/demo";
import { openDatabase, type Database } from "@/db";
import { seedDemo, type SeedResult } from "@/db/seed/demo";
import { migrateDatabase } from "../../../scripts/migrate";
import { ROOT, startLocalStack, type LocalStack } from "../../../scripts/lib/local-stack";

/** Ports for browser suites (files run one at a time), away from the demo's 3000/1025/1080/7880. */
export const TEST_PORTS = { appPort: 3100, smtpPort: 2525, mailHttpPort: 2580, mediaPort: 7890 } as const;

export interface TestApp extends LocalStack {
  databaseUrl: string;
  seed: SeedResult;
  mail: MailReader;
}

export interface CaughtMail {
  id: number;
  to: string[];
  subject: string;
  text: string;
  html: string;
  attachments: { filename: string; contentType: string; size: number }[];
}

export interface MailReader {
  list(): Promise<CaughtMail[]>;
  /** Waits until a message to `to` (and matching `subject`, if given) arrives. */
  waitFor(to: string, subject?: RegExp, timeoutMs?: number): Promise<CaughtMail>;
  attachment(id: number, index: number): Promise<Buffer>;
}

function mailReader(base: string): MailReader {
  const list = async () => (await (await fetch(`${base}/api/messages`)).json()) as CaughtMail[];
  return {
    list,
    async waitFor(to, subject, timeoutMs = 15_000) {
      const deadline = Date.now() + timeoutMs;
      while (Date.now() < deadline) {
        const hit = (await list()).find((m) => m.to.includes(to.toLowerCase()) && (!subject || subject.test(m.subject)));
        if (hit) return hit;
        await new Promise((r) => setTimeout(r, 200));
      }
      throw new Error(`No e-mail to ${to}${subject ? ` matching ${subject}` : ""} within ${timeoutMs} ms`);
    },
    async attachment(id, index) {
      return Buffer.from(await (await fetch(`${base}/api/messages/${id}/attachments/${index}`)).arrayBuffer());
    },
  };
}

/** A fresh database (migrated, demo clinic seeded) and a running Kinarc with its local stand-ins. */
export async function startTestApp(name: string): Promise<TestApp> {
  const dir = path.join(ROOT, "tests/.cache/e2e");
  mkdirSync(dir, { recursive: true });
  const file = path.join(dir, `${name}.db`);
  for (const suffix of ["", "-wal", "-shm"]) rmSync(file + suffix, { force: true });
  const databaseUrl = `file:${file}`;
  await migrateDatabase(databaseUrl);
  const { db, client } = openDatabase(databaseUrl);
  const seed = await seedDemo(db);
  client.close();
  const stack = await startLocalStack({ ...TEST_PORTS, databaseUrl, authSecret: "e2e-test-secret-that-is-long-enough-0123456789" });
  return { ...stack, databaseUrl, seed, mail: mailReader(stack.mailUrl) };
}

/** Signs in through the staff form, as a person would. */
export async function signInWithPassword(page: Page, appUrl: string, email: string, password: string): Promise<void> {
  await page.goto(`${appUrl}/sign-in`);
  const form = page.getByRole("form", { name: "Sign in with password" });
  await form.getByLabel("E-mail").fill(email);
  await form.getByLabel("Password").fill(password);
  await form.getByRole("button", { name: "Sign in" }).click();
}

/**
 * A new browser context signed in as a demo user (password form) and landed on their home page. Page errors are
 * printed with the user's e-mail so a failing suite shows which side broke.
 */
export async function signedInContext(browser: Browser, appUrl: string, email: string, options: BrowserContextOptions = {}): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext(options);
  const page = await context.newPage();
  page.on("pageerror", (error) => console.error(`page error (${email}): ${error.message}`));
  await signInWithPassword(page, appUrl, email, DEMO_PASSWORD);
  await page.waitForURL(`${appUrl}/home`);
  return { context, page };
}

/** Runs `fn` on a connection to the test app's database file, closed afterwards. */
export async function withAppDatabase<T>(app: Pick<TestApp, "databaseUrl">, fn: (db: Database) => Promise<T>): Promise<T> {
  const { db, client } = openDatabase(app.databaseUrl);
  try {
    return await fn(db);
  } finally {
    client.close();
  }
}
