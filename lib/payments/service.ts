import Stripe from "stripe";
import { env } from "@/lib/env";

/**
 * The official Stripe SDK, pointed at the real service in production or at the local stand-in
 * (scripts/payment-fake) when STRIPE_API_URL is set, through the SDK's own host/port/protocol options.
 */
export function paymentServiceFor(opts: { secretKey: string; apiUrl?: string }): Stripe {
  const config: Stripe.StripeConfig = { telemetry: false, maxNetworkRetries: 2, timeout: 20_000 };
  if (opts.apiUrl) {
    const u = new URL(opts.apiUrl);
    config.host = u.hostname;
    config.port = u.port || (u.protocol === "https:" ? 443 : 80);
    config.protocol = u.protocol === "https:" ? "https" : "http";
  }
  return new Stripe(opts.secretKey, config);
}

const globalForPayments = globalThis as unknown as { kinarcPayments?: Stripe };

export function paymentService(): Stripe {
  const e = env();
  globalForPayments.kinarcPayments ??= paymentServiceFor({ secretKey: e.STRIPE_SECRET_KEY, apiUrl: e.STRIPE_API_URL });
  return globalForPayments.kinarcPayments;
}
