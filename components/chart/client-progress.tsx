import { getDb } from "@/db";
import { Card } from "@/components/ui/card";
import { requireClientRecord, type Actor } from "@/lib/auth/guard";
import { cachedChart, clientProgress, clinicToday } from "@/lib/chart/chart";

/** The client's own progress in plain words: best angle so far and the therapist's signed grade, nothing else. */
export async function ClientProgressCard({ actor }: { actor: Actor }) {
  if (actor.role !== "client" || !actor.clientId) return null;
  const db = getDb();
  const record = await requireClientRecord(actor, actor.clientId, { db, purpose: "home.progress" });
  const progress = clientProgress(await cachedChart(db, record, { today: await clinicToday(db, actor.clinicId) }));
  const measured = progress.rows.filter((r) => r.bestPeakDeg !== null || r.grade !== null);
  return (
    <Card title="Your progress">
      {measured.length === 0 ? (
        <p className="text-sm text-ink-soft">No measurements yet. They appear here after your first check.</p>
      ) : (
        <ul className="space-y-2 text-sm" data-testid="client-progress">
          {measured.map((r) => (
            <li key={r.key}>
              <span className="font-medium">
                {r.label}, {r.side}
              </span>
              : {r.bestPeakDeg !== null ? `best ${Math.round(r.bestPeakDeg)}°` : "not measured on camera"}
              {r.latestAt ? ` (last checked ${r.latestAt.slice(0, 10)})` : ""}
              {r.grade ? ` · strength grade ${r.grade} from your therapist` : ""}
            </li>
          ))}
        </ul>
      )}
      <p className="mt-2 text-xs text-ink-faint">Camera angles are estimates and can differ by several degrees from a clinic measurement.</p>
    </Card>
  );
}
