/** Starting the guided self-check for one home program item. Server-only. */
import { randomUUID } from "node:crypto";
import type { DbOrTx } from "@/db";
import { getClinicTimeZone, getProgramItem } from "@/db/queries/practice";
import type { Client } from "@/db/schema";
import type { Condition, Digit, MotionId, Side } from "@/lib/motions/catalog";
import { blockedReason, toScheduled } from "./program";
import { isActiveOn, localDateIn } from "./schedule";

export interface PracticeTarget {
  itemId: string;
  /** A new sitting's id; the browser sends it with every attempt of this sitting. */
  sessionId: string;
  motion: MotionId;
  digit: Digit | null;
  side: Side;
  condition: Condition;
  repetitions: number;
  notes: string;
}

/**
 * The item to practise, or null when it is not this client's, not active today, or withheld by a precaution on the
 * record (the client is never offered a motion a precaution rules out, even by a typed-in address).
 */
export async function practiceTarget(db: DbOrTx, client: Client, itemId: string, now = new Date()): Promise<PracticeTarget | null> {
  if (!/^[0-9a-f-]{36}$/i.test(itemId)) return null;
  const item = await getProgramItem(db, client.clinicId, client.id, itemId);
  if (!item || blockedReason(client, item.motion)) return null;
  const timeZone = await getClinicTimeZone(db, client.clinicId);
  if (!isActiveOn(toScheduled(item, timeZone), localDateIn(now, timeZone))) return null;
  return {
    itemId: item.id,
    sessionId: randomUUID(),
    motion: item.motion as MotionId,
    digit: item.digit,
    side: item.side,
    condition: item.condition,
    repetitions: item.repetitions,
    notes: item.notes,
  };
}
