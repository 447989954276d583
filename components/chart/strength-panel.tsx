"use client";

import type { ChartData } from "@/lib/chart/chart";
import { KG_PER_LB, MATHIOWETZ_1985, STRENGTH_TEST_LABELS } from "@/lib/norms/grip-pinch";
import { STRENGTH_TESTS } from "@/db/schema";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { SelectField, TextField } from "@/components/ui/field";
import { useChartPost } from "./use-chart-post";

/** Grip and pinch readings against age- and sex-matched norms, and entry of new readings. */
export function StrengthPanel({ clientId, chart }: { clientId: string; chart: ChartData }) {
  const post = useChartPost<unknown, unknown>(clientId, `/api/v1/clients/${clientId}/in-person`);
  return (
    <Card title="Grip and pinch">
      {chart.strength.length === 0 ? <p className="text-sm text-ink-soft">No readings yet.</p> : null}
      <ul className="mb-4 space-y-1 text-sm" data-testid="strength-readings">
        {chart.strength.map((s) => (
          <li key={s.id}>
            <strong>{STRENGTH_TEST_LABELS[s.test]}</strong>, {s.side}: {s.meanKg.toFixed(1)} kg ({(s.meanKg / KG_PER_LB).toFixed(1)} lb) on {s.recordedAt.slice(0, 10)} ·{" "}
            {s.comparison ? (
              <span>
                {Math.round(s.comparison.percentOfNorm)}% of the norm {s.comparison.norm.meanLb} ± {s.comparison.norm.sdLb} lb for {s.comparison.norm.group}
              </span>
            ) : (
              <span className="text-ink-soft">no published norm in Kinarc&apos;s table for this age, sex and test</span>
            )}
          </li>
        ))}
      </ul>
      <form
        aria-label="Record a grip or pinch reading"
        className="grid gap-3 sm:grid-cols-5"
        onSubmit={(e) => {
          e.preventDefault();
          const f = new FormData(e.currentTarget);
          const trials = ["t1", "t2", "t3"].map((k) => String(f.get(k) ?? "").trim()).filter(Boolean);
          post.mutate({ strength: [{ test: f.get("test"), side: f.get("side"), unit: f.get("unit"), trials, handlePosition: f.get("test") === "grip" ? 2 : null }] });
        }}
      >
        <SelectField label="Test" name="test" id="strength-test" options={STRENGTH_TESTS.map((t) => ({ value: t, label: STRENGTH_TEST_LABELS[t] }))} />
        <SelectField label="Hand" name="side" id="strength-side" options={[{ value: "right", label: "Right" }, { value: "left", label: "Left" }]} />
        <SelectField label="Unit" name="unit" id="strength-unit" options={[{ value: "kg", label: "kg" }, { value: "lb", label: "lb" }]} />
        <div className="grid grid-cols-3 gap-1 sm:col-span-2">
          <TextField label="Trial 1" name="t1" id="strength-t1" type="number" step="0.1" min={0} required />
          <TextField label="Trial 2" name="t2" id="strength-t2" type="number" step="0.1" min={0} />
          <TextField label="Trial 3" name="t3" id="strength-t3" type="number" step="0.1" min={0} />
        </div>
        <div className="sm:col-span-5">
          <Button type="submit" variant="quiet" disabled={post.isPending}>
            Save reading
          </Button>
          {post.error ? (
            <p role="alert" className="mt-2 text-sm text-flag-rose">
              {post.error.message}
            </p>
          ) : null}
        </div>
      </form>
      <p className="mt-3 text-xs text-ink-faint">
        Norms: {MATHIOWETZ_1985}; dynamometer at handle position 2, mean of three trials, seated, elbow at 90°, forearm neutral. Stop if pain comes on.
      </p>
    </Card>
  );
}
