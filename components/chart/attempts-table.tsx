"use client";

import { useQuery } from "@tanstack/react-query";
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import { useState } from "react";
import type { ChartRow } from "@/lib/chart/chart";
import { attemptsOptions, type AttemptPageJson } from "@/lib/chart/queries";
import { Badge } from "@/components/ui/card";
import { describeView } from "@/vision/view-policy";
import type { ValidationView } from "@/vision/uncertainty";

type AttemptJson = AttemptPageJson["rows"][number];
const col = createColumnHelper<AttemptJson>();
const deg = (v: number | null) => (v == null ? "—" : `${v.toFixed(1)}°`);
const FOREARM_WORDS: Record<string, string> = { pose: "the forearm seen by the camera", "neutral-reading": "a straight-wrist reading", "capture-start": "how the hand started" };
const SOURCE_WORDS: Record<string, string> = { self_check: "self-check", visit: "visit", practice: "practice", upload: "uploaded clip" };

const COLUMNS = [
  col.accessor("recordedAt", { header: "Recorded", cell: (c) => c.getValue().slice(0, 16).replace("T", " ") }),
  col.accessor("source", { header: "From", enableSorting: false, cell: (c) => SOURCE_WORDS[c.getValue()] ?? c.getValue() }),
  col.accessor("condition", {
    header: "Position",
    enableSorting: false,
    cell: (c) => (
      <>
        {c.getValue().replace("_", " ")}
        {c.row.original.oneFinger ? (
          <span title="the other fingers were held straight; a finger bent on its own is read far less truly, hence the wide ±">
            {" "}
            <Badge tone="alert">one finger on its own</Badge>
          </span>
        ) : null}
      </>
    ),
  }),
  col.accessor("peakDeg", { header: "Peak", cell: (c) => `${deg(c.getValue())}${c.row.original.uncertaintyDeg ? ` ±${c.row.original.uncertaintyDeg.toFixed(0)}°` : ""}` }),
  col.accessor("arcDeg", { header: "Arc", cell: (c) => deg(c.getValue()) }),
  col.accessor("planeVerified", {
    header: "Plane check",
    enableSorting: false,
    cell: (c) => (c.getValue() ? <Badge tone="good">verified</Badge> : <Badge tone="alert">{c.row.original.planeVerdict.replace("_", " ")}</Badge>),
  }),
  col.accessor("cameraView", {
    header: "Camera view",
    enableSorting: false,
    cell: (c) => {
      const view = c.getValue() as ValidationView | null;
      if (!view) return "—";
      const quality = c.row.original.viewQuality;
      const forearm = c.row.original.forearmSource;
      return (
        <span title={forearm ? `wrist measured against ${FOREARM_WORDS[forearm] ?? forearm}` : undefined}>
          {describeView(view)}
          {quality && quality !== "recommended" ? <Badge tone="alert">{quality === "poor" ? "poor view" : "usable view"}</Badge> : null}
        </span>
      );
    },
  }),
  col.display({
    id: "quality",
    header: "Tracking",
    cell: (c) => {
      const share = c.row.original.frames ? c.row.original.usableFrames / c.row.original.frames : 0;
      return <span title={c.row.original.warnings.join("; ")}>{Math.round(share * 100)}% of frames{share < 0.75 ? " (poor)" : ""}</span>;
    },
  }),
];

const SORTABLE: Record<string, string> = { recordedAt: "recordedAt", peakDeg: "peakDeg", arcDeg: "arcDeg" };

/** The attempts of one motion row: sorted, filtered and paged on the server. */
export function AttemptsTable({ clientId, row }: { clientId: string; row: ChartRow }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "recordedAt", desc: true }]);
  const [page, setPage] = useState(1);
  const [plane, setPlane] = useState<"" | "true" | "false">("");
  const params: Record<string, string> = {
    motion: row.motion,
    side: row.side,
    digit: row.digit ?? "none",
    sort: SORTABLE[sorting[0]?.id ?? "recordedAt"] ?? "recordedAt",
    dir: sorting[0]?.desc === false ? "asc" : "desc",
    page: String(page),
    pageSize: "10",
    ...(plane ? { planeVerified: plane } : {}),
  };
  const { data, error } = useQuery(attemptsOptions(clientId, params));
  const table = useReactTable({
    data: data?.rows ?? [],
    columns: COLUMNS,
    state: { sorting },
    manualSorting: true,
    manualPagination: true,
    manualFiltering: true,
    pageCount: data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1,
    onSortingChange: (updater) => {
      setSorting((old) => (typeof updater === "function" ? updater(old) : updater));
      setPage(1);
    },
    getCoreRowModel: getCoreRowModel(),
  });
  const pages = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <label>
          Plane check{" "}
          <select
            value={plane}
            onChange={(e) => {
              setPlane(e.target.value as typeof plane);
              setPage(1);
            }}
            className="rounded border border-sand-200 px-2 py-1"
          >
            <option value="">all</option>
            <option value="true">verified</option>
            <option value="false">not verified</option>
          </select>
        </label>
        <span className="text-ink-soft">{data ? `${data.total} attempt(s)` : "…"}</span>
      </div>
      {error ? <p role="alert" className="text-sm text-flag-rose">{error.message}</p> : null}
      <div className="overflow-x-auto">
        <table className="w-full text-sm" aria-label="Attempts">
          <thead>
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id} className="border-b border-sand-200 text-left text-xs text-ink-soft">
                {hg.headers.map((h) => (
                  <th key={h.id} className="px-2 py-1.5">
                    {h.column.getCanSort() ? (
                      <button type="button" onClick={h.column.getToggleSortingHandler()} className="font-semibold hover:text-tide-700">
                        {flexRender(h.column.columnDef.header, h.getContext())}
                        {{ asc: " ▲", desc: " ▼" }[h.column.getIsSorted() as string] ?? ""}
                      </button>
                    ) : (
                      flexRender(h.column.columnDef.header, h.getContext())
                    )}
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((r) => (
              <tr key={r.id} className="border-b border-sand-100">
                {r.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-2 py-1.5">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="flex items-center gap-2 text-sm">
        <button type="button" className="rounded px-2 py-1 ring-1 ring-sand-200 disabled:opacity-40" disabled={page <= 1} onClick={() => setPage((p) => p - 1)}>
          Previous
        </button>
        <span>
          Page {page} of {pages}
        </span>
        <button type="button" className="rounded px-2 py-1 ring-1 ring-sand-200 disabled:opacity-40" disabled={page >= pages} onClick={() => setPage((p) => p + 1)}>
          Next
        </button>
      </div>
    </div>
  );
}
