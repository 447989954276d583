import { and, eq, inArray } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import { aggregateAttempts, chartStamp, recentAttempts, type RecentAttempt } from "@/db/queries/attempts";
import { listUpcomingInPerson } from "@/db/queries/follow-ups";
import { listGradeEntries } from "@/db/queries/grades";
import { listPassiveRanges } from "@/db/queries/passive-ranges";
import { clinics, strengthReadings, users, type Client, type GradeEntry, type StrengthReading } from "@/db/schema";
import { chooseReference, DEFAULT_GRADE_SCALE, GRADE_SCALES, type GradeScale } from "@/lib/grading/grade";
import { RANGE_TABLE_IDS, type RangeTableId } from "@/lib/motions/catalog";
import { ageInYears, compareWithNorm, type NormComparison } from "@/lib/norms/grip-pinch";
import { allRows, currentEntries, openNeeds, proposeGrade, resistancePrecaution, rowKey, rowLabel, type OpenNeed, type ResistancePrecaution, type RowKey } from "./model";

export interface ChartGrade {
  id: string;
  value: string | null;
  scale: string;
  method: GradeEntry["method"];
  status: GradeEntry["status"];
  recordedAt: string;
  recordedByName: string | null;
  recordedByRole: string;
  signedByName: string | null;
  signedAt: string | null;
  replacesId: string | null;
  /** Set when a later entry corrects this one. */
  replacedById: string | null;
  note: string;
  visitId: string | null;
}

export interface ChartRow extends RowKey {
  key: string;
  label: string;
  reference: { endRangeDeg: number; source: string } | null;
  passiveRangeDeg: number | null;
  attempts: number;
  latestPeakDeg: number | null;
  latestArcDeg: number | null;
  latestUncertaintyDeg: number | null;
  latestAt: string | null;
  bestPeakDeg: number | null;
  /** Best verified peak of the same motion on the other side, for the side-to-side comparison. */
  otherSideBestPeakDeg: number | null;
  /** The current grades (one per method at most is shown first); older and corrected ones are in `history`. */
  grade: ChartGrade | null;
  history: ChartGrade[];
  proposal: { value: string | null; reasons: string[]; ceiling: boolean } | null;
  needs: OpenNeed[];
}

export interface StrengthRow {
  id: string;
  test: StrengthReading["test"];
  side: StrengthReading["side"];
  meanKg: number;
  trialsKg: number[];
  recordedAt: string;
  comparison: NormComparison | null;
}

export interface ChartData {
  clientId: string;
  today: string;
  scale: GradeScale;
  rangeTable: RangeTableId;
  precaution: ResistancePrecaution;
  rows: ChartRow[];
  strength: StrengthRow[];
  awaitingCosign: number;
  /** Open in-person visits (from 12 hours ago on), so a result can be filed under the visit it came from. */
  visits: { id: string; startsAt: string; location: string | null; plannedKeys: string[] }[];
}

export interface ChartOptions {
  today: string;
  /** Include rows with no data at all (the full grid); the queue and reports only need rows with data. */
  emptyRows?: boolean;
}

function gradeJson(e: GradeEntry, names: Map<string, string>, replacedBy: Map<string, string>): ChartGrade {
  return {
    id: e.id,
    value: e.value,
    scale: e.scale,
    method: e.method,
    status: e.status,
    recordedAt: e.recordedAt.toISOString(),
    recordedByName: e.recordedByUserId ? (names.get(e.recordedByUserId) ?? null) : null,
    recordedByRole: e.recordedByRole,
    signedByName: e.signedByUserId ? (names.get(e.signedByUserId) ?? null) : null,
    signedAt: e.signedAt ? e.signedAt.toISOString() : null,
    replacesId: e.replacesId,
    replacedById: replacedBy.get(e.id) ?? null,
    note: e.note,
    visitId: e.visitId,
  };
}

/** The whole chart of one client, for staff. The caller has already checked access to the record. */
export async function buildChart(db: DbOrTx, client: Client, opts: ChartOptions): Promise<ChartData> {
  const [[clinic], aggregates, recent, entries, passive, strength, upcoming] = await Promise.all([
    db.select().from(clinics).where(eq(clinics.id, client.clinicId)),
    aggregateAttempts(db, client.clinicId, client.id),
    recentAttempts(db, client.clinicId, client.id),
    listGradeEntries(db, client.clinicId, client.id),
    listPassiveRanges(db, client.clinicId, client.id),
    db.select().from(strengthReadings).where(and(eq(strengthReadings.clinicId, client.clinicId), eq(strengthReadings.clientId, client.id))),
    listUpcomingInPerson(db, { clinicId: client.clinicId, clientId: client.id, from: new Date(Date.now() - 12 * 3600_000) }),
  ]);
  const scale: GradeScale = (GRADE_SCALES as readonly string[]).includes(clinic.gradeScale) ? (clinic.gradeScale as GradeScale) : DEFAULT_GRADE_SCALE;
  const rangeTable: RangeTableId = (RANGE_TABLE_IDS as readonly string[]).includes(clinic.normTable) ? (clinic.normTable as RangeTableId) : "aaos1965";
  const precaution = resistancePrecaution(client, opts.today);

  const userIds = [...new Set(entries.flatMap((e) => [e.recordedByUserId, e.signedByUserId]).filter((v): v is string => Boolean(v)))];
  const names = new Map(
    userIds.length ? (await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, userIds))).map((u) => [u.id, u.name ?? ""]) : [],
  );
  const replacedBy = new Map(entries.filter((e) => e.replacesId).map((e) => [e.replacesId!, e.id]));

  const byKey = <T extends { motion: string; side: string; digit: string | null }>(list: readonly T[]) => {
    const map = new Map<string, T[]>();
    for (const item of list) {
      const k = rowKey(item);
      const bucket = map.get(k);
      if (bucket) bucket.push(item);
      else map.set(k, [item]);
    }
    return map;
  };
  const aggMap = new Map(aggregates.map((a) => [rowKey(a), a]));
  const recentMap = byKey<RecentAttempt>(recent);
  const entryMap = byKey(entries);
  const passiveMap = byKey(passive);

  const rows: ChartRow[] = [];
  for (const row of allRows()) {
    const key = rowKey(row);
    const agg = aggMap.get(key);
    const rowEntries = entryMap.get(key) ?? [];
    const passiveLatest = passiveMap.get(key)?.at(-1) ?? null;
    if (!opts.emptyRows && !agg && rowEntries.length === 0 && !passiveLatest) continue;
    const reference = chooseReference(row.motion, row.digit, { passiveRangeDeg: passiveLatest?.valueDeg, table: rangeTable });
    const rowAttempts = recentMap.get(key) ?? [];
    const latest = rowAttempts.at(-1) ?? null;
    const other = aggMap.get(rowKey({ ...row, side: row.side === "left" ? "right" : "left" }));

    let proposal: ChartRow["proposal"] = null;
    let proposalNeeds: { inPerson: ReturnType<typeof proposeGrade>["inPerson"]; at: number } | null = null;
    if (reference && rowAttempts.length > 0) {
      const result = proposeGrade(
        row,
        rowAttempts.map((a) => ({ ...a, condition: a.condition })),
        reference,
        { scale, fullRangeFraction: clinic.fullRangePercent / 100 },
      );
      proposal = { value: result.value, reasons: result.reasons, ceiling: result.ceiling };
      proposalNeeds = { inPerson: result.inPerson, at: +latest!.recordedAt };
    }
    const current = currentEntries(rowEntries);
    const shown = current.at(-1) ?? null;
    rows.push({
      ...row,
      key,
      label: rowLabel(row),
      reference,
      passiveRangeDeg: passiveLatest?.valueDeg ?? null,
      attempts: agg?.attempts ?? 0,
      latestPeakDeg: latest?.peakDeg ?? null,
      latestArcDeg: latest?.arcDeg ?? null,
      latestUncertaintyDeg: latest?.uncertaintyDeg ?? null,
      latestAt: latest ? latest.recordedAt.toISOString() : null,
      bestPeakDeg: agg?.bestPeakDeg ?? null,
      otherSideBestPeakDeg: other?.bestPeakDeg ?? null,
      grade: shown ? gradeJson(shown, names, replacedBy) : null,
      history: rowEntries.map((e) => gradeJson(e, names, replacedBy)).reverse(),
      proposal,
      needs: openNeeds({ current, proposal: proposalNeeds, precaution }),
    });
  }

  const age = ageInYears(client.dateOfBirth, opts.today);
  const strengthRows: StrengthRow[] = strength
    .sort((a, b) => +b.recordedAt - +a.recordedAt)
    .map((s) => ({
      id: s.id,
      test: s.test,
      side: s.side,
      meanKg: s.meanKg,
      trialsKg: s.trialsKg,
      recordedAt: s.recordedAt.toISOString(),
      comparison: compareWithNorm(s.meanKg, { test: s.test, side: s.side, sex: client.sex, age, dominantHand: client.dominantHand }),
    }));

  return {
    clientId: client.id,
    today: opts.today,
    scale,
    rangeTable,
    precaution,
    rows,
    strength: strengthRows,
    awaitingCosign: entries.filter((e) => e.status === "awaiting_cosign").length,
    visits: upcoming.map((v) => ({ id: v.id, startsAt: v.startsAt.toISOString(), location: v.location, plannedKeys: (v.plannedTests ?? []).map(rowKey) })),
  };
}

/** What a client may see of their own progress: measurements and signed grades, no staff names, notes or bases. */
export interface ClientProgress {
  clientId: string;
  rows: { key: string; label: string; side: string; bestPeakDeg: number | null; latestPeakDeg: number | null; latestAt: string | null; grade: string | null; gradeDate: string | null }[];
}

export function clientProgress(chart: ChartData): ClientProgress {
  return {
    clientId: chart.clientId,
    rows: chart.rows.map((r) => {
      const signed = [...r.history].find((g) => g.status === "signed" && !g.replacedById) ?? null;
      return {
        key: r.key,
        label: r.label,
        side: r.side,
        bestPeakDeg: r.bestPeakDeg,
        latestPeakDeg: r.latestPeakDeg,
        latestAt: r.latestAt,
        grade: signed?.value ?? null,
        gradeDate: signed?.recordedAt ?? null,
      };
    }),
  };
}

/** Today's date (YYYY-MM-DD) in a time zone: precaution dates are calendar days where the clinic is. */
export function todayInZone(timeZone: string, now = new Date()): string {
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(now);
}

export async function clinicToday(db: DbOrTx, clinicId: string, now = new Date()): Promise<string> {
  const [clinic] = await db.select({ timezone: clinics.timezone }).from(clinics).where(eq(clinics.id, clinicId));
  return todayInZone(clinic?.timezone ?? "UTC", now);
}

// Charts are read far more often than they change: keep the latest per client and day, checked against a stamp of
// everything the chart shows, so a read costs one small query until something is recorded.
const CACHE_LIMIT = 500;
const globalForChart = globalThis as unknown as { kinarcChartCache?: Map<string, { stamp: string; chart: ChartData }> };

export async function cachedChart(db: DbOrTx, client: Client, opts: ChartOptions): Promise<ChartData> {
  const cache = (globalForChart.kinarcChartCache ??= new Map());
  const key = `${client.id}|${opts.today}|${opts.emptyRows ? "all" : "data"}`;
  const stamp = await chartStamp(db, client.clinicId, client.id);
  const hit = cache.get(key);
  if (hit && hit.stamp === stamp) return hit.chart;
  const chart = await buildChart(db, client, opts);
  cache.delete(key);
  cache.set(key, { stamp, chart });
  if (cache.size > CACHE_LIMIT) cache.delete(cache.keys().next().value!);
  return chart;
}
