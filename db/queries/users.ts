import { and, asc, eq } from "drizzle-orm";
import type { Database, DbOrTx } from "@/db";
import { users, type Role, type User } from "@/db/schema";

export type StaffRow = Pick<User, "id" | "name" | "email" | "role" | "active" | "lastSignInAt" | "createdAt"> & {
  hasPassword: boolean;
};

export async function listStaff(db: Database, clinicId: string): Promise<StaffRow[]> {
  const rows = await db
    .select()
    .from(users)
    .where(eq(users.clinicId, clinicId))
    .orderBy(asc(users.name));
  return rows
    .filter((u) => u.role !== "client")
    .map((u) => ({
      id: u.id,
      name: u.name,
      email: u.email,
      role: u.role,
      active: u.active,
      lastSignInAt: u.lastSignInAt,
      createdAt: u.createdAt,
      hasPassword: Boolean(u.passwordHash),
    }));
}

export async function listTherapists(db: Database, clinicId: string) {
  return db
    .select({ id: users.id, name: users.name })
    .from(users)
    .where(and(eq(users.clinicId, clinicId), eq(users.role, "therapist"), eq(users.active, true)))
    .orderBy(asc(users.name));
}

export async function getUserByEmail(db: Database, email: string): Promise<User | null> {
  const [row] = await db.select().from(users).where(eq(users.email, email.toLowerCase()));
  return row ?? null;
}

export async function getStaffMember(db: Database, clinicId: string, userId: string): Promise<User | null> {
  const [row] = await db
    .select()
    .from(users)
    .where(and(eq(users.id, userId), eq(users.clinicId, clinicId)));
  return row && row.role !== "client" ? row : null;
}

export async function updateStaffMember(
  db: DbOrTx,
  clinicId: string,
  userId: string,
  patch: Partial<{ role: Exclude<Role, "client">; active: boolean; name: string }>,
) {
  await db
    .update(users)
    .set({ ...patch, updatedAt: new Date() })
    .where(and(eq(users.id, userId), eq(users.clinicId, clinicId)));
}
