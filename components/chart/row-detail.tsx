"use client";

import { useState } from "react";
import type { ChartData, ChartGrade, ChartRow } from "@/lib/chart/chart";
import { GRADE_METHOD_LABELS, IN_PERSON_GRADES, REASON_LABELS } from "@/lib/chart/model";
import type { GradeScale } from "@/lib/grading/grade";
import { Button } from "@/components/ui/button";
import { Badge, Card } from "@/components/ui/card";
import { SelectField, TextField } from "@/components/ui/field";
import { AttemptsTable } from "./attempts-table";
import { HistoryChart } from "./history-chart";
import { useChartPost, type PostError } from "./use-chart-post";

function Problem({ error }: { error: PostError | null }) {
  if (!error) return null;
  const fields = Object.entries(error.fields ?? {});
  return (
    <div role="alert" className="rounded-lg bg-flag-roseBg px-3 py-2 text-sm text-flag-rose">
      <p>{error.message}</p>
      {fields.length ? (
        <ul className="list-disc pl-5">
          {fields.map(([k, v]) => (
            <li key={k}>
              {k}: {v}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

function rowBody(row: ChartRow) {
  return { motion: row.motion, side: row.side, digit: row.digit };
}

function GradeHistory({ clientId, row, role, onCorrect }: { clientId: string; row: ChartRow; role: string; onCorrect: (g: ChartGrade) => void }) {
  const cosign = useChartPost<unknown, { gradeId: string }>(clientId, (v) => `/api/v1/clients/${clientId}/grades/${v.gradeId}/cosign`);
  if (row.history.length === 0) return <p className="text-sm text-ink-soft">No grade recorded yet.</p>;
  return (
    <ol className="space-y-2" aria-label="Grade history">
      {row.history.map((g) => (
        <li key={g.id} className={`rounded-lg border border-sand-200 p-2 text-sm ${g.replacedById ? "opacity-60" : ""}`} data-testid={`grade-entry-${g.id}`}>
          <div className="flex flex-wrap items-center gap-2">
            <span className="text-base font-semibold">{g.value ?? "no movement seen"}</span>
            <span>{GRADE_METHOD_LABELS[g.method]}</span>
            {g.status === "signed" ? <Badge tone="good">signed</Badge> : <Badge tone="caution">awaiting co-signature</Badge>}
            {g.replacedById ? <Badge>corrected by a later entry</Badge> : null}
            {g.replacesId ? <Badge>correction</Badge> : null}
          </div>
          <p className="text-xs text-ink-soft">
            {g.recordedAt.slice(0, 16).replace("T", " ")} · entered by {g.recordedByName ?? "?"} ({g.recordedByRole})
            {g.signedAt ? ` · signed by ${g.signedByName ?? "?"} ${g.signedAt.slice(0, 10)}` : ""}
          </p>
          {g.note ? <p className="text-xs">{g.note}</p> : null}
          <div className="mt-1 flex gap-2">
            {g.status === "awaiting_cosign" && role === "therapist" && !g.replacedById ? (
              <Button
                type="button"
                variant="quiet"
                className="px-2 py-1 text-xs"
                disabled={cosign.isPending}
                onClick={() => cosign.mutate({ gradeId: g.id })}
              >
                Co-sign
              </Button>
            ) : null}
            {!g.replacedById ? (
              <Button type="button" variant="quiet" className="px-2 py-1 text-xs" onClick={() => onCorrect(g)}>
                Correct
              </Button>
            ) : null}
          </div>
        </li>
      ))}
      <Problem error={cosign.error} />
    </ol>
  );
}

function RemoteGradeForm({ clientId, row, role, replaces, onDone }: { clientId: string; row: ChartRow; role: string; replaces: ChartGrade | null; onDone: () => void }) {
  const post = useChartPost(clientId, `/api/v1/clients/${clientId}/grades`);
  if (!row.proposal) return <p className="text-sm text-ink-soft">No attempts to grade from.</p>;
  return (
    <div className="space-y-2 text-sm">
      <p>
        The engine&apos;s range-based grade from {row.attempts > 10 ? "the kept or latest 10" : "these"} attempts:{" "}
        <strong data-testid="proposal">{row.proposal.value ?? "no movement seen"}</strong>
        {row.proposal.ceiling ? " (the most a range-only check can give)" : ""}
      </p>
      <ul className="list-disc pl-5 text-xs text-ink-soft">
        {row.proposal.reasons.map((r) => (
          <li key={r}>{r}</li>
        ))}
      </ul>
      <Button
        type="button"
        disabled={post.isPending}
        onClick={() => post.mutate({ method: "remote_range", ...rowBody(row), replacesId: replaces?.method === "remote_range" ? replaces.id : null }, { onSuccess: onDone })}
      >
        {role === "therapist" ? "Sign the range-based grade" : "Enter for co-signature"}
        {replaces?.method === "remote_range" ? " as a correction" : ""}
      </Button>
      <Problem error={post.error} />
    </div>
  );
}

function InPersonForm({ clientId, row, chart, replaces, onDone }: { clientId: string; row: ChartRow; chart: ChartData; replaces: ChartGrade | null; onDone: () => void }) {
  const post = useChartPost(clientId, `/api/v1/clients/${clientId}/in-person`);
  const blocked = chart.precaution.active;
  const [method, setMethod] = useState<"in_person_resisted" | "in_person_palpation">(blocked ? "in_person_palpation" : "in_person_resisted");
  const grades = IN_PERSON_GRADES[chart.scale as GradeScale];
  const values = method === "in_person_resisted" ? grades.resisted : grades.palpation;
  const planned = chart.visits.find((v) => v.plannedKeys.includes(row.key));
  return (
    <form
      aria-label="Record an in-person grade"
      className="space-y-3"
      onSubmit={(e) => {
        e.preventDefault();
        const f = new FormData(e.currentTarget);
        post.mutate(
          {
            visitId: f.get("visitId") || null,
            grades: [{ method, ...rowBody(row), value: f.get("value"), note: f.get("note") ?? "", replacesId: replaces && replaces.method !== "remote_range" ? replaces.id : null }],
          },
          { onSuccess: onDone },
        );
      }}
    >
      {blocked ? (
        <p role="note" className="rounded-lg bg-flag-roseBg px-3 py-2 text-sm text-flag-rose" data-testid="resisted-blocked">
          {chart.precaution.detail}
        </p>
      ) : (
        <p role="note" className="rounded-lg bg-flag-amberBg px-3 py-2 text-xs text-ink">
          Before any resisted test: none with an unhealed fracture or dislocation or early after tendon, ligament or capsule repair; stop if pain, swelling, numbness or colour
          change increases; the referring surgeon&apos;s protocol and local licensed practice come first.
        </p>
      )}
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField
          label="Test"
          name="method"
          id={`method-${row.key}`}
          value={method}
          onChange={(e) => setMethod(e.target.value as typeof method)}
          options={[
            ...(blocked ? [] : [{ value: "in_person_resisted", label: "Resisted (manual resistance)" }]),
            { value: "in_person_palpation", label: "Palpation (no movement)" },
          ]}
        />
        <SelectField label="Grade" name="value" id={`value-${row.key}`} key={method} options={values.map((v) => ({ value: v, label: v }))} defaultValue={values.at(-2) ?? values[0]} />
      </div>
      {chart.visits.length ? (
        <SelectField
          label="In-person visit"
          name="visitId"
          id={`visit-${row.key}`}
          defaultValue={planned?.id ?? ""}
          options={[
            { value: "", label: "Not part of a scheduled visit" },
            ...chart.visits.map((v) => ({ value: v.id, label: `${v.startsAt.slice(0, 16).replace("T", " ")} UTC${v.location ? `, ${v.location}` : ""}` })),
          ]}
        />
      ) : null}
      <TextField label="Note (optional)" name="note" id={`note-${row.key}`} />
      <Button type="submit" disabled={post.isPending}>
        {replaces && replaces.method !== "remote_range" ? "Record the correction" : "Record the in-person grade"}
      </Button>
      <Problem error={post.error} />
    </form>
  );
}

function PassiveRangeForm({ clientId, row }: { clientId: string; row: ChartRow }) {
  const post = useChartPost(clientId, `/api/v1/clients/${clientId}/passive-ranges`);
  return (
    <form
      aria-label="Record a passive range"
      className="flex flex-wrap items-end gap-3"
      onSubmit={(e) => {
        e.preventDefault();
        const f = new FormData(e.currentTarget);
        post.mutate({ ...rowBody(row), valueDeg: f.get("valueDeg"), note: f.get("note") ?? "" }, { onSuccess: () => (e.target as HTMLFormElement).reset() });
      }}
    >
      <TextField label="Passive range (degrees, goniometer)" name="valueDeg" id={`prom-${row.key}`} type="number" min={1} max={180} step="0.5" required />
      <TextField label="Note" name="note" id={`prom-note-${row.key}`} />
      <Button type="submit" variant="quiet" disabled={post.isPending}>
        Save as reference
      </Button>
      <div className="w-full">
        <Problem error={post.error} />
      </div>
    </form>
  );
}

export function RowDetail({ clientId, chart, row, role }: { clientId: string; chart: ChartData; row: ChartRow; role: string }) {
  const [replaces, setReplaces] = useState<ChartGrade | null>(null);
  return (
    <div className="space-y-4" data-testid="row-detail">
      <h2 className="text-lg font-semibold">
        {row.label}, {row.side}
      </h2>
      {row.needs.length ? (
        <Card title="Still needs an in-person test">
          <ul className="space-y-1 text-sm">
            {row.needs.map((n) => (
              <li key={n.reason}>
                <Badge tone={n.reason === "precaution" ? "alert" : "caution"}>{REASON_LABELS[n.reason]}</Badge> {n.detail}
              </li>
            ))}
          </ul>
        </Card>
      ) : null}
      <Card title="Peak angle over time">
        <HistoryChart clientId={clientId} row={row} />
      </Card>
      <div className="grid gap-4 lg:grid-cols-2">
        <Card title="Grades">
          <GradeHistory clientId={clientId} row={row} role={role} onCorrect={setReplaces} />
        </Card>
        <div className="space-y-4">
          {replaces ? (
            <p role="status" className="rounded-lg bg-tide-50 px-3 py-2 text-sm">
              Correcting grade {replaces.value ?? "(none)"} from {replaces.recordedAt.slice(0, 10)}: the new entry will point to it and both stay visible.{" "}
              <button type="button" className="underline" onClick={() => setReplaces(null)}>
                Cancel
              </button>
            </p>
          ) : null}
          <Card title="Range-based grade (remote)">
            <RemoteGradeForm clientId={clientId} row={row} role={role} replaces={replaces} onDone={() => setReplaces(null)} />
          </Card>
          <Card title="In-person result">
            <InPersonForm clientId={clientId} row={row} chart={chart} replaces={replaces} onDone={() => setReplaces(null)} />
          </Card>
        </div>
      </div>
      <Card title="Passive range (reference for full range)">
        <p className="mb-2 text-sm text-ink-soft">
          Current reference: {row.reference ? `${row.reference.endRangeDeg}° (${row.reference.source})` : "none"}
        </p>
        <PassiveRangeForm clientId={clientId} row={row} />
      </Card>
      <Card title="Attempts">
        <AttemptsTable clientId={clientId} row={row} />
      </Card>
    </div>
  );
}
