import type { Tx } from "@/db";
import { visitPrices, visits } from "@/db/schema";

/**
 * Demo prices for self-pay visits (invented amounts) and one finished video visit of Dorian's, not yet paid, so the
 * demo can show paying after a visit through the local payment stand-in.
 */
export async function seedBillingDemo(tx: Tx, ids: { clinicId: string; adminId: string; therapistId: string; dorianId: string }, today: Date): Promise<void> {
  await tx.insert(visitPrices).values([
    { clinicId: ids.clinicId, visitKind: "video", amountMinor: 6500, currency: "gbp", label: "Video hand therapy visit", updatedByUserId: ids.adminId },
    { clinicId: ids.clinicId, visitKind: "in_person", amountMinor: 8000, currency: "gbp", label: "In-person hand therapy visit", updatedByUserId: ids.adminId },
  ]);
  const lastWeek = new Date(today.getTime() - 6 * 86_400_000);
  lastWeek.setUTCHours(10, 0, 0, 0);
  await tx.insert(visits).values({
    clinicId: ids.clinicId,
    clientId: ids.dorianId,
    therapistId: ids.therapistId,
    kind: "video",
    startsAt: lastWeek,
    durationMin: 45,
    reason: "Wrist range review after plate fixation",
    status: "finished",
    startedAt: lastWeek,
    endedAt: new Date(lastWeek.getTime() + 40 * 60_000),
    createdByUserId: ids.therapistId,
  });
}
