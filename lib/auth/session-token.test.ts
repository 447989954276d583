import { encode } from "next-auth/jwt";
import { describe, expect, it } from "vitest";
import { sessionUserId, SESSION_MEMORY_MS } from "./session-token";

// Tokens are made by next-auth's own `encode` (the library that issues Kinarc's session cookies), so these checks
// hold the reader to the format Auth.js writes, not to one of ours.
const SECRET = "a-test-secret-that-is-long-enough-0123456789";
const NAME = "authjs.session-token";

async function cookieFor(sub: string, opts: { maxAge?: number; secret?: string; name?: string } = {}) {
  const name = opts.name ?? NAME;
  const token = await encode({ token: { sub, name: "T" }, secret: opts.secret ?? SECRET, salt: name, maxAge: opts.maxAge ?? 3600 });
  return `other=1; ${name}=${token}`;
}

describe("sessionUserId", () => {
  it("reads the user id from a cookie Auth.js issued", async () => {
    expect(await sessionUserId(await cookieFor("user-1"), SECRET)).toBe("user-1");
  });

  it("reads the HTTPS cookie name too", async () => {
    expect(await sessionUserId(await cookieFor("user-2", { name: "__Secure-authjs.session-token" }), SECRET)).toBe("user-2");
  });

  it("refuses a cookie made with another secret, a tampered one and none at all", async () => {
    expect(await sessionUserId(await cookieFor("user-3", { secret: "another-secret-that-is-long-enough-987654321" }), SECRET)).toBeNull();
    const good = await cookieFor("user-4");
    expect(await sessionUserId(good.slice(0, -3) + (good.endsWith("A") ? "BBB" : "AAA"), SECRET)).toBeNull();
    expect(await sessionUserId("other=1", SECRET)).toBeNull();
  });

  it("does not take a session from an Authorization header", async () => {
    // Only the cookie header is ever passed in; a bearer value in it is just an unknown cookie.
    const token = (await cookieFor("user-5")).split(`${NAME}=`)[1];
    expect(await sessionUserId(`authorization=Bearer ${token}`, SECRET)).toBeNull();
  });

  it("stops trusting a remembered token at its expiry", async () => {
    const cookie = await cookieFor("user-6", { maxAge: 30 });
    const now = Date.now();
    expect(await sessionUserId(cookie, SECRET, now)).toBe("user-6");
    // 31 s later the token has expired, although the memory window (60 s) has not.
    expect(SESSION_MEMORY_MS).toBeGreaterThan(31_000);
    expect(await sessionUserId(cookie, SECRET, now + 31_000)).toBeNull();
  });
});
