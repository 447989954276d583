"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useState } from "react";
import type { QueueGroup } from "@/lib/chart/follow-ups";
import { REASON_LABELS } from "@/lib/chart/model";
import { chartKeys, queueOptions } from "@/lib/chart/queries";
import { fetchJson } from "@/lib/queries/query-client";
import { Button } from "@/components/ui/button";
import { Badge, Card } from "@/components/ui/card";
import { TextField } from "@/components/ui/field";

interface ScheduleError extends Error {
  fields?: Record<string, string>;
}

function nextDay(isoDay: string): string {
  return new Date(Date.parse(`${isoDay}T12:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
}

function ScheduleForm({ group, today, timezone, onClose }: { group: QueueGroup; today: string; timezone: string; onClose: () => void }) {
  const queryClient = useQueryClient();
  const open = group.items.filter((i) => !i.scheduledVisitId);
  const schedule = useMutation<{ id: string; invited: boolean; inviteProblem: string | null }, ScheduleError, unknown>({
    mutationFn: (body) => fetchJson("/api/v1/appointments", { method: "POST", body: JSON.stringify(body) }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: chartKeys.queue }),
  });
  const e = schedule.error?.fields ?? {};
  return (
    <form
      aria-label={`Schedule an in-person test for ${group.clientName}`}
      className="mt-3 space-y-3 rounded-lg border border-sand-200 p-3"
      onSubmit={(ev) => {
        ev.preventDefault();
        const f = new FormData(ev.currentTarget);
        const plannedTests = f
          .getAll("test")
          .map((k) => group.items.find((i) => i.key === k))
          .filter((i) => i !== undefined)
          .map((i) => ({ motion: i.motion, side: i.side, digit: i.digit }));
        schedule.mutate({
          clientId: group.clientId,
          startsAtLocal: f.get("startsAtLocal"),
          durationMin: f.get("durationMin"),
          location: f.get("location"),
          plannedTests,
        });
      }}
    >
      <fieldset>
        <legend className="text-sm font-medium">Motions to test</legend>
        {(open.length ? open : group.items).map((i) => (
          <label key={i.key} className="mr-4 inline-flex items-center gap-1 text-sm">
            <input type="checkbox" name="test" value={i.key} defaultChecked /> {i.label} ({i.side})
          </label>
        ))}
        {e.plannedTests ? <p role="alert" className="text-sm text-flag-rose">{e.plannedTests}</p> : null}
      </fieldset>
      <div className="grid gap-3 sm:grid-cols-3">
        <TextField
          label={`Date and time (${timezone})`}
          name="startsAtLocal"
          id={`starts-${group.clientId}`}
          type="datetime-local"
          defaultValue={`${group.earliestDate > today ? group.earliestDate : nextDay(today)}T10:00`}
          error={e.startsAtLocal ?? e.startsAt}
          hint={group.earliestDate > today ? `Resisted testing not before ${group.earliestDate}` : undefined}
        />
        <TextField label="Minutes" name="durationMin" id={`duration-${group.clientId}`} type="number" min={10} max={240} defaultValue="45" error={e.durationMin} />
        <TextField label="Place" name="location" id={`location-${group.clientId}`} defaultValue="Saltmarsh clinic, room 2" error={e.location} />
      </div>
      <div className="flex gap-2">
        <Button type="submit" disabled={schedule.isPending}>
          Schedule and send the invitation
        </Button>
        <Button type="button" variant="quiet" onClick={onClose}>
          Close
        </Button>
      </div>
      {schedule.isSuccess ? (
        <p role="status" className="text-sm text-tide-700">
          Scheduled. {schedule.data.invited ? "The invitation with a calendar file was e-mailed." : `No invitation sent: ${schedule.data.inviteProblem}.`}
        </p>
      ) : null}
      {schedule.error ? <p role="alert" className="text-sm text-flag-rose">{schedule.error.message}</p> : null}
    </form>
  );
}

export function FollowUpQueue({ initial, timezone }: { initial: { today: string; groups: QueueGroup[] }; timezone: string }) {
  const { data } = useQuery({ ...queueOptions(), initialData: initial });
  const [open, setOpen] = useState<string | null>(null);
  if (data.groups.length === 0) return <p className="text-sm text-ink-soft">No open in-person needs. Every motion graded so far is settled.</p>;
  return (
    <ol className="space-y-4" aria-label="Follow-up queue">
      {data.groups.map((g) => (
        <li key={g.clientId} data-testid={`queue-${g.clientId}`}>
          <Card
            title={
              <span>
                <Link href={`/clients/${g.clientId}/chart`} className="text-tide-700 hover:underline">
                  {g.clientName}
                </Link>{" "}
                <span className="text-sm font-normal text-ink-soft">affected side: {g.affectedSide}</span>
              </span>
            }
            action={
              <Button type="button" variant="quiet" onClick={() => setOpen(open === g.clientId ? null : g.clientId)}>
                Schedule in-person test
              </Button>
            }
          >
            <p className="mb-2 text-sm">
              {g.awaitingClearance ? (
                <Badge tone="alert">resisted testing waits for the surgeon&apos;s clearance</Badge>
              ) : g.earliestDate > data.today ? (
                <Badge tone="alert">earliest resisted test {g.earliestDate}</Badge>
              ) : (
                <Badge tone="good">can be tested now</Badge>
              )}
            </p>
            <ul className="space-y-1 text-sm">
              {g.items.map((i) => (
                <li key={i.key} className="flex flex-wrap items-center gap-1">
                  <span className="font-medium">
                    {i.label} ({i.side})
                  </span>
                  {i.needs.map((n) => (
                    <Badge key={n.reason} tone={n.reason === "precaution" ? "alert" : "caution"}>
                      {REASON_LABELS[n.reason]}
                    </Badge>
                  ))}
                  {i.scheduledVisitId ? <Badge tone="good">scheduled</Badge> : null}
                </li>
              ))}
            </ul>
            {g.upcoming.length ? (
              <ul className="mt-2 text-sm text-ink-soft" data-testid="upcoming">
                {g.upcoming.map((u) => (
                  <li key={u.id}>
                    In person {u.when}
                    {u.location ? `, ${u.location}` : ""} · {u.plannedTests} test(s)
                  </li>
                ))}
              </ul>
            ) : null}
            {open === g.clientId ? <ScheduleForm group={g} today={data.today} timezone={timezone} onClose={() => setOpen(null)} /> : null}
          </Card>
        </li>
      ))}
    </ol>
  );
}
