import { NextResponse } from "next/server";
import Stripe from "stripe";
import { getDb, type Database } from "@/db";
import { env } from "@/lib/env";
import { errorResponse } from "@/lib/http";
import { applyPaymentEvent } from "./events";
import { sendReceipt } from "./receipt";
import { paymentService } from "./service";

/** Largest event body accepted; the payment service's events are a few kilobytes. [common practice] */
const WEBHOOK_BODY_LIMIT_BYTES = 256 * 1024;

export interface WebhookOutcome {
  status: 200 | 400 | 413;
  body: Record<string, unknown>;
  paidPaymentId?: string;
}

/**
 * Verifies one delivery with the SDK (stripe.webhooks.constructEvent: HMAC-SHA256 over `timestamp.body`, with its
 * 5-minute replay window) and applies it. A forged, altered or stale event gets 400 and changes nothing.
 */
export async function handlePaymentWebhook(db: Database, stripe: Stripe, secret: string, raw: string, signature: string | null): Promise<WebhookOutcome> {
  if (!signature) return { status: 400, body: { error: "Missing Stripe-Signature header." } };
  if (raw.length > WEBHOOK_BODY_LIMIT_BYTES) return { status: 413, body: { error: "Event too large." } };
  let event: Stripe.Event;
  try {
    event = stripe.webhooks.constructEvent(raw, signature, secret);
  } catch (error) {
    if (error instanceof Stripe.errors.StripeSignatureVerificationError) return { status: 400, body: { error: "The event's signature does not verify; it was ignored." } };
    throw error;
  }
  const handled = await applyPaymentEvent(db, event);
  return { status: 200, body: { received: true, duplicate: handled.duplicate }, paidPaymentId: handled.paidPaymentId };
}

/**
 * The one route handler that takes no session: the caller is the payment service, proven by the signature over the
 * raw body rather than by a sign-in.
 */
export function paymentWebhook() {
  return async (request: Request): Promise<Response> => {
    try {
      const db = getDb();
      const outcome = await handlePaymentWebhook(db, paymentService(), env().STRIPE_WEBHOOK_SECRET, await request.text(), request.headers.get("stripe-signature"));
      if (outcome.paidPaymentId) {
        // After the commit: a mail failure must not undo the payment; the receipt stays due (receiptSentAt empty).
        await sendReceipt(db, outcome.paidPaymentId).catch((error) => console.error("receipt not sent", error));
      }
      return NextResponse.json(outcome.body, { status: outcome.status });
    } catch (error) {
      return errorResponse(error);
    }
  };
}
