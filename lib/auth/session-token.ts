import { decode, getToken, type JWT } from "next-auth/jwt";

/**
 * The signed-in user's id from the Auth.js session cookie, read the way Auth.js itself issues it (next-auth's public
 * `getToken`/`decode`), without running the whole session endpoint on every request: `auth()` builds the
 * configuration, decrypts the cookie and encrypts a refreshed one that a server component or route handler cannot
 * send anyway. The session's expiry still rules; the guard re-reads the user from the database on every request, so
 * deactivation and role changes still take effect at once.
 */
const SECURE_NAME = "__Secure-authjs.session-token";
const PLAIN_NAME = "authjs.session-token";

/** Decrypted tokens, by their text: decrypting one costs a key derivation and two ciphers; a page loads many. */
const decoded = new Map<string, { sub: string | null; validUntilMs: number }>();
const CACHE_LIMIT = 2_000;
/** A decoded token is trusted from memory this long at most (and never past its own expiry). */
export const SESSION_MEMORY_MS = 60_000;

export async function sessionUserId(cookieHeader: string, secret: string, nowMs = Date.now()): Promise<string | null> {
  // Browsers only accept a `__Secure-` cookie over HTTPS, so its presence says which name Auth.js used.
  const secureCookie = cookieHeader.includes(`${SECURE_NAME}`);
  const cookieName = secureCookie ? SECURE_NAME : PLAIN_NAME;
  // Only the cookie: Auth.js sessions are not accepted from an Authorization header here.
  const req = { headers: { cookie: cookieHeader } };
  const token = await getToken({ req, secret, secureCookie, cookieName, raw: true });
  if (!token) return null;
  const key = `${cookieName}\n${token}`;
  const hit = decoded.get(key);
  if (hit && hit.validUntilMs > nowMs) return hit.sub;
  let payload: JWT | null = null;
  try {
    payload = await decode({ token, secret, salt: cookieName });
  } catch {
    payload = null;
  }
  const sub = typeof payload?.sub === "string" ? payload.sub : null;
  const expMs = typeof payload?.exp === "number" ? payload.exp * 1000 : nowMs;
  if (decoded.size >= CACHE_LIMIT) decoded.delete(decoded.keys().next().value!);
  decoded.set(key, { sub, validUntilMs: Math.min(expMs, nowMs + SESSION_MEMORY_MS) });
  return expMs > nowMs ? sub : null;
}
