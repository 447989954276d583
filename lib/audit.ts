import type { Database } from "@/db";
import { auditEvents } from "@/db/schema";

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
