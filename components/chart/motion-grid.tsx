"use client";

import type { ChartData, ChartRow } from "@/lib/chart/chart";
import { GRADE_METHOD_LABELS, REASON_LABELS } from "@/lib/chart/model";
import { Badge } from "@/components/ui/card";

const deg = (v: number | null) => (v == null ? "—" : `${Math.round(v)}°`);

function Cell({ row, selected, onSelect }: { row: ChartRow | undefined; selected: boolean; onSelect: () => void }) {
  if (!row) return <td className="px-2 py-1.5" />;
  const g = row.grade;
  const hasData = row.attempts > 0 || g || row.passiveRangeDeg != null;
  const pct = row.bestPeakDeg != null && row.reference ? Math.round((row.bestPeakDeg / row.reference.endRangeDeg) * 100) : null;
  return (
    <td className={`px-2 py-1.5 align-top ${selected ? "bg-tide-50" : ""}`} data-testid={`cell-${row.key}`}>
      <button type="button" onClick={onSelect} className="w-full text-left" aria-pressed={selected} aria-label={`${row.label}, ${row.side}`}>
        {hasData ? (
          <span className="block space-y-1">
            <span className="flex flex-wrap items-center gap-1">
              <span className="text-base font-semibold" data-testid={`grade-${row.key}`}>
                {g ? (g.value ?? "no movement") : "—"}
              </span>
              {g ? <span className="text-xs text-ink-soft">{GRADE_METHOD_LABELS[g.method]}</span> : null}
              {g?.status === "awaiting_cosign" ? <Badge tone="caution">awaiting co-signature</Badge> : null}
            </span>
            {g ? (
              <span className="block text-xs text-ink-faint">
                {g.recordedAt.slice(0, 10)} · {g.status === "signed" ? `signed by ${g.signedByName ?? "?"}` : `entered by ${g.recordedByName ?? "?"}`}
              </span>
            ) : null}
            <span className="block text-xs">
              peak {deg(row.bestPeakDeg)}
              {row.latestUncertaintyDeg ? ` ±${Math.round(row.latestUncertaintyDeg)}°` : ""} of {deg(row.reference?.endRangeDeg ?? null)}
              {pct != null ? ` (${pct}%)` : ""} · other side {deg(row.otherSideBestPeakDeg)}
            </span>
            {row.needs.length ? (
              <span className="flex flex-wrap gap-1" data-testid={`needs-${row.key}`}>
                {row.needs.map((n) => (
                  <Badge key={n.reason} tone={n.reason === "precaution" ? "alert" : "caution"}>
                    {REASON_LABELS[n.reason]}
                    {n.notBefore ? ` from ${n.notBefore}` : ""}
                  </Badge>
                ))}
              </span>
            ) : null}
          </span>
        ) : (
          <span className="text-xs text-ink-faint">not measured</span>
        )}
      </button>
    </td>
  );
}

/** Every motion, left and right side by side. */
export function MotionGrid({ chart, selected, onSelect }: { chart: ChartData; selected: string | null; onSelect: (key: string) => void }) {
  const byKey = new Map(chart.rows.map((r) => [r.key, r]));
  const lines: { label: string; left?: ChartRow; right?: ChartRow }[] = [];
  for (const r of chart.rows) {
    if (r.side !== "left") continue;
    lines.push({ label: r.label, left: r, right: byKey.get(r.key.replace("|left|", "|right|")) });
  }
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[44rem] text-sm" aria-label="Motions by side">
        <thead>
          <tr className="border-b border-sand-200 text-left text-xs uppercase tracking-wide text-ink-soft">
            <th className="px-2 py-2">Motion</th>
            <th className="px-2 py-2">Left</th>
            <th className="px-2 py-2">Right</th>
          </tr>
        </thead>
        <tbody>
          {lines.map((line) => (
            <tr key={line.label} className="border-b border-sand-100">
              <th scope="row" className="px-2 py-1.5 text-left align-top font-medium">
                {line.label}
              </th>
              <Cell row={line.left} selected={selected === line.left?.key} onSelect={() => line.left && onSelect(line.left.key)} />
              <Cell row={line.right} selected={selected === line.right?.key} onSelect={() => line.right && onSelect(line.right.key)} />
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
