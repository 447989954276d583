import { redirect } from "next/navigation";
import { Badge, Card, PageTitle } from "@/components/ui/card";
import { accuracyRows, accuracySource, CONDITION_WORDS, type AccuracyRow, type Interval } from "@/lib/accuracy/spec";
import { currentActor } from "@/lib/auth/guard";

export const metadata = { title: "Measurement accuracy" };

/** Past this half-width (degrees) a reading is a rough guide only; our threshold, not a published one. */
const WIDE_DEG = 15;

function pm(deg: number | null): string {
  return deg === null ? "—" : `± ${deg % 1 ? deg.toFixed(1) : deg.toFixed(0)}°`;
}

function IntervalCell({ value, testId }: { value: Interval | null; testId: string }) {
  if (!value) return <td className="px-2 py-2 text-ink-soft">not measured</td>;
  return (
    <td className="whitespace-nowrap px-2 py-2 tabular-nums" data-testid={testId} data-frame={value.frameDeg ?? ""} data-peak={value.peakDeg ?? ""}>
      <span className="font-medium text-ink">{pm(value.frameDeg)}</span>
      <span className="text-ink-soft"> · peak {pm(value.peakDeg)}</span>
    </td>
  );
}

function Notes({ row }: { row: AccuracyRow }) {
  const best = Math.min(row.lite.frameDeg ?? Infinity, row.both?.frameDeg ?? Infinity);
  return (
    <td className="px-2 py-2 text-xs text-ink-soft">
      {best > WIDE_DEG ? (
        <p>
          <Badge tone="caution">wide</Badge> A rough guide only: confirm with a goniometer in person before it decides a grade.
        </p>
      ) : null}
      {row.byFinger.length ? <p>Per finger: {row.byFinger.map((f) => `${f.digit} ${pm(f.frameDeg)}`).join(", ")}.</p> : null}
      {row.fingerAloneDeg !== null ? (
        <p data-testid="accuracy-one-finger">
          One finger moving alone: {pm(row.fingerAloneDeg)}
          {row.fingerAloneByFinger.length ? `; measured on its own from this side: ${row.fingerAloneByFinger.map((f) => `${f.digit} ${pm(f.frameDeg)}`).join(", ")}` : ""}.
        </p>
      ) : null}
      {row.otherwiseDeg !== null ? (
        <p>Read against the straight-wrist reading taken first. Without one, or with the forearm line taken from the upper body: {pm(row.otherwiseDeg)}.</p>
      ) : null}
    </td>
  );
}

export default async function AccuracyPage() {
  const actor = await currentActor();
  if (!actor) redirect("/sign-in");
  if (actor.role === "client") redirect("/home");
  const rows = accuracyRows();
  const source = accuracySource();
  return (
    <div className="space-y-6">
      <PageTitle
        title="Measurement accuracy"
        subtitle="How closely Kinarc's camera angles match the true joint angle, for each motion and test position, in the camera view the set-up check asks for."
      />
      <Card title="What the ± means">
        <div className="space-y-2 text-sm text-ink">
          <p>
            Each figure is a 90% interval: in Kinarc&apos;s validation, nine readings in ten fell within it. It comes from
            rendered hands whose joint angles are known exactly, filmed in motion and never used to tune the engine. A
            reading made with the hand partly hidden, in a poorer view or with lower tracking confidence carries a wider
            interval, and every attempt shows its own.
          </p>
          <p data-testid="accuracy-builds">
            The rendered hands vary in skin tone, light, background and camera distance. In a separate check each hand
            was also built its own way (palm and finger lengths up to 12% either side, thicker and thinner fingers): in
            the recommended views the intervals still held for at least 94% of moments and 88% of end-of-range readings.
          </p>
          <p>
            <strong>Frame</strong> is one moment&apos;s angle, as on the live overlay. <strong>Peak</strong> is a
            repetition&apos;s end of range, the figure a range-based grade is read from. Where an interval straddles a
            grade&apos;s threshold, the grade is marked uncertain.
          </p>
          <p>
            <strong>Lite model</strong> reads every live frame. <strong>Both models</strong> adds the larger hand model on
            the same picture; Kinarc does this for finger flexion where the device keeps up, and says so on the attempt.
          </p>
        </div>
      </Card>
      <Card title="By motion">
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm" data-testid="accuracy-table">
            <thead>
              <tr className="border-b border-sand-200 text-xs uppercase tracking-wide text-ink-soft">
                <th className="px-2 py-2">Motion</th>
                <th className="px-2 py-2">Position</th>
                <th className="px-2 py-2">Camera view</th>
                <th className="px-2 py-2">Lite model</th>
                <th className="px-2 py-2">Both models</th>
                <th className="px-2 py-2">Notes</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => {
                const key = `${r.motion}-${r.condition}-${r.digit ?? "fingers"}`;
                return (
                  <tr key={key} className="border-b border-sand-100 align-top" data-testid="accuracy-row" data-motion={r.motion} data-condition={r.condition} data-digit={r.digit ?? "fingers"}>
                    <td className="px-2 py-2 font-medium text-ink">
                      {r.label}
                      {r.digit === "thumb" && !/thumb/i.test(r.label) ? ", thumb" : ""}
                    </td>
                    <td className="px-2 py-2">{CONDITION_WORDS[r.condition]}</td>
                    <td className="px-2 py-2">
                      {r.viewLabel}
                      {r.framing ? (
                        <span className="block text-xs text-ink-soft" data-testid="accuracy-framing">
                          hand filling {Math.round(r.framing.min * 100)}-{Math.round(r.framing.max * 100)}% of the picture
                        </span>
                      ) : null}
                    </td>
                    <IntervalCell value={r.lite} testId="accuracy-lite" />
                    <IntervalCell value={r.both} testId="accuracy-both" />
                    <Notes row={r} />
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      </Card>
      <Card title="Limits to keep in mind">
        <ul className="list-disc space-y-1 pl-5 text-sm text-ink">
          <li>Finger figures are for the four fingers moving together, as the self-check asks. A finger moving alone, with its neighbours still, reads far less truly.</li>
          <li>Most people bend the fingertip joint along with the middle joint. The middle joint (PIP) is read by a fit trained on both ways of bending, so it reads within about 4-7 degrees either way; a middle joint bent with the fingertip held straight reads a little less bend than it has at the end of its range, and the PIP interval above holds for both.</li>
          <li>From the thumb side (finger motions with gravity minimized) the index finger hides the others: the ring and little fingers read least truly. There the set-up check asks for the hand to fill 40-60% of the picture: in validation a hand much closer to the camera was often lost, and one much farther read the fingertip joints less truly; an uploaded clip framed otherwise says so. A hand seen edge-on can be hard to find at first; when it is not found, the set-up check asks to show the palm to the camera for a moment and then turn back.</li>
          <li>The figures above are for the test motions. A whole hand seen from the side in a shape those motions do not reach, such as a full fist, is read by a separate fit made for whole-hand shapes; its readings carry that fit&apos;s own, wider interval (about ± 8-15 degrees at MCP and PIP from the little-finger side, ± 30-40 degrees at PIP from the thumb side).</li>
          <li>A wrist read without its straight-wrist reading (the hand was not found while held straight) carries a much wider interval, and the attempt says so.</li>
          <li>Views from the palm, the back or above are far less accurate for flexion; such attempts are marked as taken in a poor view. Seen from the palm, a finger bends toward the camera: the hand model draws it nearer to straight than it is, and a bend of up to about 20 degrees barely changes the picture at all.</li>
          <li>Grades above 3, and 0 versus 1, need a resisted or palpation test in person. Do not test against resistance with an unhealed fracture or early after a tendon repair; stop on pain, swelling or numbness, and follow the referring surgeon&apos;s protocol.</li>
        </ul>
      </Card>
      <p className="text-xs text-ink-soft" data-testid="accuracy-source">
        Figures: {source.uncertainty}, angle correction {source.correction}. Kinarc supports a licensed therapist&apos;s judgement; it does not diagnose.
      </p>
    </div>
  );
}
