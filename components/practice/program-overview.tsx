import { Badge } from "@/components/ui/card";
import type { ProgramItemOverview } from "@/lib/practice/program";
import type { TrendVerdict } from "@/lib/practice/trend";

const STATUS_TONE = { active: "good", upcoming: "neutral", finished: "neutral", ended: "neutral" } as const;
const TREND_TONE: Record<TrendVerdict, "neutral" | "caution" | "alert" | "good"> = { too_few: "neutral", improving: "good", at_reference: "good", stalled: "caution", falling: "alert" };

/** How many past weeks of adherence the page shows; older weeks stay in the data. */
const WEEKS_SHOWN = 6;

function shortDate(iso: string): string {
  return new Date(`${iso}T00:00:00Z`).toLocaleDateString("en-GB", { day: "numeric", month: "short", timeZone: "UTC" });
}

/** One item's adherence (done vs due per week) and the trend of its session peaks, for the therapist. */
export function ProgramItemSummary({ view }: { view: ProgramItemOverview }) {
  const { item, trend } = view;
  const weeks = view.adherence.slice(-WEEKS_SHOWN);
  return (
    <div className="space-y-3" data-testid="program-item" data-item-id={item.id} data-motion={item.motion}>
      <div className="flex flex-wrap items-center gap-2">
        <h3 className="text-base font-semibold text-ink">{view.label}</h3>
        <Badge tone={STATUS_TONE[view.status]}>{view.status}</Badge>
        <span className="text-sm text-ink-soft">
          {item.condition === "against_gravity" ? "against gravity" : "gravity minimized"} · {item.repetitions} repetitions · {item.sessionsPerPeriod} per {item.period} ·{" "}
          {shortDate(item.startDate)} to {shortDate(item.endDate)}
        </span>
      </div>
      {item.notes ? <p className="text-sm text-ink-soft">{item.notes}</p> : null}
      {view.blockedReason ? (
        <p className="rounded-lg bg-flag-amberBg p-2 text-sm text-ink">Not offered to the client while the record&apos;s precautions stand: {view.blockedReason}</p>
      ) : null}
      <div className="grid gap-4 md:grid-cols-2">
        <div>
          <p className="text-sm font-medium text-ink">Adherence (sessions done / due)</p>
          {weeks.length ? (
            <table className="mt-1 text-sm" data-testid="adherence">
              <thead>
                <tr className="text-left text-ink-faint">
                  <th className="pr-4 font-normal">Week of</th>
                  <th className="font-normal">Done / due</th>
                </tr>
              </thead>
              <tbody>
                {weeks.map((w) => (
                  <tr key={w.weekStart} data-week={w.weekStart} data-done={w.done} data-due={w.due}>
                    <td className="pr-4">{shortDate(w.weekStart)}</td>
                    <td className={w.done < w.due ? "text-flag-amber" : "text-tide-700"}>
                      {w.done} / {w.due}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          ) : (
            <p className="text-sm text-ink-faint">Starts {shortDate(item.startDate)}.</p>
          )}
        </div>
        <div>
          <p className="text-sm font-medium text-ink">Best angle per session (practice; informs, never a grade)</p>
          {view.readings.length ? (
            <ol className="mt-1 flex flex-wrap gap-1 text-sm tabular-nums" data-testid="trend-readings">
              {view.readings.map((r) => (
                <li key={r.sessionId} className="rounded bg-sand-100 px-2" title={r.startedAt.toISOString()}>
                  {Math.round(r.bestDeg)}°
                </li>
              ))}
            </ol>
          ) : (
            <p className="text-sm text-ink-faint">No practice recorded yet.</p>
          )}
          <p className="mt-2 flex items-start gap-2 text-sm" data-testid="trend-note" data-verdict={trend.verdict}>
            <Badge tone={TREND_TONE[trend.verdict]}>{trend.verdict.replace("_", " ")}</Badge>
            <span className="text-ink-soft">{trend.message}</span>
          </p>
        </div>
      </div>
    </div>
  );
}
