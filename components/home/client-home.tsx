import { getDb } from "@/db";
import { getClient } from "@/db/queries/clients";
import { Card, PageTitle } from "@/components/ui/card";
import { SafetyNote } from "@/components/safety-note";
import type { Actor } from "@/lib/auth/guard";

/** The client's own page: plain words, large targets, works on a phone. */
export async function ClientHome({ actor }: { actor: Actor }) {
  const record = actor.clientId ? await getClient(getDb(), actor.clinicId, actor.clientId) : null;
  return (
    <div className="mx-auto max-w-xl space-y-6">
      <PageTitle title={`Hello, ${record?.givenName ?? actor.name}`} subtitle="Your hand therapy between and during visits." />
      <Card title="Your next visit">
        <p className="text-sm text-ink-soft" data-testid="next-visit">
          Nothing booked yet. Your clinic will e-mail you an invitation when a visit is scheduled.
        </p>
      </Card>
      <Card title="What to practise">
        <p className="text-sm text-ink-soft">Your therapist has not set home exercises yet.</p>
      </Card>
      <SafetyNote />
    </div>
  );
}
