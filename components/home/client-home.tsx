import { getDb } from "@/db";
import { getClinic } from "@/db/queries/clinics";
import { getClient } from "@/db/queries/clients";
import { listVisits, OPEN_STATUSES } from "@/db/queries/visits";
import { ButtonLink } from "@/components/ui/button";
import { formatInZone } from "@/lib/visits/time";
import { Card, PageTitle } from "@/components/ui/card";
import { ClientProgressCard } from "@/components/chart/client-progress";
import { OutboxStatus } from "@/components/tracking/outbox-status";
import { SafetyNote } from "@/components/safety-note";
import { WhatToPractise } from "@/components/practice/what-to-practise";
import type { Actor } from "@/lib/auth/guard";

/** The client's own page: plain words, large targets, works on a phone. */
export async function ClientHome({ actor }: { actor: Actor }) {
  const db = getDb();
  const now = new Date();
  const [record, clinic, visits] = await Promise.all([
    actor.clientId ? getClient(db, actor.clinicId, actor.clientId) : null,
    getClinic(db, actor.clinicId),
    listVisits(db, { clinicId: actor.clinicId, clientId: actor.clientId ?? "-", from: new Date(now.getTime() - 2 * 3600_000), statuses: OPEN_STATUSES, limit: 3 }),
  ]);
  const next = visits[0];
  const zone = clinic?.timezone ?? "UTC";
  return (
    <div className="mx-auto max-w-xl space-y-6">
      <PageTitle title={`Hello, ${record?.givenName ?? actor.name}`} subtitle="Your hand therapy between and during visits." />
      <Card title="Your next visit">
        {next ? (
          <div data-testid="next-visit" className="space-y-2">
            <p className="text-lg font-medium">{formatInZone(next.startsAt, zone)}</p>
            <p className="text-sm text-ink-soft">
              {next.kind === "video" ? "Video visit" : `In the clinic${next.location ? `: ${next.location}` : ""}`} with {next.therapistName}, {next.durationMin} minutes.
            </p>
            {next.reason ? <p className="text-sm">{next.reason}</p> : null}
            {next.kind === "video" ? (
              <ButtonLink href={`/visits/${next.id}`} className="w-full py-3 text-base">
                Open the visit
              </ButtonLink>
            ) : null}
          </div>
        ) : (
          <p className="text-sm text-ink-soft" data-testid="next-visit">
            Nothing booked yet. Your clinic will e-mail you an invitation when a visit is scheduled.
          </p>
        )}
      </Card>
      <ClientProgressCard actor={actor} />
      <OutboxStatus />
      <Card title="Check a movement">
        <p className="text-sm text-ink-soft">Measure how far your wrist or a finger moves, with your camera, for your therapist.</p>
        <ButtonLink href="/practice/check" className="mt-3">
          Start a self-check
        </ButtonLink>
      </Card>
      <WhatToPractise actor={actor} />
      <SafetyNote />
    </div>
  );
}
