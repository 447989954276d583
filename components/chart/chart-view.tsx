"use client";

import { useQuery } from "@tanstack/react-query";
import { useState } from "react";
import type { ChartData } from "@/lib/chart/chart";
import { chartOptions } from "@/lib/chart/queries";
import { Badge, Card } from "@/components/ui/card";
import { MotionGrid } from "./motion-grid";
import { RowDetail } from "./row-detail";
import { StrengthPanel } from "./strength-panel";

export function ChartView({ clientId, initial, role }: { clientId: string; initial: ChartData; role: string }) {
  const { data } = useQuery({ ...chartOptions(clientId), initialData: initial });
  const chart = data ?? initial;
  const flagged = chart.rows.filter((r) => r.needs.length > 0);
  const [selected, setSelected] = useState<string | null>(flagged[0]?.key ?? null);
  const row = chart.rows.find((r) => r.key === selected) ?? null;
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap gap-2 text-sm" data-testid="chart-summary">
        <Badge tone={flagged.length ? "caution" : "good"}>{flagged.length} motion(s) need an in-person test</Badge>
        {chart.awaitingCosign ? <Badge tone="caution">{chart.awaitingCosign} entr{chart.awaitingCosign === 1 ? "y" : "ies"} awaiting co-signature</Badge> : null}
        <Badge>scale: {chart.scale}</Badge>
        <Badge>reference table: {chart.rangeTable}</Badge>
      </div>
      {chart.precaution.active ? (
        <p role="note" className="rounded-card border border-flag-rose/30 bg-flag-roseBg p-3 text-sm text-flag-rose" data-testid="chart-precaution">
          {chart.precaution.detail}
        </p>
      ) : null}
      <Card title="Motions">
        <MotionGrid chart={chart} selected={selected} onSelect={setSelected} />
      </Card>
      {row ? <RowDetail key={row.key} clientId={clientId} chart={chart} row={row} role={role} /> : <p className="text-sm text-ink-soft">Choose a motion to see its history.</p>}
      <StrengthPanel clientId={clientId} chart={chart} />
    </div>
  );
}
