import { notFound } from "next/navigation";
import { getDb } from "@/db";
import { getClient } from "@/db/queries/clients";
import { ConsentForm } from "@/components/visits/consent-form";
import { Card, PageTitle } from "@/components/ui/card";
import { currentActor } from "@/lib/auth/guard";
import { currentTelehealthConsent } from "@/lib/consent/store";
import { TELEHEALTH_CONSENT } from "@/lib/consent/telehealth";

export const metadata = { title: "Consent to video visits" };

export default async function ConsentPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  const actor = await currentActor();
  if (!actor || actor.role !== "client" || !actor.clientId) notFound();
  const { next } = await searchParams;
  const db = getDb();
  const [signed, client] = await Promise.all([currentTelehealthConsent(db, actor.clientId), getClient(db, actor.clinicId, actor.clientId)]);
  return (
    <div className="mx-auto max-w-xl">
      <PageTitle title={TELEHEALTH_CONSENT.title} subtitle={`Version ${TELEHEALTH_CONSENT.version}`} />
      <Card>
        <div className="space-y-3 text-base leading-relaxed">
          {TELEHEALTH_CONSENT.paragraphs.map((p) => (
            <p key={p}>{p}</p>
          ))}
        </div>
        <div className="mt-6 border-t border-sand-200 pt-6">
          {signed ? (
            <p role="status" className="text-tide-700">
              You agreed on {signed.signedAt.toISOString().slice(0, 10)} as {signed.signedName}.
            </p>
          ) : (
            <ConsentForm version={TELEHEALTH_CONSENT.version} next={next && next.startsWith("/") ? next : "/home"} fullName={client ? `${client.givenName} ${client.familyName}` : ""} />
          )}
        </div>
      </Card>
    </div>
  );
}
