import { keepPreviousData, queryOptions } from "@tanstack/react-query";
import type { AttemptListPage } from "@/db/queries/attempts";
import { fetchJson } from "@/lib/queries/query-client";
import type { ChartData } from "./chart";
import type { QueueGroup } from "./follow-ups";

export const chartKeys = {
  all: (clientId: string) => ["chart", clientId] as const,
  chart: (clientId: string) => ["chart", clientId, "summary"] as const,
  series: (clientId: string, rowKey: string) => ["chart", clientId, "series", rowKey] as const,
  attempts: (clientId: string, params: Record<string, string>) => ["chart", clientId, "attempts", params] as const,
  queue: ["follow-ups"] as const,
};

export function chartOptions(clientId: string) {
  return queryOptions({ queryKey: chartKeys.chart(clientId), queryFn: () => fetchJson<ChartData>(`/api/v1/clients/${clientId}/chart?rows=all`) });
}

export interface SeriesPoint {
  id: string;
  recordedAt: string;
  peakDeg: number | null;
  arcDeg: number | null;
  uncertaintyDeg: number | null;
  condition: string;
  planeVerified: boolean;
}

export function seriesOptions(clientId: string, row: { key: string; motion: string; side: string; digit: string | null }) {
  const search = new URLSearchParams({ series: "1", motion: row.motion, side: row.side, digit: row.digit ?? "none" });
  return queryOptions({
    queryKey: chartKeys.series(clientId, row.key),
    queryFn: () => fetchJson<{ points: SeriesPoint[] }>(`/api/v1/clients/${clientId}/attempts?${search}`),
  });
}

export type AttemptPageJson = Omit<AttemptListPage, "rows"> & { rows: (Omit<AttemptListPage["rows"][number], "recordedAt" | "keptAt"> & { recordedAt: string; keptAt: string | null })[] };

export function attemptsOptions(clientId: string, params: Record<string, string>) {
  return queryOptions({
    queryKey: chartKeys.attempts(clientId, params),
    queryFn: () => fetchJson<AttemptPageJson>(`/api/v1/clients/${clientId}/attempts?${new URLSearchParams(params)}`),
    placeholderData: keepPreviousData,
  });
}

export function queueOptions() {
  return queryOptions({ queryKey: chartKeys.queue, queryFn: () => fetchJson<{ today: string; groups: QueueGroup[] }>("/api/v1/follow-ups") });
}
