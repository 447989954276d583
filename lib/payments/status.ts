import type { Payment } from "@/db/schema";

/** What a visit shows about money: the latest payment decides; an expired checkout counts as not paid. */
export type VisitPaymentState = "unpaid" | "pending" | "paid" | "refunded";

export function visitPaymentState(paymentsNewestFirst: Pick<Payment, "status">[]): VisitPaymentState {
  if (paymentsNewestFirst.some((p) => p.status === "paid")) return "paid";
  const latest = paymentsNewestFirst[0];
  if (!latest || latest.status === "expired") return "unpaid";
  return latest.status;
}

export const PAYMENT_STATE_LABELS: Record<VisitPaymentState, string> = {
  unpaid: "Not paid",
  pending: "Payment pending",
  paid: "Paid",
  refunded: "Refunded",
};

/** Amounts are kept in minor units (cents, pence); shown in the clinic's currency. */
export function formatMoney(amountMinor: number, currency: string): string {
  return new Intl.NumberFormat("en-GB", { style: "currency", currency: currency.toUpperCase() }).format(amountMinor / 100);
}
