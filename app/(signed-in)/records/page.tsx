import { notFound } from "next/navigation";
import { getDb } from "@/db";
import { listClients } from "@/db/queries/clients";
import { ErasureForm } from "@/components/records/erasure-form";
import { Card, PageTitle } from "@/components/ui/card";
import { currentActor } from "@/lib/auth/guard";
import { ERASURE_RULE } from "@/lib/export/erase";
import { todayIso } from "@/lib/validation/common";

export const metadata = { title: "Export and erasure" };

/** The admin's page for a client's request to see or erase what the clinic holds. */
export default async function RecordsPage() {
  const actor = await currentActor();
  if (!actor || actor.role !== "admin") notFound();
  const page = await listClients(getDb(), actor.clinicId, { sort: "name", dir: "asc", page: 1, pageSize: 100 });
  return (
    <>
      <PageTitle title="Export and erasure" subtitle="For a client's request to receive, or to erase, what the clinic holds about them. Both are recorded in the access trail." />
      <div className="grid gap-6 lg:grid-cols-2">
        <Card title="Export everything about a client">
          <p className="mb-3 text-sm text-ink-soft">A zip of JSON (every record that names the client) and the files they sent, with each file&apos;s SHA-256.</p>
          <ul className="divide-y divide-sand-100 text-sm" data-testid="export-list">
            {page.rows.map((c) => (
              <li key={c.id} className="flex items-center justify-between py-2">
                <span>
                  {c.familyName}, {c.givenName}
                </span>
                <a className="text-tide-700 underline" href={`/api/v1/clients/${c.id}/export`}>
                  Download export
                </a>
              </li>
            ))}
          </ul>
        </Card>
        <Card title="Erase on request">
          <p className="mb-3 text-sm">{ERASURE_RULE}</p>
          <p className="mb-4 text-xs text-ink-faint">
            Why some things stay: health-record law obliges the clinic to keep the clinical record for a set period, and tax law the payment records; erasure law allows for both. If your records policy needs an identifiable copy, download the export first. This cannot be undone.
          </p>
          <ErasureForm clients={page.rows.filter((c) => c.givenName !== "Erased").map((c) => ({ value: c.id, label: `${c.familyName}, ${c.givenName}` }))} today={todayIso()} />
        </Card>
      </div>
    </>
  );
}
