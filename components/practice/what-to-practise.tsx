import { getDb } from "@/db";
import { getClient } from "@/db/queries/clients";
import { getClinic } from "@/db/queries/clinics";
import { ButtonLink } from "@/components/ui/button";
import { Badge, Card } from "@/components/ui/card";
import type { Actor } from "@/lib/auth/guard";
import { clientPractice } from "@/lib/practice/program";
import type { CalendarWeek } from "@/lib/practice/schedule";

const WEEKDAY = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"];

/** The client's home card: today's practice with a way into the guided self-check, and a two-week calendar. */
export async function WhatToPractise({ actor }: { actor: Actor }) {
  if (!actor.clientId) return null;
  const db = getDb();
  const [client, clinic] = await Promise.all([getClient(db, actor.clinicId, actor.clientId), getClinic(db, actor.clinicId)]);
  if (!client) return null;
  const { today, items, calendar } = await clientPractice(db, client, { now: new Date(), timeZone: clinic?.timezone ?? "UTC" });
  const hasAny = items.length > 0 || calendar.some((w) => w.dueWeekly > 0 || w.days.some((d) => d.dueDaily > 0 || d.done > 0));
  return (
    <Card title="What to practise">
      {items.length ? (
        <ul className="space-y-3" data-testid="practice-today">
          {items.map(({ item, label, due, doneToday }) => (
            <li key={item.id} className="rounded-lg border border-sand-200 p-3" data-item-id={item.id} data-due={due ? "yes" : "no"}>
              <div className="flex flex-wrap items-center gap-2">
                <span className="font-medium text-ink">{label}</span>
                {due ? <Badge tone="caution">Due</Badge> : <Badge tone="good">Done for now</Badge>}
              </div>
              <p className="text-sm text-ink-soft">
                {item.repetitions} times, {item.sessionsPerPeriod} {item.sessionsPerPeriod === 1 ? "session" : "sessions"} a {item.period}
                {doneToday ? ` · ${doneToday} done today` : ""}
              </p>
              {item.notes ? <p className="mt-1 text-sm">{item.notes}</p> : null}
              <ButtonLink href={`/practice/check?item=${item.id}`} className="mt-2 w-full py-3 text-base sm:w-auto" variant={due ? "primary" : "quiet"} aria-label={`Practise ${label}`}>
                Practise now
              </ButtonLink>
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-sm text-ink-soft">{hasAny ? "Nothing to practise today." : "Your therapist has not set home exercises yet."}</p>
      )}
      {hasAny ? <PracticeCalendar weeks={calendar} today={today} /> : null}
      <p className="mt-3 text-xs text-ink-faint">Move only within comfort. Stop and tell your therapist if pain, swelling or numbness starts or gets worse.</p>
    </Card>
  );
}

function PracticeCalendar({ weeks, today }: { weeks: CalendarWeek[]; today: string }) {
  return (
    <div className="mt-4 space-y-3" data-testid="practice-calendar">
      {weeks.map((w, k) => (
        <div key={w.weekStart}>
          <p className="text-sm font-medium text-ink">
            {k === 0 ? "This week" : "Next week"}
            {w.dueWeekly ? (
              <span className="font-normal text-ink-soft" data-testid="weekly-count">
                {" "}
                · weekly exercises: {w.doneWeekly} of {w.dueWeekly} done
              </span>
            ) : null}
          </p>
          <ol className="mt-1 grid grid-cols-7 gap-1 text-center text-xs">
            {w.days.map((d, i) => {
              const met = d.dueDaily > 0 && d.done >= d.dueDaily;
              const missed = d.date < today && d.done < d.dueDaily;
              return (
                <li
                  key={d.date}
                  data-date={d.date}
                  data-done={d.done}
                  data-due={d.dueDaily}
                  className={`rounded-lg border p-1 ${d.date === today ? "border-tide-500" : "border-sand-200"} ${met ? "bg-tide-50" : missed ? "bg-flag-amberBg" : "bg-white"}`}
                >
                  <span className="block text-ink-faint">{WEEKDAY[i]}</span>
                  <span className="block font-medium text-ink">{Number(d.date.slice(8))}</span>
                  <span className="block text-ink-soft">{d.dueDaily || d.done ? `${d.done}/${d.dueDaily}` : "·"}</span>
                </li>
              );
            })}
          </ol>
        </div>
      ))}
      <p className="text-xs text-ink-faint">Each day shows sessions done / due. Weeks run Monday to Sunday.</p>
    </div>
  );
}
