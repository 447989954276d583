import Link from "next/link";
import { getDb } from "@/db";
import { getClinic } from "@/db/queries/clinics";
import { listClients } from "@/db/queries/clients";
import { listVisits } from "@/db/queries/visits";
import { VisitStatusBadge } from "@/components/visits/visit-status";
import { formatInZone } from "@/lib/visits/time";
import { ButtonLink } from "@/components/ui/button";
import { Badge, Card, PageTitle } from "@/components/ui/card";
import type { Actor } from "@/lib/auth/guard";
import { PRECAUTION_LABELS } from "@/lib/validation/client";

/** Morning, afternoon or evening where the clinic is, not where the server runs. */
function greeting(timeZone: string, now = new Date()): string {
  const h = Number(new Intl.DateTimeFormat("en-GB", { timeZone, hour: "numeric", hourCycle: "h23" }).format(now));
  return h < 12 ? "Good morning" : h < 18 ? "Good afternoon" : "Good evening";
}

/** Home for therapists ("Today") and assistants ("My list"): their own caseload first. */
export async function ClinicianHome({ actor }: { actor: Actor }) {
  const db = getDb();
  const mine = await listClients(db, actor.clinicId, {
    therapistId: actor.role === "therapist" ? actor.userId : undefined,
    sort: "name",
    dir: "asc",
    page: 1,
    pageSize: 50,
  });
  const clinic = await getClinic(db, actor.clinicId);
  const zone = clinic?.timezone ?? "UTC";
  // "Today" in the clinic's zone would need its midnight; the next 24 hours from now serve a working day well enough.
  const now = new Date();
  const today = await listVisits(db, {
    clinicId: actor.clinicId,
    therapistId: actor.role === "therapist" ? actor.userId : undefined,
    from: new Date(now.getTime() - 3 * 3600_000),
    to: new Date(now.getTime() + 24 * 3600_000),
    statuses: ["scheduled", "waiting", "in_progress"],
  });
  const first = actor.name.split(" ")[0];
  return (
    <div className="space-y-6">
      <PageTitle
        title={`${greeting(zone)}, ${first}`}
        subtitle={actor.role === "assistant" ? "Your work list. What you record waits for a therapist's co-signature." : "Your caseload and today's work."}
        action={
          <ButtonLink href="/clients/new" variant="primary">
            Add a client
          </ButtonLink>
        }
      />
      <Card title="Visits in the next 24 hours" action={<Link href="/visits" className="text-sm text-tide-700 hover:underline">All visits</Link>}>
        {today.length === 0 ? (
          <p className="text-sm text-ink-soft">No visits booked for the next 24 hours.</p>
        ) : (
          <ul className="divide-y divide-sand-100" data-testid="todays-visits">
            {today.map((v) => (
              <li key={v.id} className="flex flex-wrap items-center justify-between gap-2 py-3">
                <div>
                  <p className="font-medium">
                    {v.clientName} {v.clientFamily} <VisitStatusBadge status={v.status} />
                  </p>
                  <p className="text-sm text-ink-soft">
                    {formatInZone(v.startsAt, zone)} · {v.kind === "video" ? "video" : "in the clinic"} · {v.reason}
                  </p>
                </div>
                {v.kind === "video" && v.therapistId === actor.userId ? (
                  <ButtonLink href={`/visits/${v.id}`}>{v.status === "waiting" ? "Client is waiting: join" : "Open visit"}</ButtonLink>
                ) : null}
              </li>
            ))}
          </ul>
        )}
      </Card>
      <Card title={actor.role === "therapist" ? "Your clients" : "Clinic clients"}>
        {mine.rows.length === 0 ? (
          <p className="text-sm text-ink-soft">No clients assigned to you yet.</p>
        ) : (
          <ul className="divide-y divide-sand-100" data-testid="caseload">
            {mine.rows.map((c) => (
              <li key={c.id} className="flex flex-wrap items-center justify-between gap-2 py-3">
                <div>
                  <Link href={`/clients/${c.id}`} className="font-medium text-tide-700 hover:underline">
                    {c.givenName} {c.familyName}
                  </Link>
                  <p className="line-clamp-1 text-sm text-ink-soft">{c.diagnosisNote}</p>
                </div>
                <div className="flex flex-wrap gap-1">
                  {c.noResistedUntil ? <Badge tone="alert">No resisted testing until {c.noResistedUntil}</Badge> : null}
                  {c.precautionFlags
                    .filter((f) => f !== "no_resisted_testing")
                    .map((f) => (
                      <Badge key={f} tone="caution">
                        {PRECAUTION_LABELS[f]}
                      </Badge>
                    ))}
                </div>
              </li>
            ))}
          </ul>
        )}
      </Card>
    </div>
  );
}
