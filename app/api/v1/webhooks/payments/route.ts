import { paymentWebhook } from "@/lib/payments/webhook";

/** Signed events from the payment service (no session: the signature is the proof; see lib/payments/webhook.ts). */
export const POST = paymentWebhook();
