import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { getDb } from "@/db";
import { listAuditEvents, listAuditPeople } from "@/db/queries/audit";
import { listClients } from "@/db/queries/clients";
import { Card, PageTitle } from "@/components/ui/card";
import { currentActor } from "@/lib/auth/guard";
import { isoDate } from "@/lib/validation/common";

export const metadata = { title: "Access trail" };

const filterSchema = z.object({
  person: z.uuid().optional().catch(undefined),
  client: z.uuid().optional().catch(undefined),
  action: z.string().max(40).optional().catch(undefined),
  from: isoDate.optional().catch(undefined),
  to: isoDate.optional().catch(undefined),
  page: z.coerce.number().int().min(1).default(1).catch(1),
});

const PAGE_SIZE = 50;

/** The admin's read-only view of sign-ins and every access to client records. */
export default async function AuditPage({ searchParams }: { searchParams: Promise<Record<string, string>> }) {
  const actor = await currentActor();
  if (!actor || actor.role !== "admin") notFound();
  const f = filterSchema.parse(await searchParams);
  const db = getDb();
  const [events, people, clientPage] = await Promise.all([
    listAuditEvents(db, actor.clinicId, { actorUserId: f.person, clientId: f.client, action: f.action, from: f.from, to: f.to, page: f.page, pageSize: PAGE_SIZE }),
    listAuditPeople(db, actor.clinicId),
    listClients(db, actor.clinicId, { sort: "name", dir: "asc", page: 1, pageSize: 100 }),
  ]);
  const more = events.length > PAGE_SIZE;
  const link = (page: number) => `/audit?${new URLSearchParams(Object.entries({ ...f, page: String(page) }).filter(([, v]) => v !== undefined) as [string, string][])}`;
  return (
    <>
      <PageTitle title="Access trail" subtitle="Sign-ins and every time a client record was opened or changed, newest first." />
      <Card className="mb-6">
        <form className="grid gap-3 md:grid-cols-6 md:items-end" method="get">
          <label className="text-sm">
            Person
            <select name="person" defaultValue={f.person ?? ""} className="mt-1 block w-full rounded-lg border border-sand-200 px-2 py-2">
              <option value="">Anyone</option>
              {people.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name ?? s.email}
                  {s.role === "client" ? " (client)" : ""}
                </option>
              ))}
            </select>
          </label>
          <label className="text-sm">
            Client
            <select name="client" defaultValue={f.client ?? ""} className="mt-1 block w-full rounded-lg border border-sand-200 px-2 py-2">
              <option value="">Any client</option>
              {clientPage.rows.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.familyName}, {c.givenName}
                </option>
              ))}
            </select>
          </label>
          <label className="text-sm">
            Action
            <select name="action" defaultValue={f.action ?? ""} className="mt-1 block w-full rounded-lg border border-sand-200 px-2 py-2">
              <option value="">Any</option>
              <option value="auth.">Sign-ins</option>
              <option value="client.read">Record opened</option>
              <option value="client.">Any record access</option>
              <option value="staff.">Team changes</option>
              <option value="clinic.">Clinic settings</option>
              <option value="auth.idle_sign_out">Signed out for inactivity</option>
              <option value="upload.">Clips and documents</option>
              <option value="payment.">Payments</option>
              <option value="billing.">Prices</option>
              <option value="client.export">Exports</option>
              <option value="client.erase">Erasures</option>
            </select>
          </label>
          <label className="text-sm">
            From
            <input type="date" name="from" defaultValue={f.from} className="mt-1 block w-full rounded-lg border border-sand-200 px-2 py-2" />
          </label>
          <label className="text-sm">
            To
            <input type="date" name="to" defaultValue={f.to} className="mt-1 block w-full rounded-lg border border-sand-200 px-2 py-2" />
          </label>
          <button type="submit" className="rounded-lg bg-tide-600 px-4 py-2 text-sm font-semibold text-white">
            Filter
          </button>
        </form>
      </Card>
      <div className="overflow-x-auto rounded-card border border-sand-200 bg-white">
        <table className="w-full text-left text-sm" data-testid="audit-table">
          <thead className="bg-sand-100 text-xs uppercase tracking-wide text-ink-soft">
            <tr>
              <th className="px-3 py-2">When (UTC)</th>
              <th className="px-3 py-2">Who</th>
              <th className="px-3 py-2">What</th>
              <th className="px-3 py-2">Client</th>
              <th className="px-3 py-2">From</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-sand-100">
            {events.slice(0, PAGE_SIZE).map((e) => (
              <tr key={e.id}>
                <td className="px-3 py-2 whitespace-nowrap">{e.at.toISOString().replace("T", " ").slice(0, 19)}</td>
                <td className="px-3 py-2">
                  {e.actorName ?? "—"} <span className="text-ink-faint">{e.actorRole ?? ""}</span>
                </td>
                <td className="px-3 py-2 font-mono text-xs">{e.action}</td>
                <td className="px-3 py-2">{e.clientFamily ? `${e.clientGiven} ${e.clientFamily}` : "—"}</td>
                <td className="px-3 py-2 text-ink-faint">{e.address ?? "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <nav className="mt-3 flex justify-end gap-3 text-sm" aria-label="Pages">
        {f.page > 1 ? <Link href={link(f.page - 1)}>Newer</Link> : null}
        {more ? <Link href={link(f.page + 1)}>Older</Link> : null}
      </nav>
    </>
  );
}
