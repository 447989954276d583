// Writes to the chart: grades (remote from the engine, in person from the therapist), co-signature, corrections,
// passive ranges and grip/pinch readings. Each write and its audit event commit in one transaction.
import { and, eq } from "drizzle-orm";
import type { Database, Tx } from "@/db";
import { recentAttempts } from "@/db/queries/attempts";
import { cosignGradeEntry, createGradeEntry, getGradeEntry, listGradeEntries } from "@/db/queries/grades";
import { createPassiveRange, listPassiveRanges } from "@/db/queries/passive-ranges";
import { clinics, strengthReadings, visits, type Client, type GradeEntry } from "@/db/schema";
import type { Actor } from "@/lib/auth/guard";
import { auditActorEvent } from "@/lib/audit";
import { chooseReference, DEFAULT_GRADE_SCALE, GRADE_SCALES, type GradeScale } from "@/lib/grading/grade";
import { RANGE_TABLE_IDS, type RangeTableId } from "@/lib/motions/catalog";
import { KG_PER_LB } from "@/lib/norms/grip-pinch";
import { BadRequest } from "@/lib/http";
import { AccessError } from "@/lib/auth/guard";
import { currentEntries, IN_PERSON_GRADES, proposeGrade, resistancePrecaution, rowKey } from "./model";
import type { GradeInput, InPersonGradeInput, InPersonResultInput, PassiveRangeInput, StrengthInput } from "./schemas";

interface Ctx {
  actor: Actor;
  client: Client;
  today: string;
  now?: Date;
  address?: string | null;
}

function audit(tx: Tx, ctx: Ctx, action: string, subjectType: string, subjectId: string, detail?: Record<string, unknown>) {
  return auditActorEvent(tx, ctx.actor, {
    action,
    subjectType,
    subjectId,
    clientId: ctx.client.id,
    address: ctx.address ?? null,
    detail,
  });
}

async function clinicSettings(tx: Tx, clinicId: string) {
  const [clinic] = await tx.select().from(clinics).where(eq(clinics.id, clinicId));
  const scale: GradeScale = (GRADE_SCALES as readonly string[]).includes(clinic.gradeScale) ? (clinic.gradeScale as GradeScale) : DEFAULT_GRADE_SCALE;
  const table: RangeTableId = (RANGE_TABLE_IDS as readonly string[]).includes(clinic.normTable) ? (clinic.normTable as RangeTableId) : "aaos1965";
  return { scale, table, fullRangeFraction: clinic.fullRangePercent / 100 };
}

/** Therapists sign as they record; an assistant's entry waits for a therapist's co-signature. */
function signing(ctx: Ctx, at: Date) {
  return ctx.actor.role === "therapist"
    ? { status: "signed" as const, signedByUserId: ctx.actor.userId, signedAt: at }
    : { status: "awaiting_cosign" as const, signedByUserId: null, signedAt: null };
}

async function checkReplaces(tx: Tx, ctx: Ctx, input: { replacesId: string | null; motion: string; side: string; digit: string | null }) {
  if (!input.replacesId) return;
  const target = await getGradeEntry(tx, ctx.actor.clinicId, ctx.client.id, input.replacesId);
  if (!target) throw new BadRequest("The grade to correct was not found.", { replacesId: "expected a grade entry of this client" });
  if (rowKey(target) !== rowKey(input)) throw new BadRequest("A correction must be for the same motion, side and digit.", { replacesId: "expected an entry of the same motion, side and digit" });
  const all = await listGradeEntries(tx, ctx.actor.clinicId, ctx.client.id);
  if (!currentEntries(all).some((e) => e.id === target.id)) {
    throw new BadRequest("That grade has already been corrected; correct the newest entry.", { replacesId: "expected the current entry, not one already corrected" });
  }
}

async function checkVisit(tx: Tx, ctx: Ctx, visitId: string | null) {
  if (!visitId) return null;
  const [visit] = await tx
    .select()
    .from(visits)
    .where(and(eq(visits.id, visitId), eq(visits.clinicId, ctx.actor.clinicId), eq(visits.clientId, ctx.client.id)));
  if (!visit) throw new BadRequest("The visit was not found.", { visitId: "expected a visit of this client" });
  return visit;
}

async function insertInPersonGrade(tx: Tx, ctx: Ctx, input: Omit<InPersonGradeInput, "visitId">, visitId: string | null, at: Date, scale: GradeScale) {
  const allowed = input.method === "in_person_resisted" ? IN_PERSON_GRADES[scale].resisted : IN_PERSON_GRADES[scale].palpation;
  if (!allowed.includes(input.value)) {
    const how = input.method === "in_person_resisted" ? "a resisted test" : "palpation";
    throw new BadRequest(`Grade ${input.value} cannot come from ${how}.`, { value: `expected one of ${allowed.join(", ")} for ${how} (${scale} scale)` });
  }
  if (input.method === "in_person_resisted") {
    const precaution = resistancePrecaution(ctx.client, ctx.today);
    if (precaution.active) throw new BadRequest(precaution.detail, { method: "resisted testing is not allowed under the precaution on file" });
  }
  await checkReplaces(tx, ctx, input);
  const entry = await createGradeEntry(tx, {
    clinicId: ctx.actor.clinicId,
    clientId: ctx.client.id,
    motion: input.motion,
    side: input.side,
    digit: input.digit,
    scale,
    value: input.value,
    method: input.method,
    basis: { how: input.method === "in_person_resisted" ? "manual resistance in person" : "palpation in person" },
    inPersonReasons: [],
    visitId,
    note: input.note,
    recordedByUserId: ctx.actor.userId,
    recordedByRole: ctx.actor.role,
    recordedAt: at,
    ...signing(ctx, at),
    replacesId: input.replacesId,
  });
  await audit(tx, ctx, input.replacesId ? "grade.correct" : "grade.record", "grade_entry", entry.id, { method: entry.method, value: entry.value, replacesId: input.replacesId });
  return entry;
}

async function insertRemoteGrade(tx: Tx, ctx: Ctx, input: Extract<GradeInput, { method: "remote_range" }>, at: Date) {
  const settings = await clinicSettings(tx, ctx.actor.clinicId);
  const rows = (await recentAttempts(tx, ctx.actor.clinicId, ctx.client.id)).filter((a) => rowKey(a) === rowKey(input));
  if (rows.length === 0) throw new BadRequest("There are no attempts to grade for this motion.", { motion: "expected a motion with recorded attempts" });
  const passive = (await listPassiveRanges(tx, ctx.actor.clinicId, ctx.client.id)).filter((p) => rowKey(p) === rowKey(input)).at(-1);
  const reference = chooseReference(input.motion, input.digit, { passiveRangeDeg: passive?.valueDeg, table: settings.table });
  if (!reference) throw new BadRequest("No reference range for this motion.", { motion: "expected a motion with a reference range" });
  await checkReplaces(tx, ctx, input);
  const result = proposeGrade(input, rows, reference, settings);
  const entry = await createGradeEntry(tx, {
    clinicId: ctx.actor.clinicId,
    clientId: ctx.client.id,
    motion: input.motion,
    side: input.side,
    digit: input.digit,
    scale: settings.scale,
    value: result.value,
    method: "remote_range",
    basis: {
      attemptIds: rows.map((a) => a.id),
      reference,
      fullRangeFraction: settings.fullRangeFraction,
      reasons: result.reasons,
      inPerson: result.inPerson,
      againstGravityBestDeg: result.againstGravityBestDeg,
      gravityMinimizedBestDeg: result.gravityMinimizedBestDeg,
    },
    inPersonReasons: result.inPerson.map((n) => n.reason),
    note: input.note,
    recordedByUserId: ctx.actor.userId,
    recordedByRole: ctx.actor.role,
    recordedAt: at,
    ...signing(ctx, at),
    replacesId: input.replacesId,
  });
  await audit(tx, ctx, input.replacesId ? "grade.correct" : "grade.record", "grade_entry", entry.id, { method: "remote_range", value: entry.value });
  return entry;
}

/** An in-person visit whose every planned test now has an in-person grade is finished. */
async function finishVisitIfComplete(tx: Tx, ctx: Ctx, visitId: string, at: Date) {
  const visit = await checkVisit(tx, ctx, visitId);
  if (!visit || visit.kind !== "in_person" || visit.status === "finished" || visit.status === "cancelled") return;
  const graded = new Set(
    (await listGradeEntries(tx, ctx.actor.clinicId, ctx.client.id)).filter((e) => e.visitId === visitId && e.method !== "remote_range").map(rowKey),
  );
  if ((visit.plannedTests ?? []).every((t) => graded.has(rowKey(t)))) {
    await tx.update(visits).set({ status: "finished", endedAt: at, updatedAt: at }).where(eq(visits.id, visitId));
  }
}

export async function recordGrade(db: Database, ctx: Ctx, input: GradeInput): Promise<GradeEntry> {
  const at = ctx.now ?? new Date();
  return db.transaction(async (tx) => {
    if (input.method === "remote_range") return insertRemoteGrade(tx, ctx, input, at);
    await checkVisit(tx, ctx, input.visitId);
    const { scale } = await clinicSettings(tx, ctx.actor.clinicId);
    const entry = await insertInPersonGrade(tx, ctx, input, input.visitId, at, scale);
    if (input.visitId) await finishVisitIfComplete(tx, ctx, input.visitId, at);
    return entry;
  });
}

export async function cosignGrade(db: Database, ctx: Ctx, gradeId: string): Promise<GradeEntry> {
  if (ctx.actor.role !== "therapist") throw new AccessError(403, "Only a therapist can co-sign a grade.");
  const at = ctx.now ?? new Date();
  return db.transaction(async (tx) => {
    const existing = await getGradeEntry(tx, ctx.actor.clinicId, ctx.client.id, gradeId);
    if (!existing) throw new AccessError(404, "No such grade entry.");
    const signed = await cosignGradeEntry(tx, { clinicId: ctx.actor.clinicId, clientId: ctx.client.id, gradeId }, { userId: ctx.actor.userId, at });
    if (!signed) throw new BadRequest("This grade is already signed; record a correction instead.", { gradeId: "expected an entry awaiting co-signature" });
    await audit(tx, ctx, "grade.cosign", "grade_entry", gradeId);
    return signed;
  });
}

export async function recordPassiveRange(db: Database, ctx: Ctx, input: PassiveRangeInput) {
  const at = ctx.now ?? new Date();
  return db.transaction(async (tx) => {
    const measuredAt = input.measuredOn ? new Date(`${input.measuredOn}T12:00:00Z`) : at;
    const row = await createPassiveRange(tx, {
      clinicId: ctx.actor.clinicId,
      clientId: ctx.client.id,
      motion: input.motion,
      side: input.side,
      digit: input.digit,
      valueDeg: input.valueDeg,
      measuredAt,
      measuredByUserId: ctx.actor.userId,
      note: input.note,
    });
    await audit(tx, ctx, "passive_range.record", "passive_range", row.id, { motion: input.motion, side: input.side, digit: input.digit, valueDeg: input.valueDeg });
    return row;
  });
}

export function trialsInKg(input: Pick<StrengthInput, "trials" | "unit">): number[] {
  return input.trials.map((t) => (input.unit === "lb" ? t * KG_PER_LB : t));
}

/** Grades and grip/pinch readings of one in-person session, all in one transaction. */
export async function recordInPersonResult(db: Database, ctx: Ctx, input: InPersonResultInput) {
  const at = ctx.now ?? new Date();
  return db.transaction(async (tx) => {
    await checkVisit(tx, ctx, input.visitId);
    const { scale } = await clinicSettings(tx, ctx.actor.clinicId);
    const grades: GradeEntry[] = [];
    for (const [i, g] of input.grades.entries()) {
      try {
        grades.push(await insertInPersonGrade(tx, ctx, g, input.visitId, at, scale));
      } catch (error) {
        // Name the item, so a form with many rows shows which one is wrong.
        if (error instanceof BadRequest) throw new BadRequest(error.message, Object.fromEntries(Object.entries(error.fields).map(([k, v]) => [`grades.${i}.${k}`, v])));
        throw error;
      }
    }
    const readings = [];
    for (const s of input.strength) {
      const trialsKg = trialsInKg(s);
      const [row] = await tx
        .insert(strengthReadings)
        .values({
          clinicId: ctx.actor.clinicId,
          clientId: ctx.client.id,
          test: s.test,
          side: s.side,
          trialsKg,
          meanKg: trialsKg.reduce((a, b) => a + b, 0) / trialsKg.length,
          handlePosition: s.handlePosition,
          visitId: input.visitId,
          note: s.note,
          recordedByUserId: ctx.actor.userId,
          recordedAt: at,
        })
        .returning();
      await audit(tx, ctx, "strength.record", "strength_reading", row.id, { test: s.test, side: s.side });
      readings.push(row);
    }
    if (input.visitId) await finishVisitIfComplete(tx, ctx, input.visitId, at);
    return { grades, readings };
  });
}
