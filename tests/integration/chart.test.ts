import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { clients, gradeEntries } from "@/db/schema";
import { seedDemo, type SeedResult } from "@/db/seed/demo";
import type { Actor } from "@/lib/auth/guard";
import { buildChart, clientProgress } from "@/lib/chart/chart";
import { buildQueue } from "@/lib/chart/follow-ups";
import { cosignGrade, recordGrade, recordInPersonResult, recordPassiveRange } from "@/lib/chart/record";
import { gradeInputSchema, inPersonResultSchema } from "@/lib/chart/schemas";
import { BadRequest } from "@/lib/http";
import { actorByEmail as actorByEmailIn, tempDatabase, type TempDb } from "./support";

// The demo's attempts come from the measurement engine run on synthetic captures (db/seed/chart.ts); grades from
// lib/grading. Grade ladder: Hislop, Avers & Brown, Daniels and Worthingham's Muscle Testing, 9th ed., 2014.
const TODAY = "2026-12-01";
let t: TempDb;
let seed: SeedResult;
let therapist: Actor;
let assistant: Actor;

const actor = (email: string) => actorByEmailIn(t.db, email);
async function client(key: string) {
  const [c] = await t.db.select().from(clients).where(eq(clients.id, seed.clientIds![key]));
  return c;
}

beforeAll(async () => {
  t = await tempDatabase();
  seed = await seedDemo(t.db, new Date(`${TODAY}T09:00:00Z`));
  therapist = await actor("therapist@kinarc.test");
  assistant = await actor("assistant@kinarc.test");
}, 120_000);
afterAll(() => t?.close());

describe("chart of a seeded client", () => {
  it("shows every motion on both sides, with the flags that need an in-person test and why", async () => {
    const chart = await buildChart(t.db, await client("dorian"), { today: TODAY, emptyRows: true });
    // 34 motion-digit rows in the catalog on each of two sides.
    expect(chart.rows.length).toBe(68);
    const leftExt = chart.rows.find((r) => r.key === "wrist.extension|left|-")!;
    // Full range against gravity (≥ 90% of AAOS 70°) is grade 3, the most a range-only check gives (Daniels).
    expect(leftExt.grade?.value).toBe("3");
    // Its peak ± the stated uncertainty (vision/uncertainty-table.json) reaches across the 63° full-range line: uncertain too.
    expect(leftExt.needs.map((n) => n.reason).sort()).toEqual(["precaution", "resistance", "uncertain"]);
    expect(leftExt.needs.find((n) => n.reason === "resistance")?.notBefore).toBe("2026-12-22");
    // The right side's reference is the recorded passive range (60°), not the table.
    const rightExt = chart.rows.find((r) => r.key === "wrist.extension|right|-")!;
    expect(rightExt.reference?.endRangeDeg).toBe(60);
    expect(rightExt.otherSideBestPeakDeg).toBeGreaterThan(60);
    // Gravity-minimized attempts only: the position for a grade above 2 was never verified.
    const flex = chart.rows.find((r) => r.key === "wrist.flexion|right|-")!;
    expect(flex.grade?.status).toBe("awaiting_cosign");
    expect(flex.needs.map((n) => n.reason)).toContain("position");
    expect(chart.awaitingCosign).toBe(1);
  });

  it("gives the client a simplified view with no staff names or notes", async () => {
    const progress = clientProgress(await buildChart(t.db, await client("dorian"), { today: TODAY }));
    const text = JSON.stringify(progress);
    expect(text).not.toMatch(/Tomasz|Juniper|note|basis/i);
    expect(progress.rows.find((r) => r.key === "wrist.extension|left|-")?.grade).toBe("3");
    // The assistant's grade is not shown to the client until it is co-signed.
    expect(progress.rows.find((r) => r.key === "wrist.flexion|right|-")?.grade).toBeNull();
  });
});

describe("sign-off and corrections", () => {
  it("co-signs an assistant's entry once; a signed entry cannot be co-signed again", async () => {
    const c = await client("dorian");
    const [waiting] = await t.db.select().from(gradeEntries).where(eq(gradeEntries.status, "awaiting_cosign"));
    await expect(cosignGrade(t.db, { actor: assistant, client: c, today: TODAY }, waiting.id)).rejects.toThrow(/Only a therapist/);
    const signed = await cosignGrade(t.db, { actor: therapist, client: c, today: TODAY }, waiting.id);
    expect(signed.status).toBe("signed");
    expect(signed.signedByUserId).toBe(therapist.userId);
    await expect(cosignGrade(t.db, { actor: therapist, client: c, today: TODAY }, waiting.id)).rejects.toBeInstanceOf(BadRequest);
  });

  it("corrects a signed grade with a new entry that points to it; both stay", async () => {
    const c = await client("bram");
    const before = await buildChart(t.db, c, { today: TODAY });
    const row = before.rows.find((r) => r.key === "wrist.extension|right|-")!;
    const original = row.grade!;
    // A new passive range (goniometer) of 80° makes 66° less than full (66/80 = 82% < 90%): the engine now says 3-.
    await recordPassiveRange(t.db, { actor: therapist, client: c, today: TODAY }, { motion: "wrist.extension", side: "right", digit: null, valueDeg: 80, note: "" });
    const corrected = await recordGrade(
      t.db,
      { actor: therapist, client: c, today: TODAY },
      gradeInputSchema.parse({ method: "remote_range", motion: "wrist.extension", side: "right", digit: null, replacesId: original.id }),
    );
    expect(original.value).toBe("3");
    expect(corrected.value).toBe("3-");
    const after = (await buildChart(t.db, c, { today: TODAY })).rows.find((r) => r.key === "wrist.extension|right|-")!;
    expect(after.grade?.id).toBe(corrected.id);
    expect(after.history.map((g) => g.id)).toEqual([corrected.id, original.id]);
    expect(after.history[1].replacedById).toBe(corrected.id);
    const [stillThere] = await t.db.select().from(gradeEntries).where(eq(gradeEntries.id, original.id));
    expect(stillThere.value).toBe("3");
    // Correcting the replaced entry again is refused: corrections chain from the newest.
    await expect(
      recordGrade(t.db, { actor: therapist, client: c, today: TODAY }, gradeInputSchema.parse({ method: "remote_range", motion: "wrist.extension", side: "right", digit: null, replacesId: original.id })),
    ).rejects.toThrow(/already been corrected/);
  });
});

describe("in-person results", () => {
  it("refuses a resisted grade while a precaution applies, naming the field", async () => {
    const c = await client("dorian");
    const input = inPersonResultSchema.parse({ grades: [{ method: "in_person_resisted", motion: "wrist.extension", side: "left", digit: null, value: "4" }] });
    const error = await recordInPersonResult(t.db, { actor: therapist, client: c, today: TODAY }, input).catch((e) => e);
    expect(error).toBeInstanceOf(BadRequest);
    expect(Object.keys((error as BadRequest).fields)).toEqual(["grades.0.method"]);
  });

  it("refuses a grade that the method cannot give (Daniels: resistance gives 3+ to 5, palpation 0 or 1)", async () => {
    const c = await client("bram");
    for (const [method, value] of [["in_person_resisted", "2"], ["in_person_palpation", "3"]] as const) {
      const input = inPersonResultSchema.parse({ grades: [{ method, motion: "mcp.extension", side: "right", digit: "index", value }] });
      await expect(recordInPersonResult(t.db, { actor: therapist, client: c, today: TODAY }, input)).rejects.toThrow(/cannot come from/);
    }
  });

  it("closes the flag when the in-person grade is recorded, and the queue drops the need", async () => {
    const c = await client("bram");
    const queueBefore = await buildQueue(t.db, therapist.clinicId, TODAY);
    const bram = queueBefore.find((g) => g.clientId === c.id)!;
    // No movement seen at the index MCP: palpation is the most urgent need, so Bram's group sorts before Dorian's,
    // whose resisted test must wait for the precaution's date anyway.
    const order = queueBefore.map((g) => g.clientId);
    expect(bram.urgency).toBe(3);
    expect(order.indexOf(c.id)).toBeLessThan(order.indexOf(seed.clientIds!.dorian));
    expect(queueBefore.find((g) => g.clientId === seed.clientIds!.dorian)?.earliestDate).toBe("2026-12-22");
    expect(bram.items.find((i) => i.key === "mcp.extension|right|index")?.needs.map((n) => n.reason)).toContain("palpation");
    const input = inPersonResultSchema.parse({
      grades: [{ method: "in_person_palpation", motion: "mcp.extension", side: "right", digit: "index", value: "1" }],
      strength: [{ test: "grip", side: "right", unit: "kg", trials: [30, 32, 31] }],
    });
    await recordInPersonResult(t.db, { actor: therapist, client: c, today: TODAY }, input);
    const chart = await buildChart(t.db, c, { today: TODAY });
    expect(chart.rows.find((r) => r.key === "mcp.extension|right|index")?.needs).toEqual([]);
    // Grip of 31 kg = 68.3 lb for a man of 52 (Mathiowetz 1985, men 50-54 right 113.6 lb): about 60% of the norm.
    const grip = chart.strength[0];
    expect(grip.meanKg).toBeCloseTo(31, 6);
    expect(grip.comparison?.norm.meanLb).toBe(113.6);
    expect(grip.comparison?.percentOfNorm).toBeCloseTo((31 / 0.45359237 / 113.6) * 100, 6);
    const queueAfter = await buildQueue(t.db, therapist.clinicId, TODAY);
    expect(queueAfter.find((g) => g.clientId === c.id)?.items.some((i) => i.key === "mcp.extension|right|index") ?? false).toBe(false);
  });

  it("an assistant's in-person grade waits for co-signature", async () => {
    const c = await client("kofi");
    const input = inPersonResultSchema.parse({ grades: [{ method: "in_person_resisted", motion: "finger.abduction", side: "left", digit: "little", value: "3+" }] });
    const { grades } = await recordInPersonResult(t.db, { actor: assistant, client: c, today: TODAY }, input);
    expect(grades[0].status).toBe("awaiting_cosign");
    expect(grades[0].signedByUserId).toBeNull();
  });
});

describe("chart cache", () => {
  it("serves the same chart until something on it changes, then rebuilds", async () => {
    const { cachedChart } = await import("@/lib/chart/chart");
    const c = await client("kofi");
    const first = await cachedChart(t.db, c, { today: TODAY });
    expect(await cachedChart(t.db, c, { today: TODAY })).toBe(first);
    await recordPassiveRange(t.db, { actor: therapist, client: c, today: TODAY }, { motion: "finger.abduction", side: "left", digit: "little", valueDeg: 15, note: "" });
    const after = await cachedChart(t.db, c, { today: TODAY });
    expect(after).not.toBe(first);
    expect(after.rows.find((r) => r.key === "finger.abduction|left|little")?.passiveRangeDeg).toBe(15);
  });
});

describe("uploaded clips and grading", () => {
  it("a clip's attempt counts towards a proposed grade only once a therapist has kept it", async () => {
    // A row with no other attempts: the client's right little-finger DIP flexion, gravity minimized.
    const { analyzeSynthetic, attemptRow } = await import("@/lib/chart/synthetic-attempts");
    const { attempts } = await import("@/db/schema");
    const { recentAttempts } = await import("@/db/queries/attempts");
    const wren = await client("wren");
    const analysis = analyzeSynthetic({ motion: "dip.flexion", side: "right", digit: "little", condition: "gravity_minimized", peakDeg: 60, seed: 9001 });
    const [row] = await t.db
      .insert(attempts)
      .values({ ...attemptRow(analysis, { clinicId: wren.clinicId, clientId: wren.id, recordedByUserId: null }, new Date(`${TODAY}T08:00:00Z`), "clip-test-upload-1"), source: "upload" })
      .returning();
    const inGrading = async () => (await recentAttempts(t.db, wren.clinicId, wren.id)).some((a) => a.id === row.id);
    expect(await inGrading()).toBe(false);
    await t.db.update(attempts).set({ keptAt: new Date(), keptByUserId: therapist.userId }).where(eq(attempts.id, row.id));
    expect(await inGrading()).toBe(true);
  });
});
