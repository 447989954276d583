import { eq } from "drizzle-orm";
import type { Database, DbOrTx } from "@/db";
import { clinics, type Clinic } from "@/db/schema";

export async function getClinic(db: Database, clinicId: string): Promise<Clinic | null> {
  const [row] = await db.select().from(clinics).where(eq(clinics.id, clinicId));
  return row ?? null;
}

export async function updateClinic(
  db: DbOrTx,
  clinicId: string,
  patch: Partial<Pick<Clinic, "name" | "timezone" | "normTable" | "gradeScale" | "fullRangePercent" | "contactEmail">>,
) {
  await db
    .update(clinics)
    .set({ ...patch, updatedAt: new Date() })
    .where(eq(clinics.id, clinicId));
}
