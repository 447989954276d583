/**
 * Joins a practice attempt to its sitting while the attempt is being saved (called from lib/captures/save.ts inside
 * the attempt's transaction, so a session never exists without its attempt nor an attempt without its session).
 */
import type { DbOrTx } from "@/db";
import { getClinicTimeZone, getProgramItem, insertPracticeSessionIfMissing } from "@/db/queries/practice";
import type { Client, HomeProgramItem } from "@/db/schema";
import { AccessError } from "@/lib/auth/guard";
import { BadRequest } from "@/lib/http";
import { localDateIn } from "./schedule";

/**
 * The program item a practice attempt names, checked before the capture is analyzed: another client's item answers
 * like a missing one, so item ids cannot be probed.
 */
export async function requirePracticeItem(db: DbOrTx, client: Client, itemId: string): Promise<HomeProgramItem> {
  const item = await getProgramItem(db, client.clinicId, client.id, itemId);
  if (!item) throw new AccessError(404, "No such home program item for this client.");
  return item;
}

/** The analysis must be of the motion that was assigned, or the reading would land on the wrong trend. */
export function checkPracticeMatches(item: HomeProgramItem, analysis: { motion: string; side: string; digit: string | null }): void {
  if (item.motion !== analysis.motion || item.side !== analysis.side || (item.digit ?? null) !== (analysis.digit ?? null)) {
    throw new BadRequest("This capture is of another motion than the program item it names.", {
      practiceItemId: `expected a capture of ${item.motion}, ${item.side}${item.digit ? ` ${item.digit}` : ""}`,
    });
  }
}

/** Creates the session on its first attempt (dated in the clinic's time zone); later attempts and retries join it. */
export async function joinPracticeSession(
  tx: DbOrTx,
  client: Client,
  item: HomeProgramItem,
  sessionId: string,
  recordedAt: Date,
): Promise<string> {
  const timeZone = await getClinicTimeZone(tx, client.clinicId);
  const session = await insertPracticeSessionIfMissing(tx, {
    id: sessionId,
    clinicId: client.clinicId,
    clientId: client.id,
    itemId: item.id,
    startedAt: recordedAt,
    localDate: localDateIn(recordedAt, timeZone),
  });
  if (session.clientId !== client.id || session.itemId !== item.id) {
    throw new BadRequest("This practice session belongs to another program item.", { practiceSessionId: "expected a new id, or the id of a session of this item" });
  }
  return session.id;
}
