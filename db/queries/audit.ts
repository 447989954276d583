import { and, desc, eq, gte, like, lt, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import type { Database } from "@/db";
import { auditEvents, clients, users } from "@/db/schema";

export interface AuditFilter {
  actorUserId?: string;
  clientId?: string;
  /** Prefix of the dotted action, e.g. `client.` or `auth.sign_in`. */
  action?: string;
  from?: string;
  to?: string;
  page: number;
  pageSize: number;
}

export async function listAuditEvents(db: Database, clinicId: string, f: AuditFilter) {
  const where: SQL[] = [eq(auditEvents.clinicId, clinicId)];
  if (f.actorUserId) where.push(eq(auditEvents.actorUserId, f.actorUserId));
  if (f.clientId) where.push(eq(auditEvents.clientId, f.clientId));
  if (f.action) where.push(like(auditEvents.action, `${f.action.replace(/[%_]/g, "")}%`));
  if (f.from) where.push(gte(auditEvents.at, new Date(`${f.from}T00:00:00Z`)));
  if (f.to) where.push(lt(auditEvents.at, new Date(new Date(`${f.to}T00:00:00Z`).getTime() + 86_400_000)));
  const actor = alias(users, "actor");
  return db
    .select({
      id: auditEvents.id,
      at: auditEvents.at,
      action: auditEvents.action,
      actorName: actor.name,
      actorRole: auditEvents.actorRole,
      clientGiven: clients.givenName,
      clientFamily: clients.familyName,
      subjectType: auditEvents.subjectType,
      address: auditEvents.address,
      detail: auditEvents.detail,
    })
    .from(auditEvents)
    .leftJoin(actor, eq(actor.id, auditEvents.actorUserId))
    .leftJoin(clients, eq(clients.id, auditEvents.clientId))
    .where(and(...where))
    .orderBy(desc(auditEvents.at))
    .limit(f.pageSize + 1)
    .offset((f.page - 1) * f.pageSize);
}

/** Everyone of the clinic who can appear as the actor of an event: staff and clients with a sign-in, by name. */
export async function listAuditPeople(db: Database, clinicId: string) {
  return db
    .select({ id: users.id, name: users.name, email: users.email, role: users.role })
    .from(users)
    .where(eq(users.clinicId, clinicId))
    .orderBy(users.role, users.name);
}
