import { notFound } from "next/navigation";
import { getDb } from "@/db";
import { listStaff } from "@/db/queries/users";
import { InviteForm, StaffRowControls } from "@/components/team/team-forms";
import { Badge, Card, PageTitle } from "@/components/ui/card";
import { currentActor } from "@/lib/auth/guard";

export const metadata = { title: "Team" };

export default async function TeamPage() {
  const actor = await currentActor();
  if (!actor || actor.role !== "admin") notFound();
  const staff = await listStaff(getDb(), actor.clinicId);
  return (
    <div className="space-y-6">
      <PageTitle title="Team" subtitle="Invite colleagues, change what they can do, and close accounts of people who have left." />
      <Card title="Invite a colleague">
        <InviteForm />
      </Card>
      <Card title={`${staff.length} staff accounts`}>
        <ul className="divide-y divide-sand-100" data-testid="staff-list">
          {staff.map((s) => (
            <li key={s.id} className="flex flex-wrap items-center justify-between gap-3 py-3">
              <div>
                <p className="font-medium">
                  {s.name ?? s.email} {s.id === actor.userId ? <span className="text-sm text-ink-faint">(you)</span> : null}
                </p>
                <p className="text-sm text-ink-soft">{s.email}</p>
                <p className="mt-1 flex gap-1">
                  {!s.active ? <Badge tone="alert">Deactivated</Badge> : null}
                  {s.active && !s.hasPassword ? <Badge tone="caution">Invitation not accepted</Badge> : null}
                  {s.lastSignInAt ? <Badge>Last sign-in {s.lastSignInAt.toISOString().slice(0, 10)}</Badge> : null}
                </p>
              </div>
              <StaffRowControls userId={s.id} name={s.name ?? s.email} role={s.role} active={s.active} self={s.id === actor.userId} />
            </li>
          ))}
        </ul>
      </Card>
    </div>
  );
}
