import { notFound } from "next/navigation";
import { z } from "zod";
import { getDb } from "@/db";
import { getClient } from "@/db/queries/clients";
import { getClinic } from "@/db/queries/clinics";
import { listSelfPayVisits, listVisitPrices } from "@/db/queries/payments";
import { PayButton } from "@/components/payments/pay-button";
import { PaymentBadge } from "@/components/payments/payment-badge";
import { WaitForConfirmation } from "@/components/payments/wait-for-confirmation";
import { Card, PageTitle } from "@/components/ui/card";
import { currentActor } from "@/lib/auth/guard";
import { formatMoney, visitPaymentState } from "@/lib/payments/status";

export const metadata = { title: "Payments" };

const querySchema = z.object({
  visit: z.uuid().optional().catch(undefined),
  returned: z.string().optional().catch(undefined),
  cancelled: z.string().optional().catch(undefined),
});

/** A self-pay client's visits with what each costs and whether it is paid; pay before or after the visit. */
export default async function PayPage({ searchParams }: { searchParams: Promise<Record<string, string>> }) {
  const actor = await currentActor();
  if (!actor || actor.role !== "client" || !actor.clientId) notFound();
  const q = querySchema.parse(await searchParams);
  const db = getDb();
  const [client, clinic, prices, rows] = await Promise.all([
    getClient(db, actor.clinicId, actor.clientId),
    getClinic(db, actor.clinicId),
    listVisitPrices(db, actor.clinicId),
    listSelfPayVisits(db, actor.clinicId, actor.clientId),
  ]);
  const tz = clinic?.timezone ?? "UTC";
  const when = (d: Date) => new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeStyle: "short", timeZone: tz }).format(d);
  const returnedRow = q.returned && q.visit ? rows.find((r) => r.visit.id === q.visit) : undefined;
  const waiting = Boolean(returnedRow && visitPaymentState(returnedRow.payments) === "pending");
  return (
    <>
      <PageTitle title="Payments" subtitle="Pay for your visits before or after they happen. Your card is entered on the payment service's page; Kinarc never sees it." />
      <WaitForConfirmation waiting={waiting} />
      {q.cancelled ? (
        <p role="status" className="mb-4 rounded-lg bg-sand-100 px-3 py-2 text-sm">
          Payment cancelled; nothing was charged.
        </p>
      ) : null}
      {!client?.selfPay ? (
        <Card>
          <p className="text-sm">Your visits are not billed to you directly, so there is nothing to pay here.</p>
        </Card>
      ) : (
        <Card>
          {rows.length === 0 ? (
            <p className="text-sm text-ink-soft">No visits yet.</p>
          ) : (
            <ul className="divide-y divide-sand-100">
              {rows.map(({ visit, payments }) => {
                const state = visitPaymentState(payments);
                const price = prices.find((p) => p.visitKind === visit.kind);
                const payable = (state === "unpaid" || state === "pending") && visit.status !== "cancelled" && visit.status !== "missed" && price;
                return (
                  <li key={visit.id} className="flex flex-wrap items-center gap-3 py-3 text-sm" data-testid="pay-row" data-visit-id={visit.id}>
                    <div className="min-w-0 flex-1">
                      <p className="font-medium">
                        {visit.kind === "video" ? "Video visit" : "In-person visit"} · {when(visit.startsAt)}
                      </p>
                      <p className="text-ink-soft">
                        {price ? formatMoney(price.amountMinor, price.currency) : "Price not set yet"} · {visit.status.replace("_", " ")}
                      </p>
                    </div>
                    <PaymentBadge state={state} />
                    {payable ? <PayButton visitId={visit.id} label={state === "pending" ? "Continue payment" : "Pay now"} /> : null}
                  </li>
                );
              })}
            </ul>
          )}
        </Card>
      )}
      <p className="mt-4 text-xs text-ink-faint">A receipt is e-mailed to you when a payment is confirmed. Questions about a charge: ask your clinic.</p>
    </>
  );
}
