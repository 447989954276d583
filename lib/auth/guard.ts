import { and, eq } from "drizzle-orm";
import { headers } from "next/headers";
import { z } from "zod";
import { getDb, type Database } from "@/db";
import { clients, staffActivity, users, type Client, type Role } from "@/db/schema";
import { recordAuditGrouped } from "@/lib/audit";
import { env } from "@/lib/env";
import { staffSessionActive, type StaffActivityTimes } from "./idle";
import { requestAddress } from "./index";
import { sessionUserId } from "./session-token";

/** The signed-in person as the server sees them, re-read from the database on every request. */
export interface Actor {
  userId: string;
  role: Role;
  clinicId: string;
  name: string;
  email: string;
  /** For role `client`: the client record this account belongs to. */
  clientId: string | null;
}

export class AccessError extends Error {
  constructor(
    public readonly status: 401 | 403 | 404,
    message: string,
  ) {
    super(message);
  }
}

export const NOT_FOUND = "No such record.";

export async function actorForUser(db: Database, userId: string): Promise<Actor | null> {
  return (await actorWithActivity(db, userId))?.actor ?? null;
}

/** The actor and, in the same query, the times the idle sign-out rule needs. */
async function actorWithActivity(db: Database, userId: string): Promise<{ actor: Actor; activity: StaffActivityTimes } | null> {
  const [row] = await db
    .select({ user: users, clientId: clients.id, lastActiveAt: staffActivity.lastActiveAt })
    .from(users)
    .leftJoin(clients, eq(clients.userId, users.id))
    .leftJoin(staffActivity, eq(staffActivity.userId, users.id))
    .where(eq(users.id, userId));
  if (!row || !row.user.active || !row.user.clinicId) return null;
  if (row.user.role === "client" && !row.clientId) return null;
  return {
    actor: {
      userId: row.user.id,
      role: row.user.role,
      clinicId: row.user.clinicId,
      name: row.user.name ?? row.user.email,
      email: row.user.email,
      clientId: row.user.role === "client" ? row.clientId : null,
    },
    activity: { lastSignInAt: row.user.lastSignInAt, lastActiveAt: row.lastActiveAt },
  };
}

export async function currentActor(): Promise<Actor | null> {
  const userId = await sessionUserId((await headers()).get("cookie") ?? "", env().AUTH_SECRET);
  if (!userId) return null;
  const db = getDb();
  const found = await actorWithActivity(db, userId);
  if (!found) return null;
  // Staff sessions lapse after STAFF_IDLE_MINUTES without a request (lib/auth/idle.ts).
  if (!(await staffSessionActive(db, found.actor, env().STAFF_IDLE_MINUTES, new Date(), found.activity))) return null;
  return found.actor;
}

/** Resolves the session and checks the role. 401 when not signed in, 403 when the role may not do this. */
export async function requireActor(roles: readonly Role[]): Promise<Actor> {
  const actor = await currentActor();
  if (!actor) throw new AccessError(401, "Sign in to continue.");
  assertRole(actor, roles);
  return actor;
}

export function assertRole(actor: Actor, roles: readonly Role[]): void {
  if (!roles.includes(actor.role)) throw new AccessError(403, `A ${actor.role} account cannot do this.`);
}

/**
 * Loads a client record the actor may see, or 404 (never 403, so a record's existence does not leak): staff see their
 * own clinic's clients; a client sees only their own record. Every read is audited.
 */
export async function requireClientRecord(
  actor: Actor,
  clientId: string,
  opts: { db?: Database; address?: string | null; purpose?: string } = {},
): Promise<Client> {
  const db = opts.db ?? getDb();
  if (!z.uuid().safeParse(clientId).success) throw new AccessError(404, NOT_FOUND);
  if (actor.role === "client" && actor.clientId !== clientId) throw new AccessError(404, NOT_FOUND);
  const [record] = await db
    .select()
    .from(clients)
    .where(and(eq(clients.id, clientId), eq(clients.clinicId, actor.clinicId)));
  if (!record) throw new AccessError(404, NOT_FOUND);
  await recordAuditGrouped(db, {
    action: "client.read",
    clinicId: actor.clinicId,
    actorUserId: actor.userId,
    actorRole: actor.role,
    subjectType: "client",
    subjectId: record.id,
    clientId: record.id,
    address: opts.address ?? null,
    detail: opts.purpose ? { purpose: opts.purpose } : undefined,
  });
  return record;
}

export { requestAddress };
