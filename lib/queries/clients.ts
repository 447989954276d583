import { keepPreviousData, queryOptions } from "@tanstack/react-query";
import type { ClientListPage } from "@/db/queries/clients";
import { fetchJson } from "./query-client";

export interface ClientListParams {
  q?: string;
  sort: "name" | "dateOfBirth" | "updatedAt" | "createdAt";
  dir: "asc" | "desc";
  page: number;
  pageSize: number;
  flagged?: "true" | "false";
  therapistId?: string;
}

export const clientKeys = {
  all: ["clients"] as const,
  list: (p: ClientListParams) => ["clients", "list", p] as const,
};

export function clientListOptions(p: ClientListParams) {
  const search = new URLSearchParams(
    Object.entries(p)
      .filter(([, v]) => v !== undefined && v !== "")
      .map(([k, v]) => [k, String(v)]),
  );
  return queryOptions({
    queryKey: clientKeys.list(p),
    queryFn: () => fetchJson<ClientListPage>(`/api/v1/clients?${search}`),
    placeholderData: keepPreviousData,
  });
}
