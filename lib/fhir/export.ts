// HL7 FHIR R4 export of the chart: a `collection` Bundle with the Patient and one Observation per current grade,
// per motion's best verified peak angle, and per grip/pinch reading. Units are UCUM; categories from HL7's
// observation-category code system. Kinarc's own motion codes live under a URN, as FHIR allows for local codes.
import { createHash } from "node:crypto";
import type { Client } from "@/db/schema";
import { KG_PER_LB, MATHIOWETZ_1985, STRENGTH_TEST_LABELS } from "@/lib/norms/grip-pinch";
import type { ChartData, ChartGrade, ChartRow, StrengthRow } from "@/lib/chart/chart";
import { GRADE_METHOD_LABELS } from "@/lib/chart/model";

const UCUM = "http://unitsofmeasure.org";
const CATEGORY = { coding: [{ system: "http://terminology.hl7.org/CodeSystem/observation-category", code: "exam", display: "Exam" }] };
const KINARC_CODES = "urn:kinarc:observation";

type Json = Record<string, unknown>;

const degrees = (value: number) => ({ value: Math.round(value * 10) / 10, unit: "deg", system: UCUM, code: "deg" });

function gradeObservation(row: ChartRow, g: ChartGrade, patientRef: string): Json {
  const obs: Json = {
    resourceType: "Observation",
    id: g.id,
    status: g.status === "signed" ? (g.replacesId ? "corrected" : "final") : "preliminary",
    category: [CATEGORY],
    code: { coding: [{ system: KINARC_CODES, code: `mmt-grade.${row.motion}`, display: `Manual muscle test grade: ${row.label}` }], text: `Manual muscle test grade, ${row.label}, ${row.side}` },
    subject: { reference: patientRef },
    effectiveDateTime: g.recordedAt,
    method: { text: GRADE_METHOD_LABELS[g.method] },
    bodySite: { text: `${row.side} ${row.digit ? `${row.digit} ` : ""}${row.motion.split(".")[0]}` },
  };
  if (g.signedAt) obs.issued = g.signedAt;
  if (g.signedByName) obs.performer = [{ display: g.signedByName }];
  if (g.value !== null) obs.valueCodeableConcept = { coding: [{ system: `urn:kinarc:mmt-scale:${g.scale}`, code: g.value }], text: g.value };
  else obs.dataAbsentReason = { text: "No movement seen on camera; palpation in person tells 1 from 0" };
  const notes = [
    ...(g.status !== "signed" ? ["Awaiting a therapist's co-signature."] : []),
    ...(g.replacesId ? [`Corrects the earlier entry ${g.replacesId}.`] : []),
    ...(row.needs.length ? [`Still needs in person: ${row.needs.map((n) => n.reason).join(", ")}.`] : []),
  ];
  if (notes.length) obs.note = notes.map((text) => ({ text }));
  return obs;
}

function angleObservation(row: ChartRow, patientRef: string): Json | null {
  if (row.bestPeakDeg == null || !row.latestAt) return null;
  const obs: Json = {
    resourceType: "Observation",
    id: `angle-${row.key.replaceAll("|", "-").replaceAll(".", "-").replaceAll("_", "-")}`.slice(0, 64),
    status: "final",
    category: [CATEGORY],
    code: { coding: [{ system: KINARC_CODES, code: `arom-peak.${row.motion}`, display: `Active range, best peak: ${row.label}` }], text: `Active range of motion (AROM), best verified peak, ${row.label}, ${row.side}` },
    subject: { reference: patientRef },
    effectiveDateTime: row.latestAt,
    valueQuantity: degrees(row.bestPeakDeg),
    method: { text: "Camera estimate from hand landmarks (Kinarc measurement engine), test plane verified against gravity" },
    bodySite: { text: `${row.side} ${row.digit ? `${row.digit} ` : ""}${row.motion.split(".")[0]}` },
  };
  if (row.reference) obs.referenceRange = [{ high: degrees(row.reference.endRangeDeg), text: `Reference end-range: ${row.reference.source}` }];
  if (row.latestUncertaintyDeg) obs.note = [{ text: `Stated uncertainty of the latest attempt: ±${row.latestUncertaintyDeg.toFixed(1)} deg.` }];
  return obs;
}

function strengthObservation(s: StrengthRow, patientRef: string): Json {
  const lb = s.meanKg / KG_PER_LB;
  const obs: Json = {
    resourceType: "Observation",
    id: s.id,
    status: "final",
    category: [CATEGORY],
    code: { coding: [{ system: KINARC_CODES, code: `strength.${s.test}`, display: STRENGTH_TEST_LABELS[s.test] }], text: `${STRENGTH_TEST_LABELS[s.test]}, ${s.side} hand, mean of trials` },
    subject: { reference: patientRef },
    effectiveDateTime: s.recordedAt,
    valueQuantity: { value: Math.round(lb * 10) / 10, unit: "lbf", system: UCUM, code: "[lbf_av]" },
    method: { text: "In person: hand-held dynamometer or pinch gauge, mean of trials" },
  };
  if (s.comparison) {
    obs.referenceRange = [
      {
        low: { value: Math.round((s.comparison.norm.meanLb - s.comparison.norm.sdLb) * 10) / 10, unit: "lbf", system: UCUM, code: "[lbf_av]" },
        high: { value: Math.round((s.comparison.norm.meanLb + s.comparison.norm.sdLb) * 10) / 10, unit: "lbf", system: UCUM, code: "[lbf_av]" },
        text: `Mean ± 1 SD for ${s.comparison.norm.group} (${MATHIOWETZ_1985})`,
      },
    ];
    obs.note = [{ text: `${Math.round(s.comparison.percentOfNorm)}% of the age- and sex-matched norm.` }];
  }
  return obs;
}

const FHIR_GENDER: Record<Client["sex"], string> = { female: "female", male: "male", other: "other", unknown: "unknown" };

/** A stable UUID (version 5 layout, SHA-1 of a name) so the same export gives the same fullUrls every time. */
function nameUuid(name: string): string {
  const h = createHash("sha1").update(name).digest();
  h[6] = (h[6] & 0x0f) | 0x50;
  h[8] = (h[8] & 0x3f) | 0x80;
  const x = h.subarray(0, 16).toString("hex");
  return `${x.slice(0, 8)}-${x.slice(8, 12)}-${x.slice(12, 16)}-${x.slice(16, 20)}-${x.slice(20)}`;
}

export function chartBundle(client: Client, chart: ChartData, now = new Date()): Json {
  const patientUrl = `urn:uuid:${client.id}`;
  const patient: Json = {
    resourceType: "Patient",
    id: client.id,
    identifier: [{ system: "urn:kinarc:client", value: client.id }],
    name: [{ family: client.familyName, given: [client.givenName] }],
    gender: FHIR_GENDER[client.sex],
    birthDate: client.dateOfBirth,
  };
  const observations: Json[] = [];
  for (const row of chart.rows) {
    // Current entries only: a corrected entry is replaced by its correction, which says what it corrects.
    for (const g of row.history.filter((h) => !h.replacedById)) observations.push(gradeObservation(row, g, patientUrl));
    const angle = angleObservation(row, patientUrl);
    if (angle) observations.push(angle);
  }
  for (const s of chart.strength) observations.push(strengthObservation(s, patientUrl));
  return {
    resourceType: "Bundle",
    type: "collection",
    timestamp: now.toISOString(),
    entry: [
      { fullUrl: patientUrl, resource: patient },
      ...observations.map((o) => ({ fullUrl: `urn:uuid:${/^[0-9a-f-]{36}$/.test(String(o.id)) ? o.id : nameUuid(`${client.id}|${String(o.id)}`)}`, resource: o })),
    ],
  };
}
