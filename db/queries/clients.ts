import { and, asc, count, desc, eq, isNull, or, sql, type SQL } from "drizzle-orm";
import type { Database, DbOrTx } from "@/db";
import { clients, users, type Client } from "@/db/schema";
import type { ClientInput, ClientListQuery, ClientPatch } from "@/lib/validation/client";

export interface ClientListRow {
  id: string;
  givenName: string;
  familyName: string;
  dateOfBirth: string;
  affectedSide: Client["affectedSide"];
  diagnosisNote: string;
  precautionFlags: Client["precautionFlags"];
  noResistedUntil: string | null;
  primaryTherapistId: string | null;
  primaryTherapistName: string | null;
  updatedAt: string;
}

export interface ClientListPage {
  rows: ClientListRow[];
  total: number;
  page: number;
  pageSize: number;
}

function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, (c) => `\\${c}`);
}

export async function listClients(db: Database, clinicId: string, query: ClientListQuery): Promise<ClientListPage> {
  const filters: SQL[] = [eq(clients.clinicId, clinicId), isNull(clients.archivedAt)];
  if (query.q) {
    const pattern = `%${escapeLike(query.q.toLowerCase())}%`;
    filters.push(
      or(
        sql`lower(${clients.givenName} || ' ' || ${clients.familyName}) like ${pattern} escape '\\'`,
        sql`lower(${clients.diagnosisNote}) like ${pattern} escape '\\'`,
      )!,
    );
  }
  if (query.therapistId) filters.push(eq(clients.primaryTherapistId, query.therapistId));
  if (query.flagged === "true") filters.push(sql`json_array_length(${clients.precautionFlags}) > 0`);
  if (query.flagged === "false") filters.push(sql`json_array_length(${clients.precautionFlags}) = 0`);
  const where = and(...filters);
  const order = query.dir === "desc" ? desc : asc;
  const orderBy =
    query.sort === "name"
      ? [order(sql`lower(${clients.familyName})`), order(sql`lower(${clients.givenName})`)]
      : [order(clients[query.sort])];

  const [{ total }] = await db.select({ total: count() }).from(clients).where(where);
  const rows = await db
    .select({
      id: clients.id,
      givenName: clients.givenName,
      familyName: clients.familyName,
      dateOfBirth: clients.dateOfBirth,
      affectedSide: clients.affectedSide,
      diagnosisNote: clients.diagnosisNote,
      precautionFlags: clients.precautionFlags,
      noResistedUntil: clients.noResistedUntil,
      primaryTherapistId: clients.primaryTherapistId,
      primaryTherapistName: users.name,
      updatedAt: clients.updatedAt,
    })
    .from(clients)
    .leftJoin(users, eq(users.id, clients.primaryTherapistId))
    .where(where)
    .orderBy(...orderBy, asc(clients.id))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  return {
    rows: rows.map((r) => ({ ...r, updatedAt: r.updatedAt.toISOString() })),
    total,
    page: query.page,
    pageSize: query.pageSize,
  };
}

export async function getClient(db: Pick<Database, "select">, clinicId: string, clientId: string): Promise<Client | null> {
  const [row] = await db
    .select()
    .from(clients)
    .where(and(eq(clients.id, clientId), eq(clients.clinicId, clinicId)));
  return row ?? null;
}

export async function getClientByUserId(db: Database, userId: string): Promise<Client | null> {
  const [row] = await db.select().from(clients).where(eq(clients.userId, userId));
  return row ?? null;
}

export async function createClientRecord(db: DbOrTx, clinicId: string, input: ClientInput): Promise<Client> {
  const [row] = await db
    .insert(clients)
    .values({ ...input, clinicId })
    .returning();
  return row;
}

export async function updateClientRecord(db: DbOrTx, clinicId: string, clientId: string, patch: ClientPatch): Promise<Client | null> {
  const [row] = await db
    .update(clients)
    .set({ ...patch, updatedAt: new Date() })
    .where(and(eq(clients.id, clientId), eq(clients.clinicId, clinicId)))
    .returning();
  return row ?? null;
}

/** Is this user a therapist or assistant of the clinic (for primary-therapist assignments)? */
export async function isClinicianOf(db: Pick<Database, "select">, clinicId: string, userId: string): Promise<boolean> {
  const [row] = await db
    .select({ role: users.role })
    .from(users)
    .where(and(eq(users.id, userId), eq(users.clinicId, clinicId), eq(users.active, true)));
  return row?.role === "therapist";
}

