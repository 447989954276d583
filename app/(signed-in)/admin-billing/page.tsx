import { notFound } from "next/navigation";
import { getDb } from "@/db";
import { getClinic } from "@/db/queries/clinics";
import { listSelfPayVisits, listVisitPrices } from "@/db/queries/payments";
import { VISIT_KINDS } from "@/db/schema";
import { PaymentBadge } from "@/components/payments/payment-badge";
import { PriceForm } from "@/components/payments/price-form";
import { RefundForm } from "@/components/payments/refund-form";
import { Card, PageTitle } from "@/components/ui/card";
import { auditActorEvent } from "@/lib/audit";
import { currentActor } from "@/lib/auth/guard";
import { formatMoney, visitPaymentState } from "@/lib/payments/status";
import { CURRENCIES } from "@/lib/validation/payment";

export const metadata = { title: "Billing" };

const KIND_LABELS = { video: "Video visit", in_person: "In-person visit" } as const;

/** The admin's price list for self-pay visits and the state of every self-pay visit's payment. */
export default async function AdminBillingPage() {
  const actor = await currentActor();
  if (!actor || actor.role !== "admin") notFound();
  const db = getDb();
  const [prices, rows, clinic] = await Promise.all([listVisitPrices(db, actor.clinicId), listSelfPayVisits(db, actor.clinicId), getClinic(db, actor.clinicId)]);
  await auditActorEvent(db, actor, { action: "payment.list" });
  const tz = clinic?.timezone ?? "UTC";
  const when = (d: Date) => new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeStyle: "short", timeZone: tz }).format(d);
  return (
    <>
      <PageTitle title="Billing" subtitle="Prices for self-pay clients and what each of their visits shows. Card payments are taken by the payment service; Kinarc keeps only its references." />
      <Card title="Price per visit" className="mb-6">
        <div className="grid gap-5">
          {VISIT_KINDS.map((kind) => {
            const p = prices.find((x) => x.visitKind === kind);
            return (
              <div key={kind}>
                <h3 className="mb-2 text-sm font-semibold">{KIND_LABELS[kind]}</h3>
                <PriceForm
                  visitKind={kind}
                  kindLabel={KIND_LABELS[kind]}
                  currencies={CURRENCIES}
                  initial={{ amount: p ? (p.amountMinor / 100).toFixed(2) : "", currency: p?.currency ?? "gbp", label: p?.label ?? `${KIND_LABELS[kind]}, hand therapy` }}
                />
              </div>
            );
          })}
        </div>
      </Card>
      <Card title="Self-pay visits">
        {rows.length === 0 ? (
          <p className="text-sm text-ink-soft">No visits of self-pay clients yet.</p>
        ) : (
          <table className="w-full text-left text-sm" data-testid="billing-table">
            <thead className="text-xs uppercase tracking-wide text-ink-soft">
              <tr>
                <th className="py-2">Visit</th>
                <th className="py-2">Client</th>
                <th className="py-2">Amount</th>
                <th className="py-2">State</th>
                <th className="py-2" />
              </tr>
            </thead>
            <tbody className="divide-y divide-sand-100">
              {rows.map(({ visit, clientGiven, clientFamily, payments }) => {
                const state = visitPaymentState(payments);
                const paid = payments.find((p) => p.status === "paid");
                const latest = paid ?? payments[0];
                return (
                  <tr key={visit.id} data-visit-id={visit.id}>
                    <td className="py-2">
                      {KIND_LABELS[visit.kind]} · {when(visit.startsAt)}
                    </td>
                    <td className="py-2">
                      {clientGiven} {clientFamily}
                    </td>
                    <td className="py-2">{latest ? formatMoney(latest.amountMinor, latest.currency) : "—"}</td>
                    <td className="py-2">
                      <PaymentBadge state={state} />
                      {paid && !paid.receiptSentAt ? <span className="ml-2 text-xs text-flag-amber">receipt not sent</span> : null}
                    </td>
                    <td className="py-2 text-right">{paid ? <RefundForm paymentId={paid.id} /> : null}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        )}
      </Card>
    </>
  );
}
