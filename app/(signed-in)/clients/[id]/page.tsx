import { headers } from "next/headers";
import { notFound, redirect } from "next/navigation";
import { getDb } from "@/db";
import { listTherapists } from "@/db/queries/users";
import { SafetyNote } from "@/components/safety-note";
import { ButtonLink } from "@/components/ui/button";
import { Badge, Card, PageTitle } from "@/components/ui/card";
import { AccessError, currentActor, requestAddress, requireClientRecord } from "@/lib/auth/guard";
import { CLIENT_EDITORS } from "@/lib/clients";
import { FLAGS_BLOCKING_RESISTANCE, PRECAUTION_LABELS } from "@/lib/validation/client";

export const metadata = { title: "Client record" };

export default async function ClientRecordPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const actor = await currentActor();
  if (!actor) redirect("/sign-in");
  const record = await requireClientRecord(actor, id, { address: requestAddress(await headers()), purpose: "page" }).catch((error) => {
    if (error instanceof AccessError) notFound();
    throw error;
  });
  const therapists = await listTherapists(getDb(), actor.clinicId);
  const therapist = therapists.find((t) => t.id === record.primaryTherapistId);
  const canEdit = (CLIENT_EDITORS as readonly string[]).includes(actor.role);
  const resistanceBlocked = record.precautionFlags.some((f) => FLAGS_BLOCKING_RESISTANCE.includes(f));
  return (
    <div className="space-y-6">
      <PageTitle
        title={`${record.givenName} ${record.familyName}`}
        subtitle={`Born ${record.dateOfBirth} · ${record.dominantHand}-handed · affected side: ${record.affectedSide}`}
        action={
          <div className="flex gap-2">
            {actor.role === "therapist" || actor.role === "assistant" ? (
              <ButtonLink variant="quiet" href={`/clients/${record.id}/chart`}>
                Strength and range chart
              </ButtonLink>
            ) : null}
            {actor.role === "therapist" || actor.role === "assistant" ? (
              <ButtonLink variant="quiet" href={`/clients/${record.id}/program`}>
                Home program
              </ButtonLink>
            ) : null}
            {canEdit ? <ButtonLink href={`/clients/${record.id}/edit`}>Edit record</ButtonLink> : null}
          </div>
        }
      />
      <div className="grid gap-6 md:grid-cols-[2fr_1fr]">
        <Card title="Referral">
          <p className="whitespace-pre-line">{record.diagnosisNote || "No reason for referral recorded."}</p>
          <dl className="mt-4 grid grid-cols-[10rem_1fr] gap-y-1 text-sm">
            <dt className="text-ink-soft">Referring physician</dt>
            <dd>{record.referringPhysician || "—"}</dd>
            <dt className="text-ink-soft">Primary therapist</dt>
            <dd>{therapist?.name ?? "Not assigned"}</dd>
            <dt className="text-ink-soft">E-mail</dt>
            <dd>{record.email ?? "—"}</dd>
            <dt className="text-ink-soft">Sign-in account</dt>
            <dd>{record.userId ? "Yes" : "Not yet"}</dd>
            <dt className="text-ink-soft">Payment</dt>
            <dd>{record.selfPay ? "Self-pay" : "Insurer or referrer"}</dd>
          </dl>
        </Card>
        <Card title="Precautions">
          {record.precautionFlags.length === 0 ? (
            <p className="text-sm text-ink-soft">None on file.</p>
          ) : (
            <ul className="space-y-2" data-testid="precautions">
              {record.precautionFlags.map((f) => (
                <li key={f}>
                  <Badge tone={FLAGS_BLOCKING_RESISTANCE.includes(f) ? "alert" : "caution"}>{PRECAUTION_LABELS[f]}</Badge>
                </li>
              ))}
            </ul>
          )}
          {record.noResistedUntil ? <p className="mt-3 text-sm font-medium text-flag-rose">No resisted testing before {record.noResistedUntil}.</p> : null}
          {record.precautionNote ? <p className="mt-3 whitespace-pre-line text-sm">{record.precautionNote}</p> : null}
          {resistanceBlocked ? (
            <p className="mt-3 text-xs text-ink-soft">
              Kinarc will not propose resisted grades while these apply. Follow the referring surgeon&apos;s protocol.
            </p>
          ) : null}
        </Card>
      </div>
      <SafetyNote compact />
    </div>
  );
}
