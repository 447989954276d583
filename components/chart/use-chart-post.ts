"use client";

import { useMutation, useQueryClient } from "@tanstack/react-query";
import { chartKeys } from "@/lib/chart/queries";
import { fetchJson } from "@/lib/queries/query-client";

export interface PostError extends Error {
  fields?: Record<string, string>;
}

/** POSTs JSON to a chart endpoint and refreshes everything cached for the client (chart, series, attempts, queue). */
export function useChartPost<T = unknown, V = unknown>(clientId: string, url: string | ((vars: V) => string)) {
  const queryClient = useQueryClient();
  return useMutation<T, PostError, V>({
    mutationFn: (body) => fetchJson<T>(typeof url === "function" ? url(body) : url, { method: "POST", body: JSON.stringify(body) }),
    onSuccess: async () => {
      await Promise.all([queryClient.invalidateQueries({ queryKey: chartKeys.all(clientId) }), queryClient.invalidateQueries({ queryKey: chartKeys.queue })]);
    },
  });
}
