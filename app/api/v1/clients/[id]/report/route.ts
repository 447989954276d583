import { chartContext, CHART_STAFF } from "@/lib/chart/access";
import { route } from "@/lib/http";
import { reportPdf } from "@/lib/reports/pdf";
import { buildReport } from "@/lib/reports/summary";

type Params = { id: string };

/** The evaluation summary as a PDF download. */
export const GET = route<Params>(CHART_STAFF, async ({ actor, request, params }) => {
  const { db, client, today } = await chartContext(actor, params.id, request, "api.report.pdf");
  const pdf = await reportPdf(await buildReport(db, client, today));
  const name = `kinarc-summary-${client.familyName.toLowerCase().replace(/[^a-z0-9]+/g, "-")}-${today}.pdf`;
  return new Response(Buffer.from(pdf), {
    headers: { "content-type": "application/pdf", "content-disposition": `attachment; filename="${name}"`, "cache-control": "no-store" },
  });
});
