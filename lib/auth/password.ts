import { hash, verify } from "@node-rs/argon2";

// argon2id with the OWASP Password Storage Cheat Sheet's minimum (m=19 MiB, t=2, p=1).
const OPTIONS = { memoryCost: 19_456, timeCost: 2, parallelism: 1 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

export async function verifyPassword(passwordHash: string | null | undefined, password: string): Promise<boolean> {
  if (!passwordHash) return false;
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

/** Staff passwords: long enough to resist guessing; no composition rules (NIST SP 800-63B, 5.1.1). */
export const MIN_PASSWORD_LENGTH = 10;
