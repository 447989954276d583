import { and, desc, eq } from "drizzle-orm";
import type { Database } from "@/db";
import { consents } from "@/db/schema";
import { auditActorEvent } from "@/lib/audit";
import type { Actor } from "@/lib/auth/guard";
import { consentTextSha256, TELEHEALTH_CONSENT } from "./telehealth";

/** The client's signature of the current telehealth consent text, if any. */
export async function currentTelehealthConsent(db: Database, clientId: string) {
  const [row] = await db
    .select()
    .from(consents)
    .where(and(eq(consents.clientId, clientId), eq(consents.kind, "telehealth"), eq(consents.version, TELEHEALTH_CONSENT.version)))
    .orderBy(desc(consents.signedAt))
    .limit(1);
  return row ?? null;
}

export async function signTelehealthConsent(db: Database, actor: Actor, signedName: string, address: string | null) {
  if (!actor.clientId) throw new Error("only a client signs their own consent");
  const existing = await currentTelehealthConsent(db, actor.clientId);
  if (existing) return existing;
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(consents)
      .values({
        clientId: actor.clientId!,
        kind: "telehealth",
        version: TELEHEALTH_CONSENT.version,
        textSha256: consentTextSha256(),
        signedName,
        signedByUserId: actor.userId,
        signedAt: new Date(),
        address,
      })
      .returning();
    await auditActorEvent(tx, actor, {
      action: "consent.sign",
      subjectType: "consent",
      subjectId: row.id,
      clientId: actor.clientId,
      detail: { kind: "telehealth", version: TELEHEALTH_CONSENT.version },
    });
    return row;
  });
}
