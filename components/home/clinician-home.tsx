import Link from "next/link";
import { getDb } from "@/db";
import { listClients } from "@/db/queries/clients";
import { ButtonLink } from "@/components/ui/button";
import { Badge, Card, PageTitle } from "@/components/ui/card";
import type { Actor } from "@/lib/auth/guard";
import { PRECAUTION_LABELS } from "@/lib/validation/client";

function greeting(now = new Date()): string {
  const h = now.getUTCHours();
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
  const first = actor.name.split(" ")[0];
  return (
    <div className="space-y-6">
      <PageTitle
        title={`${greeting()}, ${first}`}
        subtitle={actor.role === "assistant" ? "Your work list. What you record waits for a therapist's co-signature." : "Your caseload and today's work."}
        action={
          <ButtonLink href="/clients/new" variant="primary">
            Add a client
          </ButtonLink>
        }
      />
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
