import { notFound, redirect } from "next/navigation";
import { getDb } from "@/db";
import { getVisitDetail } from "@/db/queries/visits";
import { ClientVisitRoom } from "@/components/visit-room/client-visit-room";
import { VisitConsole } from "@/components/visit-room/visit-console";
import { Card, PageTitle } from "@/components/ui/card";
import { AccessError, currentActor } from "@/lib/auth/guard";
import { currentTelehealthConsent } from "@/lib/consent/store";
import { FLAGS_BLOCKING_RESISTANCE } from "@/lib/validation/client";
import { joinRefusal } from "@/lib/visits/lifecycle";
import { requireVisit } from "@/lib/visits/service";
import { formatInZone } from "@/lib/visits/time";
import { getClient } from "@/db/queries/clients";

export const metadata = { title: "Video visit" };

export default async function VisitPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const actor = await currentActor();
  if (!actor) redirect("/sign-in");
  const db = getDb();
  const visit = await requireVisit(db, actor, id, "participant").catch((error) => {
    if (error instanceof AccessError) notFound();
    throw error;
  });
  const detail = (await getVisitDetail(db, visit.id))!;
  const when = formatInZone(visit.startsAt, detail.clinicTimezone);
  const refusal = visit.kind === "video" ? joinRefusal(visit, new Date()) : "This visit is in the clinic, not by video.";
  if (actor.role === "client" && !(await currentTelehealthConsent(db, actor.clientId!))) {
    redirect(`/consent?next=/visits/${visit.id}`);
  }
  if (refusal) {
    return (
      <div className="mx-auto max-w-xl">
        <PageTitle title="Video visit" subtitle={when} />
        <Card>
          <p role="status" data-testid="join-refusal">
            {refusal}
          </p>
        </Card>
      </div>
    );
  }
  const client = (await getClient(db, actor.clinicId, visit.clientId))!;
  if (actor.role === "client") {
    return <ClientVisitRoom visitId={visit.id} clientId={client.id} therapistName={detail.therapistName ?? "your therapist"} when={when} side={client.affectedSide === "left" ? "left" : "right"} />;
  }
  return (
    <VisitConsole
      visitId={visit.id}
      clientName={`${client.givenName} ${client.familyName}`}
      when={when}
      affectedSide={client.affectedSide}
      diagnosisNote={client.diagnosisNote}
      resistanceBlocked={client.precautionFlags.some((f) => FLAGS_BLOCKING_RESISTANCE.includes(f))}
      noResistedUntil={client.noResistedUntil}
      precautionNote={client.precautionNote}
    />
  );
}
