// Demo home programs (invented): Anselm practises wrist motion after his cast came off, with sessions whose readings
// the measurement engine makes from synthetic captures, so the therapist's page shows adherence and a stalled trend;
// Dorian has a weekly finger exercise to see on his own home page.
import type { Tx } from "@/db";
import { attempts, homeProgramItems, practiceSessions } from "@/db/schema";
import { analyzeSynthetic, attemptRow } from "@/lib/chart/synthetic-attempts";
import { addDays, localDateIn } from "@/lib/practice/schedule";

const DAY_MS = 86_400_000;

export async function seedPracticeDemo(tx: Tx, ids: { clinicId: string; clientIds: Record<string, string>; therapistId: string; timeZone: string }, today: Date): Promise<void> {
  const todayLocal = localDateIn(today, ids.timeZone);
  const anselm = ids.clientIds.anselm;
  const dorian = ids.clientIds.dorian;
  if (dorian) {
    await tx.insert(homeProgramItems).values({
      clinicId: ids.clinicId,
      clientId: dorian,
      motion: "mcp.flexion",
      side: "right",
      digit: "index",
      condition: "gravity_minimized",
      repetitions: 10,
      sessionsPerPeriod: 3,
      period: "week",
      startDate: addDays(todayLocal, -2),
      endDate: addDays(todayLocal, 26),
      notes: "Hand resting on its side on the table; bend the knuckles slowly, hold two seconds.",
      assignedByUserId: ids.therapistId,
    });
  }
  if (!anselm) return;
  const [extension] = await tx
    .insert(homeProgramItems)
    .values({
      clinicId: ids.clinicId,
      clientId: anselm,
      motion: "wrist.extension",
      side: "right",
      digit: null,
      condition: "against_gravity",
      repetitions: 10,
      sessionsPerPeriod: 1,
      period: "day",
      startDate: addDays(todayLocal, -9),
      endDate: addDays(todayLocal, 19),
      notes: "Forearm on the table, palm down, hand over the edge; lift the hand slowly.",
      assignedByUserId: ids.therapistId,
    })
    .returning();
  // Six sittings over nine days (three missed); the last three no better than the third: the trend reads stalled.
  const sittings = [
    { daysAgo: 9, peakDeg: 28 },
    { daysAgo: 8, peakDeg: 35 },
    { daysAgo: 6, peakDeg: 40 },
    { daysAgo: 4, peakDeg: 41 },
    { daysAgo: 2, peakDeg: 39 },
    { daysAgo: 1, peakDeg: 42 },
  ];
  for (const [i, s] of sittings.entries()) {
    const at = new Date(today.getTime() - s.daysAgo * DAY_MS);
    const sessionId = `00000000-0000-4000-8000-${String(900 + i).padStart(12, "0")}`;
    await tx.insert(practiceSessions).values({ id: sessionId, clinicId: ids.clinicId, clientId: anselm, itemId: extension.id, startedAt: at, localDate: localDateIn(at, ids.timeZone) });
    const analysis = analyzeSynthetic({ motion: "wrist.extension", side: "right", digit: null, condition: "against_gravity", peakDeg: s.peakDeg, seed: 700 + i, requirePlane: true });
    await tx.insert(attempts).values({
      ...attemptRow(analysis, { clinicId: ids.clinicId, clientId: anselm, recordedByUserId: null }, at, `demo-practice-anselm-${i}`),
      source: "practice",
      practiceSessionId: sessionId,
    });
  }
}
