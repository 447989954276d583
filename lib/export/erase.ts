import { and, count, eq, getTableName, isNull, ne, sql } from "drizzle-orm";
import { getTableConfig } from "drizzle-orm/sqlite-core";
import type { Database } from "@/db";
import * as schema from "@/db/schema";
import { auditActorEvent } from "@/lib/audit";
import type { Actor } from "@/lib/auth/guard";
import type { BlobStore } from "@/lib/storage";
import { tablesWithClientId } from "./client-export";

/**
 * The rule Kinarc follows on a client's request to be erased. [common practice] Health-record laws oblige a clinic to
 * keep the clinical record for years after the last visit (for example the NHS records retention schedule keeps adult
 * records 8 years; US states set 5-10 years), and the GDPR lets such legal duties override erasure (Art. 17(3)(b) and
 * (c)). Financial records are kept for tax law. So:
 * - deleted: files sent by or for the client, attempts never kept towards a grade (self-checks, practice), grade
 *   drafts never signed, and the client's sign-in account;
 * - kept, pseudonymised: the signed grades and the attempts they rest on, the therapist's measurements, visits,
 *   payments, consents (without the typed name) and the audit trail; the client row keeps only a placeholder name and
 *   the birth year (age-matched norms need it), so Kinarc no longer shows who the person was;
 * - the clinic is told to export first if its own records policy needs the identifiable copy outside Kinarc.
 */
export const ERASURE_RULE =
  "Files, practice and self-check attempts, unsigned drafts and the sign-in account are deleted. Signed grades with their kept attempts, therapist measurements, visits, payments, consents and the audit trail are kept for the legal retention period, with the name, contact details and notes removed from the client record.";

/** Tables this rule decides about; any other table with a client_id is kept as is and named in the summary. */
const CLASSIFIED = new Set([
  "audit_events",
  "visits",
  "consents",
  "attempts",
  "passive_ranges",
  "grade_entries",
  "strength_readings",
  "uploads",
  "payments",
  "client_erasures",
  // The home program a therapist set is part of the clinical record (kept); the practice sessions only group
  // practice attempts, which are never kept towards a grade and are deleted above, so the sessions go too.
  "home_program_items",
  "practice_sessions",
]);

export interface ErasureSummary {
  rule: string;
  deleted: Record<string, number>;
  kept: Record<string, number>;
  unclassifiedTablesKept: string[];
}

export class ErasureRefused extends Error {}

/** Erases a client on request (admin only; the caller checks role and clinic). Runs in one transaction; files go after commit. */
export async function eraseClient(db: Database, store: BlobStore, actor: Actor, clientId: string, opts: { requestedAt: Date; address?: string | null }): Promise<ErasureSummary> {
  const { summary, storageKeys } = await db.transaction(async (tx) => {
    const [client] = await tx
      .select()
      .from(schema.clients)
      .where(and(eq(schema.clients.id, clientId), eq(schema.clients.clinicId, actor.clinicId)));
    if (!client) throw new ErasureRefused("No such client.");
    const [already] = await tx.select().from(schema.clientErasures).where(eq(schema.clientErasures.clientId, clientId));
    if (already) throw new ErasureRefused("This client was already erased.");

    const uploads = await tx.select({ key: schema.uploads.storageKey }).from(schema.uploads).where(eq(schema.uploads.clientId, clientId));
    const deleted: Record<string, number> = {};
    deleted.uploads = (await tx.delete(schema.uploads).where(eq(schema.uploads.clientId, clientId)).returning({ id: schema.uploads.id })).length;
    deleted.attemptsNotKept = (
      await tx
        .delete(schema.attempts)
        .where(and(eq(schema.attempts.clientId, clientId), isNull(schema.attempts.keptAt)))
        .returning({ id: schema.attempts.id })
    ).length;
    deleted.practiceSessions = (
      await tx.delete(schema.practiceSessions).where(eq(schema.practiceSessions.clientId, clientId)).returning({ id: schema.practiceSessions.id })
    ).length;
    deleted.unsignedGradeDrafts = (
      await tx
        .delete(schema.gradeEntries)
        .where(and(eq(schema.gradeEntries.clientId, clientId), ne(schema.gradeEntries.status, "signed")))
        .returning({ id: schema.gradeEntries.id })
    ).length;
    deleted.signInAccount = 0;
    if (client.userId) {
      // Sign-in e-mails recorded in the trail's details go with the account; the events themselves stay.
      await tx.run(sql`update audit_events set detail = json_remove(detail, '$.email') where actor_user_id = ${client.userId} and detail is not null`);
      deleted.signInAccount = (await tx.delete(schema.users).where(eq(schema.users.id, client.userId)).returning({ id: schema.users.id })).length;
    }
    await tx.update(schema.consents).set({ signedName: "(erased on request)", address: null }).where(eq(schema.consents.clientId, clientId));
    await tx
      .update(schema.clients)
      .set({
        givenName: "Erased",
        familyName: `client ${client.id.slice(0, 8)}`,
        email: null,
        userId: null,
        dateOfBirth: `${client.dateOfBirth.slice(0, 4)}-01-01`,
        diagnosisNote: "",
        referringPhysician: "",
        precautionNote: "",
        archivedAt: new Date(),
        updatedAt: new Date(),
      })
      .where(eq(schema.clients.id, clientId));

    const kept: Record<string, number> = {};
    const unclassifiedTablesKept: string[] = [];
    for (const table of tablesWithClientId()) {
      const name = getTableName(table);
      const col = getTableConfig(table).columns.find((c) => c.name === "client_id")!;
      const [{ n }] = await tx.select({ n: count() }).from(table).where(eq(col, clientId));
      if (name !== "uploads" && name !== "client_erasures") kept[name] = n;
      if (!CLASSIFIED.has(name) && n > 0) unclassifiedTablesKept.push(name);
    }
    const summary: ErasureSummary = { rule: ERASURE_RULE, deleted, kept, unclassifiedTablesKept };
    await tx.insert(schema.clientErasures).values({ clinicId: actor.clinicId, clientId, requestedAt: opts.requestedAt, erasedAt: new Date(), erasedByUserId: actor.userId, summary: { ...summary } });
    await auditActorEvent(tx, actor, {
      action: "client.erase",
      subjectType: "client",
      subjectId: clientId,
      clientId,
      address: opts.address ?? null,
      detail: { deleted, kept },
    });
    return { summary, storageKeys: uploads.map((u) => u.key) };
  });
  for (const key of storageKeys) await store.delete(key);
  return summary;
}
