import { count } from "drizzle-orm";
import type { Database } from "@/db";
import { clients, clinics, users, type NewClient, type Role } from "@/db/schema";
import { hashPassword } from "@/lib/auth/password";
import { seedBillingDemo } from "./billing";
import { seedChartDemo } from "./chart";
import { seedPracticeDemo } from "./practice";

/**
 * The demo clinic. Everyone here is invented: names, dates, conditions and notes are fiction written for Kinarc's
 * demo, loosely shaped on the kinds of referral a hand therapy clinic sees.
 */
export const DEMO_PASSWORD = "kinarc-demo";

export const DEMO_SIGN_INS = [
  { email: "admin@kinarc.test", role: "admin", name: "Priya Okonkwo-Lind" },
  { email: "therapist@kinarc.test", role: "therapist", name: "Tomasz Reyes" },
  { email: "assistant@kinarc.test", role: "assistant", name: "Juniper Hale" },
  { email: "client@kinarc.test", role: "client", name: "Dorian Vale" },
] as const satisfies readonly { email: string; role: Role; name: string }[];

const EXTRA_STAFF = [{ email: "therapist2@kinarc.test", role: "therapist", name: "Mireille Achterberg" }] as const;

function isoDaysFrom(base: Date, days: number): string {
  return new Date(base.getTime() + days * 86_400_000).toISOString().slice(0, 10);
}

type DemoClient = Omit<NewClient, "clinicId" | "primaryTherapistId"> & { key: string; therapist: "primary" | "second" };

function demoClients(today: Date): DemoClient[] {
  const d = (days: number) => isoDaysFrom(today, days);
  return [
    {
      key: "dorian",
      givenName: "Dorian",
      familyName: "Vale",
      email: "client@kinarc.test",
      dateOfBirth: "1979-06-14",
      sex: "male",
      dominantHand: "right",
      affectedSide: "right",
      diagnosisNote: "Distal radius fracture after a fall from a ladder; plate fixation six weeks ago. Stiff wrist, fingers improving.",
      referringPhysician: "Dr. Ilse Brannigan, orthopaedics",
      precautionFlags: ["no_resisted_testing", "unhealed_fracture"],
      precautionNote: "Surgeon allows active motion only; no resisted testing until the next X-ray review.",
      noResistedUntil: d(21),
      selfPay: true,
      therapist: "primary",
    },
    {
      key: "wren",
      givenName: "Wren",
      familyName: "Castellanos",
      email: "wren.castellanos@clients.kinarc.test",
      dateOfBirth: "1996-11-02",
      sex: "female",
      dominantHand: "left",
      affectedSide: "left",
      diagnosisNote: "Zone II flexor tendon repair of the index and middle fingers (kitchen knife), four weeks after surgery.",
      referringPhysician: "Dr. Amadou Sterling, plastic surgery",
      precautionFlags: ["no_resisted_testing", "tendon_repair"],
      precautionNote: "Early active motion protocol. No resisted grip or testing before week 8; follow the surgeon's protocol.",
      noResistedUntil: d(28),
      therapist: "primary",
    },
    {
      key: "ismael",
      givenName: "Ismael",
      familyName: "Fairbourne",
      dateOfBirth: "1968-02-27",
      sex: "male",
      dominantHand: "right",
      affectedSide: "right",
      diagnosisNote: "Median nerve compression at the wrist; night numbness, weak thumb opposition. Awaiting nerve conduction study.",
      referringPhysician: "Dr. Noor Halvorsen, general practice",
      precautionFlags: ["reduced_sensation"],
      precautionNote: "Reduced sensation in the thumb, index and middle fingers.",
      therapist: "primary",
    },
    {
      key: "odile",
      givenName: "Odile",
      familyName: "Marchetti",
      dateOfBirth: "1955-09-08",
      sex: "female",
      dominantHand: "right",
      affectedSide: "both",
      diagnosisNote: "Rheumatoid arthritis, both hands; MCP swelling in a current flare. Joint protection and range maintenance.",
      referringPhysician: "Dr. Caspian Ruiz, rheumatology",
      precautionFlags: ["acute_inflammation_or_infection", "joint_instability"],
      precautionNote: "Avoid resisted testing of swollen joints during the flare.",
      therapist: "second",
    },
    {
      key: "kofi",
      givenName: "Kofi",
      familyName: "Lindqvist",
      dateOfBirth: "1988-04-19",
      sex: "male",
      dominantHand: "left",
      affectedSide: "left",
      diagnosisNote: "Ulnar nerve compression at the elbow; weak finger spreading and little-finger clawing.",
      referringPhysician: "Dr. Noor Halvorsen, general practice",
      precautionFlags: [],
      precautionNote: "",
      therapist: "second",
    },
    {
      key: "hester",
      givenName: "Hester",
      familyName: "Nakamura-Brandt",
      dateOfBirth: "1949-12-30",
      sex: "female",
      dominantHand: "right",
      affectedSide: "right",
      diagnosisNote: "Thumb base (CMC) osteoarthritis; pain on pinch. Splint at night.",
      referringPhysician: "Dr. Ilse Brannigan, orthopaedics",
      precautionFlags: ["osteoporosis"],
      precautionNote: "Osteoporosis: gentle, graded resistance only.",
      therapist: "primary",
    },
    {
      key: "anselm",
      givenName: "Anselm",
      familyName: "Okafor",
      dateOfBirth: "2003-07-05",
      sex: "male",
      dominantHand: "right",
      affectedSide: "right",
      diagnosisNote: "Scaphoid waist fracture from a football fall, in a cast for 8 weeks; cast off last week.",
      referringPhysician: "Dr. Amadou Sterling, plastic surgery",
      precautionFlags: ["no_resisted_testing", "unhealed_fracture"],
      precautionNote: "Union not yet confirmed on CT. Active range only.",
      noResistedUntil: d(35),
      therapist: "primary",
    },
    {
      key: "thea",
      givenName: "Thea",
      familyName: "Rosenqvist",
      dateOfBirth: "1961-03-22",
      sex: "female",
      dominantHand: "left",
      affectedSide: "left",
      diagnosisNote: "Left hand weakness after a stroke three months ago; wrist extension returning, finger extension limited.",
      referringPhysician: "Dr. Caspian Ruiz, neurology rehabilitation",
      precautionFlags: ["cardiovascular"],
      precautionNote: "Blood pressure under treatment: no breath-holding during effort.",
      therapist: "second",
    },
    {
      key: "bram",
      givenName: "Bram",
      familyName: "Esposito",
      dateOfBirth: "1974-10-11",
      sex: "male",
      dominantHand: "right",
      affectedSide: "right",
      diagnosisNote: "Radial nerve palsy after a humeral shaft fracture; wrist drop recovering, first wrist extension seen last month.",
      referringPhysician: "Dr. Ilse Brannigan, orthopaedics",
      precautionFlags: [],
      precautionNote: "",
      therapist: "primary",
    },
    {
      key: "lucia",
      givenName: "Lucía",
      familyName: "Ferreira-Hughes",
      dateOfBirth: "1958-01-17",
      sex: "female",
      dominantHand: "right",
      affectedSide: "right",
      diagnosisNote: "Release of a ring- and little-finger contracture (palmar fascia) three weeks ago; scar care and extension splint.",
      referringPhysician: "Dr. Amadou Sterling, plastic surgery",
      precautionFlags: ["no_resisted_testing"],
      precautionNote: "Wound healed; no resisted gripping for two more weeks.",
      noResistedUntil: d(14),
      therapist: "second",
    },
  ];
}

export interface SeedResult {
  seeded: boolean;
  clinicId?: string;
  clientIds?: Record<string, string>;
}

/** Creates the demo clinic if the database has no clinic yet; otherwise leaves everything untouched. */
export async function seedDemo(db: Database, today = new Date()): Promise<SeedResult> {
  const [{ n }] = await db.select({ n: count() }).from(clinics);
  if (n > 0) return { seeded: false };
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  return db.transaction(async (tx) => {
    const [clinic] = await tx
      .insert(clinics)
      .values({ name: "Saltmarsh Hand Therapy", timezone: "Europe/London", contactEmail: "desk@saltmarsh.kinarc.test" })
      .returning();
    const staffIds: Record<string, string> = {};
    for (const s of [...DEMO_SIGN_INS.filter((u) => u.role !== "client"), ...EXTRA_STAFF]) {
      const [u] = await tx
        .insert(users)
        .values({ clinicId: clinic.id, email: s.email, name: s.name, role: s.role, passwordHash, emailVerified: today })
        .returning();
      staffIds[s.email] = u.id;
    }
    const clientIds: Record<string, string> = {};
    for (const { key, therapist, ...c } of demoClients(today)) {
      // Dorian can also sign in with the demo password; Wren signs in by e-mailed link only.
      let userId: string | null = null;
      if (key === "dorian" || key === "wren") {
        const [u] = await tx
          .insert(users)
          .values({
            clinicId: clinic.id,
            email: c.email!,
            name: `${c.givenName} ${c.familyName}`,
            role: "client",
            passwordHash: key === "dorian" ? passwordHash : null,
          })
          .returning();
        userId = u.id;
      }
      const [row] = await tx
        .insert(clients)
        .values({
          ...c,
          clinicId: clinic.id,
          userId,
          primaryTherapistId: staffIds[therapist === "primary" ? "therapist@kinarc.test" : "therapist2@kinarc.test"],
        })
        .returning();
      clientIds[key] = row.id;
    }
    await seedChartDemo(tx, { clinicId: clinic.id, clientIds, therapistId: staffIds["therapist@kinarc.test"], assistantId: staffIds["assistant@kinarc.test"] }, today);
    await seedPracticeDemo(tx, { clinicId: clinic.id, clientIds, therapistId: staffIds["therapist@kinarc.test"], timeZone: clinic.timezone }, today);
    await seedBillingDemo(tx, { clinicId: clinic.id, adminId: staffIds["admin@kinarc.test"], therapistId: staffIds["therapist@kinarc.test"], dorianId: clientIds.dorian }, today);
    return { seeded: true, clinicId: clinic.id, clientIds };
  });
}
