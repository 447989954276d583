import { env } from "@/lib/env";
import { startPaymentFake } from "./server";

// `npx tsx scripts/payment-fake/index.ts`: the stand-in alone, on STRIPE_API_URL's port, posting to this app's webhook.
const e = env();
const port = Number(new URL(e.STRIPE_API_URL ?? "http://localhost:12111").port || 12111);
void startPaymentFake({
  port,
  secretKey: e.STRIPE_SECRET_KEY,
  webhookSecret: e.STRIPE_WEBHOOK_SECRET,
  webhookUrl: `${e.APP_URL}/api/v1/webhooks/payments`,
});
