import { getDb } from "@/db";
import { getClinic } from "@/db/queries/clinics";
import { listStaff } from "@/db/queries/users";
import { ButtonLink } from "@/components/ui/button";
import { Badge, Card, PageTitle } from "@/components/ui/card";
import type { Actor } from "@/lib/auth/guard";

export async function AdminHome({ actor }: { actor: Actor }) {
  const db = getDb();
  const [staff, clinic] = await Promise.all([listStaff(db, actor.clinicId), getClinic(db, actor.clinicId)]);
  const active = staff.filter((s) => s.active);
  const waiting = staff.filter((s) => s.active && !s.hasPassword);
  return (
    <div className="space-y-6">
      <PageTitle title={clinic?.name ?? "Your clinic"} subtitle="Staff accounts, clinic settings and the access trail." />
      <div className="grid gap-6 md:grid-cols-2">
        <Card title="Team" action={<ButtonLink href="/team" variant="quiet">Manage team</ButtonLink>}>
          <p className="text-3xl font-semibold">{active.length}</p>
          <p className="text-sm text-ink-soft">active staff accounts</p>
          {waiting.length ? (
            <p className="mt-3">
              <Badge tone="caution">{waiting.length} invitation(s) not yet accepted</Badge>
            </p>
          ) : null}
        </Card>
        <Card title="Clinic settings" action={<ButtonLink href="/clinic" variant="quiet">Edit settings</ButtonLink>}>
          <dl className="grid grid-cols-2 gap-y-1 text-sm">
            <dt className="text-ink-soft">Normal range table</dt>
            <dd>{clinic?.normTable}</dd>
            <dt className="text-ink-soft">Grading scale</dt>
            <dd>{clinic?.gradeScale}</dd>
            <dt className="text-ink-soft">“Full range” from</dt>
            <dd>{clinic?.fullRangePercent}% of reference</dd>
            <dt className="text-ink-soft">Time zone</dt>
            <dd>{clinic?.timezone}</dd>
          </dl>
        </Card>
      </div>
    </div>
  );
}
