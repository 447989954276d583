import { headers } from "next/headers";
import { notFound, redirect } from "next/navigation";
import { getDb } from "@/db";
import { getClinic } from "@/db/queries/clinics";
import { EndProgramItemButton, ProgramItemForm } from "@/components/practice/program-item-form";
import { ProgramItemSummary } from "@/components/practice/program-overview";
import { SafetyNote } from "@/components/safety-note";
import { ButtonLink } from "@/components/ui/button";
import { Card, PageTitle } from "@/components/ui/card";
import { AccessError, currentActor, requestAddress, requireClientRecord } from "@/lib/auth/guard";
import { RANGE_TABLE_IDS, type RangeTableId } from "@/lib/motions/catalog";
import { PROGRAM_EDITORS } from "@/lib/practice/manage";
import { programOverview } from "@/lib/practice/program";
import { addDays, weekStartOf } from "@/lib/practice/schedule";
import { RECENT_SESSIONS, TYPICAL_ERROR_FLOOR_DEG } from "@/lib/practice/trend";
import { endProgramItemAction, saveProgramItemAction } from "./actions";

export const metadata = { title: "Home program" };

export default async function ProgramPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const actor = await currentActor();
  if (!actor) redirect("/sign-in");
  if (!(PROGRAM_EDITORS as readonly string[]).includes(actor.role)) notFound();
  const db = getDb();
  const client = await requireClientRecord(actor, id, { db, address: requestAddress(await headers()), purpose: "program" }).catch((error) => {
    if (error instanceof AccessError) notFound();
    throw error;
  });
  const clinic = await getClinic(db, client.clinicId);
  const rangeTable = (RANGE_TABLE_IDS as readonly string[]).includes(clinic?.normTable ?? "") ? (clinic!.normTable as RangeTableId) : "aaos1965";
  const { today, items } = await programOverview(db, client, { now: new Date(), timeZone: clinic?.timezone ?? "UTC", rangeTable });
  const current = items.filter((v) => v.status === "active" || v.status === "upcoming");
  const past = items.filter((v) => v.status === "ended" || v.status === "finished");
  return (
    <div className="space-y-6">
      <PageTitle
        title={`Home program: ${client.givenName} ${client.familyName}`}
        subtitle="Motions to practise between visits with the guided self-check. Practice readings inform; they never become grades."
        action={
          <ButtonLink variant="quiet" href={`/clients/${client.id}`}>
            Back to the record
          </ButtonLink>
        }
      />
      <SafetyNote compact />
      <Card title="Assign a motion">
        <ProgramItemForm
          action={saveProgramItemAction.bind(null, client.id, null)}
          initial={{ side: client.affectedSide === "left" ? "left" : "right", startDate: today, endDate: addDays(weekStartOf(today), 27) }}
          submitLabel="Assign"
          idPrefix="new-item"
        />
      </Card>
      <Card title="Current program">
        {current.length ? (
          <ul className="divide-y divide-sand-200">
            {current.map((v) => (
              <li key={v.item.id} className="space-y-3 py-4">
                <ProgramItemSummary view={v} />
                <div className="flex flex-wrap items-start gap-2">
                  <details className="flex-1">
                    <summary className="cursor-pointer text-sm text-tide-700">Edit</summary>
                    <div className="mt-3">
                      <ProgramItemForm action={saveProgramItemAction.bind(null, client.id, v.item.id)} initial={v.item} submitLabel="Save changes" idPrefix={`item-${v.item.id.slice(0, 8)}`} />
                    </div>
                  </details>
                  <EndProgramItemButton action={endProgramItemAction.bind(null, client.id, v.item.id)} label={v.label} />
                </div>
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-sm text-ink-soft">No motion is assigned for home practice.</p>
        )}
      </Card>
      {past.length ? (
        <Card title="Ended and finished">
          <ul className="divide-y divide-sand-200">
            {past.map((v) => (
              <li key={v.item.id} className="py-4">
                <ProgramItemSummary view={v} />
              </li>
            ))}
          </ul>
        </Card>
      ) : null}
      <p className="text-xs text-ink-faint">
        Trend note (Kinarc&apos;s own rule): with four or more sessions, the best of the last {RECENT_SESSIONS} is compared with the best before them. More than the
        typical error below it reads &quot;falling&quot;; not above it by more than the typical error reads &quot;stalled&quot;. The typical error is the larger of{" "}
        {TYPICAL_ERROR_FLOOR_DEG}° and the engine&apos;s stated ± for the readings. Weeks run Monday to Sunday in the clinic&apos;s time zone.
      </p>
    </div>
  );
}
