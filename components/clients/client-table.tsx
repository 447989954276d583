"use client";

import { useQuery } from "@tanstack/react-query";
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import Link from "next/link";
import { useDeferredValue, useState } from "react";
import type { ClientListRow } from "@/db/queries/clients";
import { Badge } from "@/components/ui/card";
import { clientListOptions, type ClientListParams } from "@/lib/queries/clients";

const col = createColumnHelper<ClientListRow>();

function ageFrom(dob: string, now = new Date()): number {
  const d = new Date(`${dob}T00:00:00Z`);
  let age = now.getUTCFullYear() - d.getUTCFullYear();
  if (now.getUTCMonth() < d.getUTCMonth() || (now.getUTCMonth() === d.getUTCMonth() && now.getUTCDate() < d.getUTCDate())) age--;
  return age;
}

const columns = [
  col.accessor((r) => `${r.familyName}, ${r.givenName}`, {
    id: "name",
    header: "Client",
    cell: (info) => (
      <Link href={`/clients/${info.row.original.id}`} className="font-medium text-tide-700 hover:underline">
        {info.row.original.givenName} {info.row.original.familyName}
      </Link>
    ),
  }),
  col.accessor("dateOfBirth", { header: "Age", cell: (info) => ageFrom(info.getValue()) }),
  col.accessor("affectedSide", { header: "Side", enableSorting: false }),
  col.accessor("diagnosisNote", {
    header: "Reason for referral",
    enableSorting: false,
    cell: (info) => <span className="line-clamp-2 text-ink-soft">{info.getValue()}</span>,
  }),
  col.accessor("precautionFlags", {
    header: "Precautions",
    enableSorting: false,
    cell: (info) => {
      const r = info.row.original;
      if (!r.precautionFlags.length) return <span className="text-ink-faint">none</span>;
      return r.noResistedUntil ? <Badge tone="alert">No resistance until {r.noResistedUntil}</Badge> : <Badge tone="caution">{r.precautionFlags.length} on file</Badge>;
    },
  }),
  col.accessor("primaryTherapistName", { header: "Therapist", enableSorting: false, cell: (i) => i.getValue() ?? "—" }),
  col.accessor("updatedAt", { header: "Updated", cell: (i) => i.getValue().slice(0, 10) }),
];

/** The clinic's client list: server-side sorting, filtering and paging through GET /api/v1/clients. */
export function ClientTable() {
  const [q, setQ] = useState("");
  const [flagged, setFlagged] = useState<"" | "true" | "false">("");
  const [sorting, setSorting] = useState<SortingState>([{ id: "name", desc: false }]);
  const [page, setPage] = useState(1);
  const deferredQ = useDeferredValue(q);
  const pageSize = 20;
  const params: ClientListParams = {
    q: deferredQ.trim() || undefined,
    flagged: flagged || undefined,
    sort: (sorting[0]?.id as ClientListParams["sort"]) ?? "name",
    dir: sorting[0]?.desc ? "desc" : "asc",
    page,
    pageSize,
  };
  const { data, isPending, isError, error } = useQuery(clientListOptions(params));
  const table = useReactTable({
    data: data?.rows ?? [],
    columns,
    manualSorting: true,
    manualPagination: true,
    state: { sorting },
    onSortingChange: (s) => {
      setSorting(s);
      setPage(1);
    },
    getCoreRowModel: getCoreRowModel(),
  });
  const pages = data ? Math.max(1, Math.ceil(data.total / pageSize)) : 1;

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-3">
        <label className="text-sm">
          <span className="block font-medium">Search</span>
          <input
            type="search"
            value={q}
            onChange={(e) => {
              setQ(e.target.value);
              setPage(1);
            }}
            placeholder="Name or reason for referral"
            className="mt-1 w-72 rounded-lg border border-sand-200 bg-white px-3 py-2"
          />
        </label>
        <label className="text-sm">
          <span className="block font-medium">Precautions</span>
          <select
            value={flagged}
            onChange={(e) => {
              setFlagged(e.target.value as typeof flagged);
              setPage(1);
            }}
            className="mt-1 rounded-lg border border-sand-200 bg-white px-3 py-2"
          >
            <option value="">All clients</option>
            <option value="true">With precautions</option>
            <option value="false">Without precautions</option>
          </select>
        </label>
        <p className="ml-auto text-sm text-ink-soft" aria-live="polite">
          {data ? `${data.total} client${data.total === 1 ? "" : "s"}` : ""}
        </p>
      </div>
      {isError ? <p role="alert" className="text-flag-rose">{error.message}</p> : null}
      <div className="overflow-x-auto rounded-card border border-sand-200 bg-white">
        <table className="w-full text-left text-sm" data-testid="client-table">
          <thead className="bg-sand-100 text-xs uppercase tracking-wide text-ink-soft">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const sorted = h.column.getIsSorted();
                  return (
                    <th key={h.id} scope="col" className="px-3 py-2" aria-sort={sorted ? (sorted === "asc" ? "ascending" : "descending") : undefined}>
                      {h.column.getCanSort() ? (
                        <button type="button" onClick={h.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 uppercase">
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          <span aria-hidden>{sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}</span>
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-sand-100">
            {isPending ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-ink-soft">
                  Loading…
                </td>
              </tr>
            ) : table.getRowModel().rows.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-ink-soft">
                  No clients match.
                </td>
              </tr>
            ) : (
              table.getRowModel().rows.map((row) => (
                <tr key={row.id} className="hover:bg-sand-50">
                  {row.getVisibleCells().map((cell) => (
                    <td key={cell.id} className="px-3 py-2 align-top">
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  ))}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>
      <nav aria-label="Pages" className="flex items-center justify-end gap-2 text-sm">
        <button type="button" className="rounded-lg px-3 py-1.5 ring-1 ring-sand-200 disabled:opacity-40" disabled={page <= 1} onClick={() => setPage((p) => p - 1)}>
          Previous
        </button>
        <span>
          Page {page} of {pages}
        </span>
        <button type="button" className="rounded-lg px-3 py-1.5 ring-1 ring-sand-200 disabled:opacity-40" disabled={page >= pages} onClick={() => setPage((p) => p + 1)}>
          Next
        </button>
      </nav>
    </div>
  );
}
