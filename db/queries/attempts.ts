import { and, asc, count, desc, eq, isNull, sql, type SQL } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { attempts, type Attempt, type NewAttempt } from "@/db/schema";

export async function createAttempt(db: DbOrTx, row: NewAttempt): Promise<Attempt> {
  const [created] = await db.insert(attempts).values(row).returning();
  return created;
}

/** Per motion, side and digit: how many attempts, and the best verified peak and arc. */
export interface AttemptAggregate {
  motion: string;
  side: "left" | "right";
  digit: string | null;
  attempts: number;
  bestPeakDeg: number | null;
  bestArcDeg: number | null;
  latestAt: number;
}

export async function aggregateAttempts(db: DbOrTx, clinicId: string, clientId: string): Promise<AttemptAggregate[]> {
  // The best values count only attempts whose test plane was verified, the same rule grading uses.
  const rows = await db
    .select({
      motion: attempts.motion,
      side: attempts.side,
      digit: attempts.digit,
      attempts: count(),
      bestPeakDeg: sql<number | null>`max(case when ${attempts.planeVerified} then ${attempts.peakDeg} end)`,
      bestArcDeg: sql<number | null>`max(case when ${attempts.planeVerified} then ${attempts.arcDeg} end)`,
      latestAt: sql<number>`max(${attempts.recordedAt})`,
    })
    .from(attempts)
    .where(and(eq(attempts.clinicId, clinicId), eq(attempts.clientId, clientId)))
    .groupBy(attempts.motion, attempts.side, attempts.digit);
  return rows.map((r) => ({ ...r, latestAt: Number(r.latestAt) }));
}

export type RecentAttempt = Pick<
  Attempt,
  "id" | "motion" | "side" | "digit" | "condition" | "recordedAt" | "peakDeg" | "arcDeg" | "uncertaintyDeg" | "planeVerdict" | "planeVerified" | "frames" | "usableFrames" | "keptAt" | "warnings"
>;

/**
 * The attempts a grade proposal rests on, per motion, side and digit: every kept attempt, or when none is kept the
 * latest `perRow`. One query with a window, so a client with thousands of attempts costs one index scan.
 */
export async function recentAttempts(db: DbOrTx, clinicId: string, clientId: string, perRow = 10): Promise<RecentAttempt[]> {
  // The window runs over the narrow columns only; the wide rows are fetched for the few ids that qualify.
  const rows = await db.all<Record<string, unknown>>(sql`
    with ranked as (
      select id, kept_at,
             row_number() over (partition by motion, side, digit order by recorded_at desc) as rn,
             max(kept_at is not null) over (partition by motion, side, digit) as any_kept
      from attempts
      -- Home practice informs the therapist and never becomes a grade (issue 7). An uploaded clip was recorded with
      -- nobody watching: it counts only once a therapist has reviewed it and kept it.
      where clinic_id = ${clinicId} and client_id = ${clientId} and source <> 'practice'
        and (source <> 'upload' or kept_at is not null)
    )
    select a.id, a.motion, a.side, a.digit, a.condition, a.recorded_at, a.peak_deg, a.arc_deg, a.uncertainty_deg,
           a.plane_verdict, a.plane_verified, a.frames, a.usable_frames, a.kept_at, a.warnings
    from ranked r join attempts a on a.id = r.id
    where (r.any_kept = 1 and r.kept_at is not null) or (r.any_kept = 0 and r.rn <= ${perRow})
    order by a.recorded_at asc`);
  return rows.map((r) => ({
    id: String(r.id),
    motion: String(r.motion),
    side: r.side as Attempt["side"],
    digit: (r.digit as Attempt["digit"]) ?? null,
    condition: r.condition as Attempt["condition"],
    recordedAt: new Date(Number(r.recorded_at)),
    peakDeg: r.peak_deg == null ? null : Number(r.peak_deg),
    arcDeg: r.arc_deg == null ? null : Number(r.arc_deg),
    uncertaintyDeg: r.uncertainty_deg == null ? null : Number(r.uncertainty_deg),
    planeVerdict: String(r.plane_verdict),
    planeVerified: Boolean(Number(r.plane_verified)),
    frames: Number(r.frames),
    usableFrames: Number(r.usable_frames),
    keptAt: r.kept_at == null ? null : new Date(Number(r.kept_at)),
    warnings: JSON.parse(String(r.warnings ?? "[]")) as string[],
  }));
}

export interface AttemptListQuery {
  motion?: string;
  side?: "left" | "right";
  digit?: string | null;
  planeVerified?: boolean;
  sort: "recordedAt" | "peakDeg" | "arcDeg";
  dir: "asc" | "desc";
  page: number;
  pageSize: number;
}

export interface AttemptListPage {
  rows: (RecentAttempt & Pick<Attempt, "source" | "cameraView" | "viewQuality" | "forearmSource" | "oneFinger">)[];
  total: number;
  page: number;
  pageSize: number;
}

export async function listAttempts(db: DbOrTx, clinicId: string, clientId: string, q: AttemptListQuery): Promise<AttemptListPage> {
  const filters: SQL[] = [eq(attempts.clinicId, clinicId), eq(attempts.clientId, clientId)];
  if (q.motion) filters.push(eq(attempts.motion, q.motion));
  if (q.side) filters.push(eq(attempts.side, q.side));
  if (q.digit !== undefined) filters.push(q.digit === null ? isNull(attempts.digit) : eq(attempts.digit, q.digit as NonNullable<Attempt["digit"]>));
  if (q.planeVerified !== undefined) filters.push(eq(attempts.planeVerified, q.planeVerified));
  const where = and(...filters);
  const order = q.dir === "asc" ? asc : desc;
  const [{ total }] = await db.select({ total: count() }).from(attempts).where(where);
  const rows = await db
    .select({
      id: attempts.id,
      motion: attempts.motion,
      side: attempts.side,
      digit: attempts.digit,
      condition: attempts.condition,
      recordedAt: attempts.recordedAt,
      peakDeg: attempts.peakDeg,
      arcDeg: attempts.arcDeg,
      uncertaintyDeg: attempts.uncertaintyDeg,
      planeVerdict: attempts.planeVerdict,
      planeVerified: attempts.planeVerified,
      frames: attempts.frames,
      usableFrames: attempts.usableFrames,
      keptAt: attempts.keptAt,
      warnings: attempts.warnings,
      source: attempts.source,
      cameraView: attempts.cameraView,
      viewQuality: attempts.viewQuality,
      forearmSource: attempts.forearmSource,
      oneFinger: attempts.oneFinger,
    })
    .from(attempts)
    .where(where)
    .orderBy(order(attempts[q.sort]), order(attempts.id))
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize);
  return { rows, total, page: q.page, pageSize: q.pageSize };
}

/** Peak and arc over time for one motion row, for the history chart (at most `limit`, the latest). */
export async function attemptSeries(
  db: DbOrTx,
  ids: { clinicId: string; clientId: string },
  row: { motion: string; side: "left" | "right"; digit: string | null },
  limit = 500,
) {
  const rows = await db
    .select({
      id: attempts.id,
      recordedAt: attempts.recordedAt,
      peakDeg: attempts.peakDeg,
      arcDeg: attempts.arcDeg,
      uncertaintyDeg: attempts.uncertaintyDeg,
      condition: attempts.condition,
      planeVerified: attempts.planeVerified,
    })
    .from(attempts)
    .where(
      and(
        eq(attempts.clinicId, ids.clinicId),
        eq(attempts.clientId, ids.clientId),
        eq(attempts.motion, row.motion),
        eq(attempts.side, row.side),
        row.digit === null ? isNull(attempts.digit) : eq(attempts.digit, row.digit as NonNullable<Attempt["digit"]>),
      ),
    )
    .orderBy(desc(attempts.recordedAt))
    .limit(limit);
  return rows.reverse();
}

/**
 * A stamp that changes whenever anything the chart shows for a client changes (attempts added or kept, grades
 * recorded, co-signed or corrected, passive ranges, grip/pinch readings, visits, the record or the clinic's settings).
 */
export async function chartStamp(db: DbOrTx, clinicId: string, clientId: string): Promise<string> {
  const [row] = await db.all<Record<string, unknown>>(sql`
    select
      (select count(*) || ':' || count(kept_at) || ':' || coalesce(max(created_at), 0) from attempts where client_id = ${clientId}) as a,
      (select count(*) || ':' || coalesce(max(recorded_at), 0) || ':' || count(signed_at) from grade_entries where client_id = ${clientId}) as g,
      (select count(*) || ':' || coalesce(max(created_at), 0) from passive_ranges where client_id = ${clientId}) as p,
      (select count(*) || ':' || coalesce(max(created_at), 0) from strength_readings where client_id = ${clientId}) as s,
      (select count(*) || ':' || coalesce(max(updated_at), 0) from visits where client_id = ${clientId}) as v,
      (select updated_at from clients where id = ${clientId}) as c,
      (select updated_at from clinics where id = ${clinicId}) as k`);
  return [row.a, row.g, row.p, row.s, row.v, row.c, row.k].join("|");
}
