import { headers } from "next/headers";
import { notFound, redirect } from "next/navigation";
import { getDb } from "@/db";
import { PrintButton } from "@/components/chart/print-button";
import { currentActor, requestAddress, requireClientRecord, AccessError } from "@/lib/auth/guard";
import { CHART_STAFF } from "@/lib/chart/access";
import { clinicToday } from "@/lib/chart/chart";
import { buildReport } from "@/lib/reports/summary";

export const metadata = { title: "Evaluation summary" };

/** Print-ready: the app's chrome is hidden when printing (print:hidden), the page is plain black on white. */
export default async function ReportPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const actor = await currentActor();
  if (!actor) redirect("/sign-in");
  if (!(CHART_STAFF as readonly string[]).includes(actor.role)) notFound();
  const db = getDb();
  const record = await requireClientRecord(actor, id, { db, address: requestAddress(await headers()), purpose: "page.report" }).catch((error) => {
    if (error instanceof AccessError) notFound();
    throw error;
  });
  const report = await buildReport(db, record, await clinicToday(db, actor.clinicId));
  return (
    <article className="mx-auto max-w-4xl space-y-5 bg-white p-6 text-sm text-black print:p-0">
      <div className="flex flex-wrap gap-2 print:hidden">
        <a href={`/api/v1/clients/${record.id}/report`} className="rounded-lg bg-tide-600 px-4 py-2 font-semibold text-white" download>
          Download PDF
        </a>
        <a href={`/api/v1/clients/${record.id}/fhir`} className="rounded-lg px-4 py-2 font-semibold text-tide-700 ring-1 ring-tide-200" download>
          Export FHIR R4 (JSON)
        </a>
        <PrintButton />
      </div>
      <header>
        <p className="text-ink-soft">{report.clinicName}</p>
        <h1 className="text-xl font-semibold">{report.title}</h1>
        <p>
          Client: {report.clientName} · Born {report.dateOfBirth} · Prepared {report.preparedOn}
        </p>
        <p>Referring physician: {report.referringPhysician || "—"}</p>
        {report.diagnosisNote ? <p>Reason for referral: {report.diagnosisNote}</p> : null}
      </header>
      <section>
        <h2 className="font-semibold">Precautions</h2>
        <p>{report.precautions.length ? report.precautions.join("; ") : "None on file."}</p>
      </section>
      <section>
        <h2 className="font-semibold">Range and grades</h2>
        <table className="w-full border-collapse text-xs" data-testid="report-table">
          <thead>
            <tr className="border-b text-left">
              {["Motion", "Side", "Best peak", "Reference", "Other side", "Grade", "How obtained", "Signed", "Open in-person tests"].map((h) => (
                <th key={h} className="px-1 py-1">
                  {h}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {report.rows.map((r) => (
              <tr key={`${r.motion}-${r.side}`} className="border-b align-top">
                <td className="px-1 py-1">{r.motion}</td>
                <td className="px-1 py-1">{r.side}</td>
                <td className="px-1 py-1">{r.peak}</td>
                <td className="px-1 py-1">{r.reference}</td>
                <td className="px-1 py-1">{r.otherSide}</td>
                <td className="px-1 py-1 font-semibold">{r.grade}</td>
                <td className="px-1 py-1">{r.how}</td>
                <td className="px-1 py-1">{r.signed}</td>
                <td className="px-1 py-1">{r.open}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <section>
        <h2 className="font-semibold">Grip and pinch</h2>
        {report.strength.length ? (
          <ul>
            {report.strength.map((s, i) => (
              <li key={i}>
                {s.test}, {s.side}: {s.reading}. {s.norm}.
              </li>
            ))}
          </ul>
        ) : (
          <p>No dynamometer or pinch-gauge readings recorded.</p>
        )}
      </section>
      <section>
        <h2 className="font-semibold">How the measurements were obtained and how accurate they are</h2>
        <ul className="list-disc pl-5">
          {report.accuracy.map((a) => (
            <li key={a}>{a}</li>
          ))}
        </ul>
      </section>
      <section>
        <h2 className="font-semibold">Cautions</h2>
        <ul className="list-disc pl-5">
          {report.cautions.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      </section>
    </article>
  );
}
