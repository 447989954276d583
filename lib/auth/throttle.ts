import { eq, inArray } from "drizzle-orm";
import type { Database } from "@/db";
import { signInThrottle } from "@/db/schema";

/** Failed sign-ins allowed per window before a lock; per account tighter than per address (shared clinic networks). */
export const THROTTLE_POLICY = {
  account: { maxFailures: 5, windowMs: 15 * 60_000, lockMs: 15 * 60_000 },
  address: { maxFailures: 30, windowMs: 15 * 60_000, lockMs: 15 * 60_000 },
} as const;

export type ThrottleKind = keyof typeof THROTTLE_POLICY;
export interface ThrottleKey {
  kind: ThrottleKind;
  value: string;
}

const keyOf = (k: ThrottleKey) => `${k.kind}:${k.value.toLowerCase()}`;

export interface ThrottleVerdict {
  locked: boolean;
  kind?: ThrottleKind;
  retryAfterMs?: number;
}

export async function checkThrottle(db: Database, keys: ThrottleKey[], now = new Date()): Promise<ThrottleVerdict> {
  const rows = await db
    .select()
    .from(signInThrottle)
    .where(inArray(signInThrottle.key, keys.map(keyOf)));
  for (const row of rows) {
    if (row.lockedUntil && row.lockedUntil > now) {
      return { locked: true, kind: row.key.split(":")[0] as ThrottleKind, retryAfterMs: row.lockedUntil.getTime() - now.getTime() };
    }
  }
  return { locked: false };
}

export async function recordFailure(db: Database, keys: ThrottleKey[], now = new Date()): Promise<void> {
  await db.transaction(async (tx) => {
    for (const k of keys) {
      const policy = THROTTLE_POLICY[k.kind];
      const key = keyOf(k);
      const [row] = await tx.select().from(signInThrottle).where(eq(signInThrottle.key, key));
      const windowOpen = row && now.getTime() - row.windowStartedAt.getTime() < policy.windowMs;
      const failures = windowOpen ? row.failures + 1 : 1;
      const windowStartedAt = windowOpen ? row.windowStartedAt : now;
      const lockedUntil = failures >= policy.maxFailures ? new Date(now.getTime() + policy.lockMs) : null;
      await tx
        .insert(signInThrottle)
        .values({ key, failures, windowStartedAt, lockedUntil })
        .onConflictDoUpdate({ target: signInThrottle.key, set: { failures, windowStartedAt, lockedUntil } });
    }
  });
}

/** A successful sign-in clears the account's counter (not the address's: one good password does not vouch for others). */
export async function clearAccount(db: Database, email: string): Promise<void> {
  await db.delete(signInThrottle).where(eq(signInThrottle.key, keyOf({ kind: "account", value: email })));
}
