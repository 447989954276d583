import { randomUUID } from "node:crypto";
import { readFileSync, readdirSync, statSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { DEMO_PASSWORD, DEMO_SIGN_INS } from "@/db/seed/demo";
import { ROLES, type Role } from "@/db/schema";
import { ROOT } from "../../scripts/lib/local-stack";
import { signInWithPassword, startTestApp, type TestApp } from "./support/app";
import { launchChromium } from "./support/browser";

/**
 * Walks every route handler under app/api and every server action, found by scanning the source (and, for actions,
 * the build's server-reference manifest), so a new one is covered without touching this file. Each is called as a
 * stranger and as each role; the expected answer comes from the roles named in its own guard call:
 * stranger → 401 ("Sign in"), a role not named → 403 ("cannot do this"), a role named → neither, and never a 5xx.
 * Handlers without a guard must be listed in PUBLIC with the reason, or this test fails.
 */

const PUBLIC_ROUTES: Record<string, string> = {
  "app/api/auth/[...nextauth]/route.ts": "Auth.js sign-in endpoints",
  "app/api/v1/webhooks/payments/route.ts": "payment service events, proven by their signature (a request without one gets 400)",
};
const PUBLIC_ACTIONS: Record<string, string> = {
  "app/actions.ts#signOutAction": "signing out needs no session",
  "app/sign-in/actions.ts#signInWithPassword": "the sign-in form itself",
  "app/sign-in/actions.ts#sendClientLink": "asks for an e-mailed sign-in link",
  "app/welcome/[token]/actions.ts#setPasswordAction": "proven by the one-time invitation token",
};
const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;

function walk(dir: string, pick: (file: string) => boolean): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = path.join(dir, name);
    return statSync(full).isDirectory() ? walk(full, pick) : pick(full) ? [path.relative(ROOT, full)] : [];
  });
}

/** The source file an import specifier names ("@/lib/x" or a relative path). */
function moduleFile(specifier: string, fromFile: string): string {
  const base = specifier.startsWith("@/") ? path.join(ROOT, specifier.slice(2)) : path.resolve(path.dirname(path.join(ROOT, fromFile)), specifier);
  for (const candidate of [`${base}.ts`, `${base}.tsx`, path.join(base, "index.ts")]) {
    try {
      if (statSync(candidate).isFile()) return path.relative(ROOT, candidate);
    } catch {
      // try the next form
    }
  }
  throw new Error(`${fromFile}: cannot find the module ${specifier}`);
}

/** A constant's value, read from the source: declared in the file, or followed through its import. */
function resolveName(name: string, file: string): Role[] {
  const source = readFileSync(path.join(ROOT, file), "utf8");
  const local = source.match(new RegExp(`const ${name}(?:\\s*:[^=]+)?\\s*=\\s*([^;]+);`));
  if (local) return resolveRoles(local[1], file);
  for (const m of source.matchAll(/import\s*(?:type\s*)?\{([^}]+)\}\s*from\s*"([^"]+)"/g)) {
    const spec = m[1]
      .split(",")
      .map((x) => x.trim().replace(/^type\s+/, ""))
      .find((x) => x.split(/\s+as\s+/).pop() === name);
    if (spec) return resolveName(spec.split(/\s+as\s+/)[0], moduleFile(m[2], file));
  }
  throw new Error(`${file}: cannot resolve the roles name ${name}`);
}

/** Evaluates a roles expression (`["admin"]`, `STAFF_ROLES`, `[...CHART_STAFF, "client"]`) from the source alone. */
function resolveRoles(rawExpr: string, file: string): Role[] {
  const expr = rawExpr.replace(/\bsatisfies\b[\s\S]*$/, "").replace(/\bas const\b/g, "").trim();
  const names = [...new Set(expr.replace(/"[^"]*"|'[^']*'/g, "").match(/[A-Za-z_][A-Za-z0-9_]*/g) ?? [])];
  const values = names.map((n) => resolveName(n, file));
  const roles = new Function(...names, `return (${expr});`)(...values) as Role[];
  for (const r of roles) if (!ROLES.includes(r)) throw new Error(`${file}: ${r} is not a role`);
  return roles;
}

interface Endpoint {
  file: string;
  method: (typeof METHODS)[number];
  url: string;
  roles: Role[] | "public";
}

async function findRouteHandlers(): Promise<Endpoint[]> {
  const out: Endpoint[] = [];
  for (const file of walk(path.join(ROOT, "app/api"), (f) => f.endsWith("route.ts"))) {
    const source = readFileSync(path.join(ROOT, file), "utf8");
    const url = "/" + path.dirname(file).replace(/^app\//, "").replace(/\[\.\.\.[^\]]+\]/g, "session").replace(/\[[^\]]+\]/g, randomUUID());
    for (const method of METHODS) {
      const exported = source.match(new RegExp(`export (?:const ${method}\\s*=\\s*([^\\n]+)|async function ${method}\\b)`));
      if (!exported) continue;
      if (PUBLIC_ROUTES[file]) {
        out.push({ file, method, url, roles: "public" });
        continue;
      }
      const guarded = exported[1]?.match(/^route(?:<[^>]*>)?\(\s*(\[[^\]]*\]|[A-Za-z_][A-Za-z0-9_]*)/);
      if (!guarded) throw new Error(`${file} ${method} does not go through route() from lib/http.ts and is not listed as public`);
      out.push({ file, method, url, roles: resolveRoles(guarded[1], file) });
    }
  }
  return out;
}

interface Action {
  key: string;
  id: string;
  pagePath: string;
  params: string[];
  roles: Role[] | "public";
}

async function findServerActions(): Promise<Action[]> {
  const manifest = JSON.parse(readFileSync(path.join(ROOT, ".next/server/server-reference-manifest.json"), "utf8")) as {
    node: Record<string, { workers: Record<string, unknown>; filename?: string; exportedName?: string }>;
  };
  const byKey = new Map<string, { id: string; workers: string[] }>();
  for (const [id, entry] of Object.entries(manifest.node)) {
    if (entry.filename && entry.exportedName) byKey.set(`${entry.filename}#${entry.exportedName}`, { id, workers: Object.keys(entry.workers) });
  }
  const out: Action[] = [];
  for (const file of walk(path.join(ROOT, "app"), (f) => /\.tsx?$/.test(f))) {
    const source = readFileSync(path.join(ROOT, file), "utf8");
    if (!/^["']use server["']/m.test(source)) continue;
    for (const m of source.matchAll(/export async function (\w+)\(([^)]*)\)/g)) {
      const key = `${file}#${m[1]}`;
      const params = m[2].split(",").map((p) => p.trim().split(":")[0].trim()).filter(Boolean);
      const next = source.indexOf("export ", m.index! + 10);
      const body = source.slice(m.index!, next === -1 ? undefined : next);
      let roles: Role[] | "public";
      if (PUBLIC_ACTIONS[key]) roles = "public";
      else {
        const guard = body.match(/guardedAction\(\s*(\[[^\]]*\]|[A-Za-z_][A-Za-z0-9_]*)/);
        if (!guard) throw new Error(`${key} does not go through guardedAction() and is not listed as public`);
        roles = resolveRoles(guard[1], file);
      }
      // An action no page imports is not in the build and cannot be called; its guard was still checked above.
      const built = byKey.get(key);
      if (!built) continue;
      const staticPage = built.workers.filter((w) => w.endsWith("/page")).sort((a, b) => (a.match(/\[/g)?.length ?? 0) - (b.match(/\[/g)?.length ?? 0))[0] ?? "app/page";
      const pagePath = ("/" + staticPage.replace(/^app\/?/, "").replace(/\/?page$/, "").replace(/\([^)]*\)\/?/g, "").replace(/\[[^\]]+\]/g, randomUUID())).replace(/\/+$/, "") || "/";
      out.push({ key, id: built.id, pagePath, params, roles });
    }
  }
  return out;
}

let app: TestApp;
let browser: Browser;
const cookies: Partial<Record<Role | "stranger", string>> = {};

beforeAll(async () => {
  app = await startTestApp("access-matrix");
  browser = await launchChromium();
  for (const account of DEMO_SIGN_INS) {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signInWithPassword(page, app.appUrl, account.email, DEMO_PASSWORD);
    await page.waitForURL(`${app.appUrl}/home`);
    cookies[account.role] = (await context.cookies()).map((c) => `${c.name}=${c.value}`).join("; ");
    await context.close();
  }
  // A cookie that is not a session: gets past the sign-in redirect, so the handler's own guard is what answers.
  cookies.stranger = "authjs.session-token=not-a-session";
});
afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

async function callRoute(e: Endpoint, who: Role | "stranger"): Promise<{ status: number; text: string }> {
  const init: RequestInit = { method: e.method, headers: { cookie: cookies[who]!, "content-type": "application/json", origin: app.appUrl }, redirect: "manual" };
  if (e.method !== "GET") init.body = "{}";
  const res = await fetch(app.appUrl + e.url, init);
  return { status: res.status, text: await res.text() };
}

/** Calls an action the way React's client does: multipart with the argument list in field "0" (FormData as "$K1"). */
async function callAction(a: Action, who: Role | "stranger"): Promise<{ status: number; text: string }> {
  const form = new FormData();
  const args = a.params.map((p) => (/formData/i.test(p) ? "$K1" : /prev/i.test(p) ? {} : randomUUID()));
  form.set("0", JSON.stringify(args));
  const res = await fetch(app.appUrl + a.pagePath, {
    method: "POST",
    headers: { cookie: cookies[who]!, "next-action": a.id, accept: "text/x-component", origin: app.appUrl },
    body: form,
    redirect: "manual",
  });
  return { status: res.status, text: await res.text() };
}

const WHO = ["stranger", ...ROLES] as const;

describe("access matrix", () => {
  it("every route handler answers each role and a stranger as its guard says", async () => {
    const endpoints = await findRouteHandlers();
    expect(endpoints.length).toBeGreaterThanOrEqual(30);
    const failures: string[] = [];
    for (const e of endpoints) {
      for (const who of WHO) {
        const { status, text } = await callRoute(e, who);
        const label = `${e.method} ${e.file} as ${who}: ${status} ${text.slice(0, 120)}`;
        if (status >= 500) failures.push(`server error — ${label}`);
        else if (e.roles === "public") {
          if (e.file.includes("webhooks") && status !== 400) failures.push(`unsigned event not refused — ${label}`);
        } else if (who === "stranger") {
          if (status !== 401) failures.push(`expected 401 — ${label}`);
        } else if (!e.roles.includes(who)) {
          if (status !== 403) failures.push(`expected 403 — ${label}`);
        } else if (status === 401 || status === 403) failures.push(`expected access — ${label}`);
      }
    }
    console.log(`access matrix: ${endpoints.length} route handlers × ${WHO.length} callers`);
    expect(failures).toEqual([]);
  });

  it("every server action answers each role and a stranger as its guard says", async () => {
    const actions = await findServerActions();
    expect(actions.length).toBeGreaterThanOrEqual(10);
    const failures: string[] = [];
    for (const a of actions.filter((x) => x.roles !== "public")) {
      for (const who of WHO) {
        const { status, text } = await callAction(a, who);
        const label = `${a.key} as ${who}: ${status} ${text.slice(0, 160).replace(/\n/g, " ")}`;
        const unauthenticated = text.includes("Sign in to continue.");
        const forbidden = /cannot do this/.test(text);
        if (status >= 500) failures.push(`server error — ${label}`);
        else if (who === "stranger") {
          if (!unauthenticated) failures.push(`expected "Sign in to continue." — ${label}`);
        } else if (!(a.roles as Role[]).includes(who)) {
          if (!forbidden) failures.push(`expected refusal for the role — ${label}`);
        } else if (unauthenticated || forbidden) failures.push(`expected access — ${label}`);
      }
    }
    console.log(`access matrix: ${actions.length} server actions (${actions.filter((x) => x.roles === "public").length} public by design) × ${WHO.length} callers`);
    expect(failures).toEqual([]);
  });

  it("sends the security headers on pages and API answers", async () => {
    for (const url of ["/sign-in", "/api/v1/clients"]) {
      const res = await fetch(app.appUrl + url, { redirect: "manual" });
      const h = res.headers;
      // OWASP Secure Headers Project recommendations [common practice].
      expect(h.get("content-security-policy")).toMatch(/default-src 'self'/);
      expect(h.get("content-security-policy")).toMatch(/frame-ancestors 'none'/);
      expect(h.get("x-content-type-options")).toBe("nosniff");
      expect(h.get("x-frame-options")).toBe("DENY");
      expect(h.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
      expect(h.get("permissions-policy")).toMatch(/geolocation=\(\)/);
      expect(h.get("x-powered-by")).toBeNull();
    }
  });
});
