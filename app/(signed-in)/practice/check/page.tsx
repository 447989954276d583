import { notFound, redirect } from "next/navigation";
import { getDb } from "@/db";
import { getClinic } from "@/db/queries/clinics";
import { PageTitle } from "@/components/ui/card";
import { OutboxStatus } from "@/components/tracking/outbox-status";
import { SelfCheckFlow } from "@/components/tracking/self-check-flow";
import { currentActor, requireClientRecord } from "@/lib/auth/guard";
import { RANGE_TABLE_IDS, type RangeTableId } from "@/lib/motions/catalog";
import { selfCheckPlan } from "@/lib/tracking/self-check-plan";
import { practiceTarget } from "@/lib/practice/start";

export const metadata = { title: "Check a movement" };

export default async function SelfCheckPage({ searchParams }: { searchParams: Promise<{ item?: string | string[] }> }) {
  const actor = await currentActor();
  if (!actor) redirect("/sign-in");
  // The guided self-check is the client's own; staff measure clients during a visit.
  if (actor.role !== "client" || !actor.clientId) redirect("/home");
  const db = getDb();
  const client = await requireClientRecord(actor, actor.clientId, { db, purpose: "self_check" });
  const clinic = await getClinic(db, client.clinicId);
  const plan = selfCheckPlan(client);
  // `?item=` starts the check for a home program item (lib/practice/start.ts); withheld or ended items are not found.
  const itemId = (await searchParams).item;
  const practice = typeof itemId === "string" ? await practiceTarget(db, client, itemId) : undefined;
  if (practice === null) notFound();
  const rangeTable = (RANGE_TABLE_IDS as readonly string[]).includes(clinic?.normTable ?? "") ? (clinic!.normTable as RangeTableId) : "aaos1965";
  return (
    <div className="space-y-4">
      <PageTitle title="Check a movement" subtitle="Measure how far a joint moves, with your camera. It takes about two minutes." />
      <OutboxStatus />
      {plan.offered.length ? (
        <SelfCheckFlow clientId={client.id} sides={plan.sides} offered={plan.offered} withheld={plan.withheld} rangeTable={rangeTable} precautionNote={client.precautionNote} practice={practice} />
      ) : (
        <p className="text-sm text-ink-soft">No movement is offered for a self-check on your record. Your therapist will measure with you in a visit.</p>
      )}
    </div>
  );
}
