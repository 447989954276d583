import { Badge } from "@/components/ui/card";
import { PAYMENT_STATE_LABELS, type VisitPaymentState } from "@/lib/payments/status";

const TONES: Record<VisitPaymentState, "neutral" | "caution" | "alert" | "good"> = { unpaid: "neutral", pending: "caution", paid: "good", refunded: "alert" };

/** Paid / pending / refunded / not paid, for any screen that shows a self-pay visit. */
export function PaymentBadge({ state }: { state: VisitPaymentState }) {
  return (
    <span data-testid="payment-state" data-state={state}>
      <Badge tone={TONES[state]}>{PAYMENT_STATE_LABELS[state]}</Badge>
    </span>
  );
}
