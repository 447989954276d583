import Link from "next/link";
import { notFound } from "next/navigation";
import { getDb } from "@/db";
import { getClinic } from "@/db/queries/clinics";
import { listClients } from "@/db/queries/clients";
import { listTherapists } from "@/db/queries/users";
import { listVisits } from "@/db/queries/visits";
import { CancelVisitButton } from "@/components/visits/cancel-visit-button";
import { ScheduleVisitForm } from "@/components/visits/schedule-form";
import { VisitStatusBadge } from "@/components/visits/visit-status";
import { Card, PageTitle } from "@/components/ui/card";
import { currentActor } from "@/lib/auth/guard";
import { formatInZone, toLocalInput } from "@/lib/visits/time";

export const metadata = { title: "Visits" };

export default async function VisitsPage() {
  const actor = await currentActor();
  if (!actor || actor.role === "client") notFound();
  const db = getDb();
  const clinic = (await getClinic(db, actor.clinicId))!;
  const now = new Date();
  const [upcoming, therapists, clientPage] = await Promise.all([
    listVisits(db, { clinicId: actor.clinicId, from: new Date(now.getTime() - 12 * 3600_000), statuses: ["scheduled", "waiting", "in_progress"] }),
    listTherapists(db, actor.clinicId),
    listClients(db, actor.clinicId, { sort: "name", dir: "asc", page: 1, pageSize: 100 }),
  ]);
  const canBook = actor.role === "admin" || actor.role === "therapist";
  const nextHour = new Date(Math.ceil(now.getTime() / 3600_000) * 3600_000 + 3600_000);
  return (
    <div className="space-y-6">
      <PageTitle title="Visits" subtitle="Video visits and appointments in the clinic, soonest first." />
      {canBook ? (
        <Card title="Book a visit">
          <ScheduleVisitForm
            clients={clientPage.rows.map((c) => ({ id: c.id, name: `${c.familyName}, ${c.givenName}` }))}
            therapists={therapists}
            defaultTherapistId={actor.role === "therapist" ? actor.userId : undefined}
            defaultStart={toLocalInput(nextHour, clinic.timezone)}
            timezone={clinic.timezone}
          />
        </Card>
      ) : null}
      <Card title="Coming up">
        {upcoming.length === 0 ? (
          <p className="text-sm text-ink-soft">Nothing booked.</p>
        ) : (
          <ul className="divide-y divide-sand-100" data-testid="visit-list">
            {upcoming.map((v) => (
              <li key={v.id} className="flex flex-wrap items-center justify-between gap-3 py-3">
                <div>
                  <p className="font-medium">
                    {v.clientName} {v.clientFamily} <VisitStatusBadge status={v.status} />
                  </p>
                  <p className="text-sm text-ink-soft">
                    {formatInZone(v.startsAt, clinic.timezone)} · {v.durationMin} min · {v.kind === "video" ? "video" : `in the clinic${v.location ? `, ${v.location}` : ""}`} · {v.therapistName}
                  </p>
                  {v.reason ? <p className="text-sm">{v.reason}</p> : null}
                </div>
                <div className="flex items-center gap-4">
                  {v.kind === "video" && v.therapistId === actor.userId ? (
                    <Link href={`/visits/${v.id}`} className="rounded-lg bg-tide-600 px-3 py-1.5 text-sm font-semibold text-white">
                      Open visit
                    </Link>
                  ) : null}
                  {canBook ? <CancelVisitButton visitId={v.id} label={`visit with ${v.clientName} ${v.clientFamily}`} /> : null}
                </div>
              </li>
            ))}
          </ul>
        )}
      </Card>
    </div>
  );
}
