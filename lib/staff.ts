import { createHash, randomBytes } from "node:crypto";
import { and, eq, gt, isNull } from "drizzle-orm";
import type { Database } from "@/db";
import { passwordTokens, users } from "@/db/schema";
import { auditActorEvent, recordAudit } from "@/lib/audit";
import type { Actor } from "@/lib/auth/guard";
import { hashPassword } from "@/lib/auth/password";
import { env } from "@/lib/env";
import { BadRequest } from "@/lib/http";
import { renderMessage, sendMail } from "@/lib/mail";

const INVITE_LIFETIME_MS = 7 * 24 * 60 * 60 * 1000;

const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");

/**
 * Creates a staff account without a password and e-mails a one-time link to set one. The account and the token are
 * written in one transaction; the mail goes out after the commit (a failed send leaves an account the admin can
 * invite again).
 */
export async function inviteStaff(db: Database, admin: Actor, input: { name: string; email: string; role: "admin" | "therapist" | "assistant" }) {
  const token = randomBytes(32).toString("base64url");
  await db.transaction(async (tx) => {
    const [existing] = await tx.select({ id: users.id }).from(users).where(eq(users.email, input.email));
    if (existing) throw new BadRequest("Invalid input (email: already has a Kinarc account)", { email: "already has a Kinarc account" });
    const [user] = await tx.insert(users).values({ clinicId: admin.clinicId, name: input.name, email: input.email, role: input.role }).returning();
    await tx.insert(passwordTokens).values({ tokenHash: sha256(token), userId: user.id, purpose: "invite", expiresAt: new Date(Date.now() + INVITE_LIFETIME_MS) });
    await auditActorEvent(tx, admin, {
      action: "staff.invite",
      subjectType: "user",
      subjectId: user.id,
      detail: { role: input.role },
    });
  });
  const url = `${env().APP_URL}/welcome/${token}`;
  const message = renderMessage({
    heading: `Welcome to Kinarc, ${input.name.split(" ")[0]}`,
    paragraphs: [
      `${admin.name} has invited you to join your clinic's Kinarc as ${input.role === "admin" ? "an admin" : `a ${input.role}`}.`,
      "Choose a password with the link below. It works once, for seven days.",
    ],
    action: { label: "Set my password", url },
  });
  await sendMail({ to: input.email, subject: "You are invited to Kinarc", ...message });
}

/** Sets a password from an invitation or reset link; the token is spent in the same transaction. */
export async function redeemPasswordToken(db: Database, token: string, password: string): Promise<{ email: string } | null> {
  const passwordHash = await hashPassword(password);
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select({ userId: passwordTokens.userId, email: users.email, clinicId: users.clinicId, role: users.role })
      .from(passwordTokens)
      .innerJoin(users, eq(users.id, passwordTokens.userId))
      .where(and(eq(passwordTokens.tokenHash, sha256(token)), isNull(passwordTokens.usedAt), gt(passwordTokens.expiresAt, new Date()), eq(users.active, true)));
    if (!row) return null;
    await tx.update(passwordTokens).set({ usedAt: new Date() }).where(eq(passwordTokens.tokenHash, sha256(token)));
    await tx.update(users).set({ passwordHash, emailVerified: new Date(), updatedAt: new Date() }).where(eq(users.id, row.userId));
    await recordAudit(tx, { action: "staff.password_set", clinicId: row.clinicId, actorUserId: row.userId, actorRole: row.role });
    return { email: row.email };
  });
}

export async function isPasswordTokenValid(db: Database, token: string): Promise<boolean> {
  const [row] = await db
    .select({ userId: passwordTokens.userId })
    .from(passwordTokens)
    .where(and(eq(passwordTokens.tokenHash, sha256(token)), isNull(passwordTokens.usedAt), gt(passwordTokens.expiresAt, new Date())));
  return Boolean(row);
}
