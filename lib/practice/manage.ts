/**
 * Assigning, changing and ending home program items. Therapists and assistants only (admins read the clinic's
 * records but do not prescribe); every change is audited in the same transaction.
 */
import type { Database } from "@/db";
import { createProgramItem, endProgramItem, getProgramItem, updateProgramItem } from "@/db/queries/practice";
import type { HomeProgramItem } from "@/db/schema";
import { auditActorEvent } from "@/lib/audit";
import { AccessError, assertRole, requireClientRecord, type Actor } from "@/lib/auth/guard";
import { BadRequest } from "@/lib/http";
import { programItemSchema } from "@/lib/validation/practice";
import { blockedReason } from "./program";

export const PROGRAM_EDITORS = ["therapist", "assistant"] as const;
/** Who may read a program: the clinic's clinicians and the client themself (admins see it in the export only). */
export const PROGRAM_READERS = ["therapist", "assistant", "client"] as const;

interface Ctx {
  address?: string | null;
  now?: Date;
}

async function parseFor(db: Database, actor: Actor, clientId: string, raw: unknown, ctx: Ctx) {
  assertRole(actor, PROGRAM_EDITORS);
  const client = await requireClientRecord(actor, clientId, { db, address: ctx.address, purpose: "program.edit" });
  const input = programItemSchema.parse(raw);
  const blocked = blockedReason(client, input.motion);
  // Offered to nobody at home while the precaution stands; the record's precautions are where to change that.
  if (blocked) throw new BadRequest("This motion is not offered for home practice on this record.", { motion: `not offered at home while the record's precautions stand: ${blocked}` });
  return { client, input };
}

/** The audit event of a change to a program item, written in the change's transaction. */
function auditItem(tx: Parameters<typeof auditActorEvent>[0], actor: Actor, action: string, item: HomeProgramItem, ctx: Ctx, withDetail: boolean) {
  return auditActorEvent(tx, actor, {
    action,
    clinicId: item.clinicId,
    subjectType: "home_program_item",
    subjectId: item.id,
    clientId: item.clientId,
    address: ctx.address ?? null,
    detail: withDetail ? { motion: item.motion, side: item.side, digit: item.digit, startDate: item.startDate, endDate: item.endDate } : undefined,
  });
}

export async function assignProgramItem(db: Database, actor: Actor, clientId: string, raw: unknown, ctx: Ctx = {}): Promise<HomeProgramItem> {
  const { client, input } = await parseFor(db, actor, clientId, raw, ctx);
  return db.transaction(async (tx) => {
    const item = await createProgramItem(tx, { ...input, clinicId: client.clinicId, clientId: client.id, assignedByUserId: actor.userId });
    await auditItem(tx, actor, "program.assign", item, ctx, true);
    return item;
  });
}

async function requireItem(db: Database, clinicId: string, clientId: string, itemId: string): Promise<HomeProgramItem> {
  const item = await getProgramItem(db, clinicId, clientId, itemId);
  if (!item) throw new AccessError(404, "No such home program item.");
  return item;
}

export async function changeProgramItem(db: Database, actor: Actor, clientId: string, itemId: string, raw: unknown, ctx: Ctx = {}): Promise<HomeProgramItem> {
  const { client, input } = await parseFor(db, actor, clientId, raw, ctx);
  const before = await requireItem(db, client.clinicId, client.id, itemId);
  if (before.endedAt) throw new BadRequest("This item has ended; assign a new one instead.", { _: "expected an item that has not ended" });
  return db.transaction(async (tx) => {
    const item = await updateProgramItem(tx, before.id, input, ctx.now);
    await auditItem(tx, actor, "program.update", item, ctx, true);
    return item;
  });
}

export async function endProgramItemFor(db: Database, actor: Actor, clientId: string, itemId: string, ctx: Ctx = {}): Promise<HomeProgramItem> {
  assertRole(actor, PROGRAM_EDITORS);
  const client = await requireClientRecord(actor, clientId, { db, address: ctx.address, purpose: "program.end" });
  const before = await requireItem(db, client.clinicId, client.id, itemId);
  if (before.endedAt) return before;
  return db.transaction(async (tx) => {
    const item = await endProgramItem(tx, before.id, actor.userId, ctx.now);
    await auditItem(tx, actor, "program.end", item, ctx, false);
    return item;
  });
}
