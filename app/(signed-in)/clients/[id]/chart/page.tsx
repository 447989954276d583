import { headers } from "next/headers";
import { notFound, redirect } from "next/navigation";
import { getDb } from "@/db";
import { ChartView } from "@/components/chart/chart-view";
import { ButtonLink } from "@/components/ui/button";
import { PageTitle } from "@/components/ui/card";
import { SafetyNote } from "@/components/safety-note";
import { AccessError, currentActor, requestAddress, requireClientRecord } from "@/lib/auth/guard";
import { buildChart, clinicToday } from "@/lib/chart/chart";
import { CHART_STAFF } from "@/lib/chart/access";

export const metadata = { title: "Strength and range chart" };

export default async function ChartPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const actor = await currentActor();
  if (!actor) redirect("/sign-in");
  // Admins read nothing clinical; clients see their progress on their own home.
  if (!(CHART_STAFF as readonly string[]).includes(actor.role)) notFound();
  const db = getDb();
  const record = await requireClientRecord(actor, id, { db, address: requestAddress(await headers()), purpose: "page.chart" }).catch((error) => {
    if (error instanceof AccessError) notFound();
    throw error;
  });
  const chart = await buildChart(db, record, { today: await clinicToday(db, actor.clinicId), emptyRows: true });
  // Dates and ids only: the chart is plain JSON for the client component.
  const initial = JSON.parse(JSON.stringify(chart)) as typeof chart;
  return (
    <div className="space-y-6">
      <PageTitle
        title={`Chart: ${record.givenName} ${record.familyName}`}
        subtitle={`Affected side: ${record.affectedSide} · ${record.dominantHand}-handed`}
        action={
          <div className="flex gap-2">
            <ButtonLink variant="quiet" href={`/clients/${record.id}`}>
              Record
            </ButtonLink>
            <ButtonLink href={`/clients/${record.id}/report`}>Evaluation summary</ButtonLink>
          </div>
        }
      />
      <ChartView clientId={record.id} initial={initial} role={actor.role} />
      <SafetyNote compact />
    </div>
  );
}
