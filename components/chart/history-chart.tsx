"use client";

import { useQuery } from "@tanstack/react-query";
import { CartesianGrid, Legend, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { ChartRow } from "@/lib/chart/chart";
import { seriesOptions } from "@/lib/chart/queries";

const day = (ms: number) => new Date(ms).toISOString().slice(0, 10);

/** Peak angle over time for one motion and side, with the reference end-range and the grades as marks. */
export function HistoryChart({ clientId, row }: { clientId: string; row: ChartRow }) {
  const { data, isPending, error } = useQuery(seriesOptions(clientId, row));
  if (isPending) return <p className="text-sm text-ink-soft">Loading the history…</p>;
  if (error) return <p role="alert" className="text-sm text-flag-rose">{error.message}</p>;
  const points = data.points.map((p) => ({
    t: Date.parse(p.recordedAt),
    verified: p.planeVerified ? p.peakDeg : null,
    unverified: p.planeVerified ? null : p.peakDeg,
  }));
  if (points.length === 0) return <p className="text-sm text-ink-soft">No attempts recorded for this motion yet.</p>;
  const grades = row.history.filter((g) => g.value !== null);
  return (
    <figure aria-label={`Peak angle over time, ${row.label}, ${row.side}`}>
      <div className="h-64 w-full">
        <ResponsiveContainer>
          <LineChart data={points} margin={{ top: 16, right: 16, bottom: 4, left: 0 }}>
            <CartesianGrid stroke="#e8e1d6" strokeDasharray="3 3" />
            <XAxis dataKey="t" type="number" scale="time" domain={["dataMin - 86400000", "dataMax + 86400000"]} tickFormatter={day} fontSize={11} />
            <YAxis unit="°" fontSize={11} domain={[0, (max: number) => Math.max(max, row.reference?.endRangeDeg ?? 0) + 10]} />
            <Tooltip labelFormatter={(v) => day(Number(v))} formatter={(v) => `${Math.round(Number(v))}°`} />
            <Legend />
            {row.reference ? <ReferenceLine y={row.reference.endRangeDeg} stroke="#1b6f67" strokeDasharray="4 4" label={{ value: "reference", fontSize: 10, position: "insideTopLeft" }} /> : null}
            {grades.map((g) => (
              <ReferenceLine key={g.id} x={Date.parse(g.recordedAt)} stroke={g.replacedById ? "#c9bfae" : "#b45309"} label={{ value: `grade ${g.value}`, fontSize: 10, position: "top" }} />
            ))}
            <Line name="peak, plane verified" dataKey="verified" stroke="#1b6f67" strokeWidth={2} dot connectNulls isAnimationActive={false} />
            <Line name="peak, plane not verified" dataKey="unverified" stroke="#b91c1c" strokeWidth={0} dot isAnimationActive={false} />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-ink-faint">
        Camera estimates; the dashed line is the reference end-range ({row.reference?.source ?? "none"}). Vertical marks are grades.
      </figcaption>
    </figure>
  );
}
