import { DrizzleAdapter } from "@auth/drizzle-adapter";
import { eq } from "drizzle-orm";
import NextAuth, { type DefaultSession } from "next-auth";
import type {} from "next-auth/jwt";
import Credentials from "next-auth/providers/credentials";
import Nodemailer from "next-auth/providers/nodemailer";
import { z } from "zod";
import { getDb } from "@/db";
import { accounts, clients, sessions, users, verificationTokens, type Role } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { env } from "@/lib/env";
import { renderMessage, sendMail } from "@/lib/mail";
import { InvalidSignIn, ThrottledSignIn } from "./errors";
import { verifyPassword } from "./password";
import { checkThrottle, clearAccount, recordFailure, type ThrottleKey } from "./throttle";

declare module "next-auth" {
  interface Session {
    user: { id: string; role: Role; clinicId: string | null } & DefaultSession["user"];
  }
}
declare module "next-auth/jwt" {
  interface JWT {
    role?: Role;
    clinicId?: string | null;
  }
}

const credentialsSchema = z.object({
  email: z.email().transform((e) => e.trim().toLowerCase()),
  password: z.string().min(1).max(200),
});

/** The caller's address as the proxy in front of Kinarc reports it. */
export function requestAddress(headers: Headers): string {
  return headers.get("x-forwarded-for")?.split(",")[0]?.trim() || headers.get("x-real-ip") || "unknown";
}

/** Clients sign in with a link valid for 15 minutes (a short window limits a forwarded or intercepted mail). */
const LINK_LIFETIME_S = 15 * 60;

export const { handlers, auth, signIn, signOut } = NextAuth(() => {
  const db = getDb();
  const e = env();
  return {
    secret: e.AUTH_SECRET,
    trustHost: true,
    adapter: DrizzleAdapter(db, {
      usersTable: users,
      accountsTable: accounts,
      sessionsTable: sessions,
      verificationTokensTable: verificationTokens,
    }),
    // Credentials sign-in requires JWT sessions; the guard re-reads the user on every request, so deactivation and
    // role changes take effect at once.
    session: { strategy: "jwt", maxAge: 12 * 60 * 60, updateAge: 5 * 60 },
    pages: { signIn: "/sign-in", verifyRequest: "/sign-in/check-email", error: "/sign-in" },
    providers: [
      Credentials({
        credentials: { email: {}, password: {} },
        async authorize(raw, request) {
          const parsed = credentialsSchema.safeParse(raw);
          if (!parsed.success) throw new InvalidSignIn();
          const { email, password } = parsed.data;
          const address = requestAddress(request.headers);
          const keys: ThrottleKey[] = [
            { kind: "account", value: email },
            { kind: "address", value: address },
          ];
          if ((await checkThrottle(db, keys)).locked) {
            await recordAudit(db, { action: "auth.sign_in_throttled", address, detail: { email } });
            throw new ThrottledSignIn();
          }
          const [user] = await db.select().from(users).where(eq(users.email, email));
          const ok = user?.active ? await verifyPassword(user.passwordHash, password) : false;
          if (!user || !ok) {
            await recordFailure(db, keys);
            await recordAudit(db, {
              action: "auth.sign_in_failed",
              clinicId: user?.clinicId ?? null,
              actorUserId: user?.id ?? null,
              address,
              detail: { email, method: "password" },
            });
            throw new InvalidSignIn();
          }
          await clearAccount(db, email);
          await db.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, user.id));
          await recordAudit(db, {
            action: "auth.sign_in",
            clinicId: user.clinicId,
            actorUserId: user.id,
            actorRole: user.role,
            address,
            detail: { method: "password" },
          });
          return { id: user.id, email: user.email, name: user.name };
        },
      }),
      Nodemailer({
        server: e.SMTP_URL,
        from: e.MAIL_FROM,
        maxAge: LINK_LIFETIME_S,
        async sendVerificationRequest({ identifier, url }) {
          const message = renderMessage({
            heading: "Your Kinarc sign-in link",
            paragraphs: [
              "Use the button below to open your Kinarc page. The link works once and only for the next 15 minutes.",
              "If you did not ask for it, you can ignore this e-mail; nobody can sign in without it.",
            ],
            action: { label: "Open Kinarc", url },
          });
          await sendMail({ to: identifier, subject: "Your Kinarc sign-in link", ...message });
        },
      }),
    ],
    callbacks: {
      async signIn({ user, account }) {
        if (account?.provider !== "nodemailer") return true;
        // Links go only to existing, active client accounts that belong to a clinic's client record.
        const email = (user.email ?? "").toLowerCase();
        const [row] = await db
          .select({ id: users.id, role: users.role, active: users.active, clientId: clients.id })
          .from(users)
          .leftJoin(clients, eq(clients.userId, users.id))
          .where(eq(users.email, email));
        return Boolean(row && row.active && row.role === "client" && row.clientId);
      },
      async jwt({ token, user }) {
        if (user?.id) {
          const [row] = await db.select({ role: users.role, clinicId: users.clinicId }).from(users).where(eq(users.id, user.id));
          token.sub = user.id;
          token.role = row?.role;
          token.clinicId = row?.clinicId ?? null;
        }
        return token;
      },
      session({ session, token }) {
        if (token.sub) {
          session.user.id = token.sub;
          session.user.role = token.role ?? "client";
          session.user.clinicId = token.clinicId ?? null;
        }
        return session;
      },
    },
    events: {
      async signIn({ user, account }) {
        if (account?.provider !== "nodemailer" || !user.id) return;
        const [row] = await db.select().from(users).where(eq(users.id, user.id));
        await db.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, user.id));
        await recordAudit(db, {
          action: "auth.sign_in",
          clinicId: row?.clinicId,
          actorUserId: user.id,
          actorRole: row?.role,
          detail: { method: "email_link" },
        });
      },
    },
  };
});
