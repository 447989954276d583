import { eq } from "drizzle-orm";
import type { Database } from "@/db";
import { staffActivity, users, type Role } from "@/db/schema";
import { auditActorEvent } from "@/lib/audit";

/** Activity is written at most this often per person, so a busy page does not write on every request. */
export const ACTIVITY_WRITE_EVERY_MS = 60_000;

/**
 * Server side of sign-out after inactivity for staff (STAFF_IDLE_MINUTES): a session whose last request, or sign-in,
 * is older than the limit no longer counts, whatever the cookie says. Signing in again starts afresh
 * (users.lastSignInAt). Clients are not timed out: they use Kinarc from home on their own device. [common practice]
 */
export interface StaffActivityTimes {
  lastSignInAt: Date | null;
  lastActiveAt: Date | null;
}

/** `known`: the two times when the caller has just read them with the user (saves a query on every request). */
export async function staffSessionActive(
  db: Database,
  user: { userId: string; role: Role; clinicId: string },
  idleMinutes: number,
  now = new Date(),
  known?: StaffActivityTimes,
): Promise<boolean> {
  if (user.role === "client") return true;
  const [row] = known
    ? [known]
    : await db
        .select({ lastSignInAt: users.lastSignInAt, lastActiveAt: staffActivity.lastActiveAt })
        .from(users)
        .leftJoin(staffActivity, eq(staffActivity.userId, users.id))
        .where(eq(users.id, user.userId));
  if (!row) return false;
  const signIn = row.lastSignInAt?.getTime() ?? 0;
  const active = row.lastActiveAt?.getTime() ?? 0;
  const last = Math.max(signIn, active);
  if (last > 0 && now.getTime() - last > idleMinutes * 60_000) {
    if (active >= signIn) {
      // First request after the limit: note it once, and mark the activity as spent so only a new sign-in revives it.
      await db.update(staffActivity).set({ lastActiveAt: new Date(0) }).where(eq(staffActivity.userId, user.userId));
      await auditActorEvent(db, user, { action: "auth.idle_sign_out", detail: { idleMinutes } });
    }
    return false;
  }
  if (now.getTime() - active > ACTIVITY_WRITE_EVERY_MS) {
    await db
      .insert(staffActivity)
      .values({ userId: user.userId, lastActiveAt: now })
      .onConflictDoUpdate({ target: staffActivity.userId, set: { lastActiveAt: now } });
  }
  return true;
}
