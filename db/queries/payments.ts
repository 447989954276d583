import { and, desc, eq, inArray } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { clients, payments, visitPrices, visits, type Payment, type VisitPrice } from "@/db/schema";

export async function listVisitPrices(db: DbOrTx, clinicId: string): Promise<VisitPrice[]> {
  return db.select().from(visitPrices).where(eq(visitPrices.clinicId, clinicId));
}

export async function getVisitPrice(db: DbOrTx, clinicId: string, visitKind: VisitPrice["visitKind"]): Promise<VisitPrice | null> {
  const [row] = await db
    .select()
    .from(visitPrices)
    .where(and(eq(visitPrices.clinicId, clinicId), eq(visitPrices.visitKind, visitKind)));
  return row ?? null;
}

export async function upsertVisitPrice(
  db: DbOrTx,
  row: { clinicId: string; visitKind: VisitPrice["visitKind"]; amountMinor: number; currency: string; label: string; updatedByUserId: string },
): Promise<VisitPrice> {
  const [saved] = await db
    .insert(visitPrices)
    .values(row)
    .onConflictDoUpdate({
      target: [visitPrices.clinicId, visitPrices.visitKind],
      set: { amountMinor: row.amountMinor, currency: row.currency, label: row.label, updatedByUserId: row.updatedByUserId, updatedAt: new Date() },
    })
    .returning();
  return saved;
}

export async function getPayment(db: DbOrTx, clinicId: string, paymentId: string): Promise<Payment | null> {
  const [row] = await db
    .select()
    .from(payments)
    .where(and(eq(payments.id, paymentId), eq(payments.clinicId, clinicId)));
  return row ?? null;
}

export async function getPaymentBySession(db: DbOrTx, checkoutSessionId: string): Promise<Payment | null> {
  const [row] = await db.select().from(payments).where(eq(payments.checkoutSessionId, checkoutSessionId));
  return row ?? null;
}

export async function getPaymentByIntent(db: DbOrTx, paymentIntentId: string): Promise<Payment | null> {
  const [row] = await db.select().from(payments).where(eq(payments.paymentIntentId, paymentIntentId));
  return row ?? null;
}

export async function listVisitPayments(db: DbOrTx, visitId: string): Promise<Payment[]> {
  return db.select().from(payments).where(eq(payments.visitId, visitId)).orderBy(desc(payments.createdAt));
}

export async function createPayment(db: DbOrTx, row: typeof payments.$inferInsert): Promise<Payment> {
  const [created] = await db.insert(payments).values(row).returning();
  return created;
}

export async function updatePayment(db: DbOrTx, paymentId: string, patch: Partial<typeof payments.$inferInsert>): Promise<void> {
  await db
    .update(payments)
    .set({ ...patch, updatedAt: new Date() })
    .where(eq(payments.id, paymentId));
}

/** Visits of self-pay clients (one client's, or the clinic's) with every payment made for them, newest visit first. */
export async function listSelfPayVisits(db: DbOrTx, clinicId: string, clientId?: string) {
  const where = [eq(visits.clinicId, clinicId), eq(clients.selfPay, true)];
  if (clientId) where.push(eq(visits.clientId, clientId));
  const rows = await db
    .select({ visit: visits, clientGiven: clients.givenName, clientFamily: clients.familyName })
    .from(visits)
    .innerJoin(clients, eq(clients.id, visits.clientId))
    .where(and(...where))
    .orderBy(desc(visits.startsAt))
    .limit(200);
  const ids = rows.map((r) => r.visit.id);
  const paid = ids.length ? await db.select().from(payments).where(inArray(payments.visitId, ids)).orderBy(desc(payments.createdAt)) : [];
  return rows.map((r) => ({ ...r, payments: paid.filter((p) => p.visitId === r.visit.id) }));
}
