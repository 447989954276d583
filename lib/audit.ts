import type { Database } from "@/db";
import { auditEvents } from "@/db/schema";
// Type only: lib/auth/guard.ts imports this module at run time.
import type { Actor } from "@/lib/auth/guard";

export interface AuditInput {
  action: string;
  clinicId?: string | null;
  actorUserId?: string | null;
  actorRole?: string | null;
  subjectType?: string;
  subjectId?: string;
  clientId?: string | null;
  address?: string | null;
  detail?: Record<string, unknown>;
}

type Writer = Pick<Database, "insert">;

/** Appends one audit event. Pass the transaction when the audited change is part of one, so both commit together. */
export async function recordAudit(db: Writer, event: AuditInput): Promise<void> {
  await db.insert(auditEvents).values({
    action: event.action,
    clinicId: event.clinicId ?? null,
    actorUserId: event.actorUserId ?? null,
    actorRole: event.actorRole ?? null,
    subjectType: event.subjectType ?? null,
    subjectId: event.subjectId ?? null,
    clientId: event.clientId ?? null,
    address: event.address ?? null,
    detail: event.detail ?? null,
  });
}

/** The part of the signed-in person an audit event names (lib/auth/guard.ts `Actor` fits it). */
export type AuditActor = Pick<Actor, "userId" | "role" | "clinicId">;

/**
 * An event done by a signed-in person. `clinicId` is the clinic of the record when the call site has it, so the row
 * names the record's clinic as before; without it, the actor's (the guard makes the two equal).
 */
export type ActorEventInput = Omit<AuditInput, "actorUserId" | "actorRole">;

/**
 * Appends one audit event whose actor, role and (by default) clinic come from the signed-in person. Pass the
 * transaction when the audited change is part of one. Events without a person (sign-in attempts, webhooks, jobs) use
 * `recordAudit`.
 */
export function auditActorEvent(db: Writer, actor: AuditActor, event: ActorEventInput): Promise<void> {
  return recordAudit(db, { ...event, clinicId: event.clinicId ?? actor.clinicId, actorUserId: actor.userId, actorRole: actor.role });
}

/**
 * Appends an audit event together with others recorded at the same moment, in one transaction (a group commit), and
 * resolves only once that transaction has committed, so the caller still answers after its access is on record.
 * Reads of clinical records are audited one by one and each commit waits for the disk; under many concurrent reads
 * one commit now carries them all. Not for events that belong to a transaction of the caller's (use `recordAudit`
 * with the transaction handle).
 */
export function recordAuditGrouped(db: Database, event: AuditInput): Promise<void> {
  let group = pendingGroups.get(db);
  if (!group) {
    group = { events: [], waiters: [] };
    pendingGroups.set(db, group);
    const mine = group;
    // Let every request that is already running add its event before the commit starts.
    setImmediate(() => {
      pendingGroups.delete(db);
      void flushGroup(db, mine);
    });
  }
  group.events.push(event);
  return new Promise<void>((resolve, reject) => group.waiters.push({ resolve, reject }));
}

interface PendingGroup {
  events: AuditInput[];
  waiters: { resolve: () => void; reject: (error: unknown) => void }[];
}

const pendingGroups = new WeakMap<Database, PendingGroup>();

async function flushGroup(db: Database, group: PendingGroup): Promise<void> {
  try {
    await db.transaction(async (tx) => {
      for (const event of group.events) await recordAudit(tx, event);
    });
    for (const w of group.waiters) w.resolve();
  } catch (error) {
    for (const w of group.waiters) w.reject(error);
  }
}
