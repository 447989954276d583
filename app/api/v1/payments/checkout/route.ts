import { NextResponse } from "next/server";
import { getDb } from "@/db";
import { requestAddress } from "@/lib/auth/guard";
import { env } from "@/lib/env";
import { readJson, route } from "@/lib/http";
import { PaymentRefused, startCheckout } from "@/lib/payments/checkout";
import { paymentService } from "@/lib/payments/service";
import { checkoutRequestSchema } from "@/lib/validation/payment";

/** A self-pay client opens the payment service's checkout page for one of their visits: answers `{ url }` to go to. */
export const POST = route(["client"], async ({ actor, request }) => {
  const { visitId } = checkoutRequestSchema.parse(await readJson(request));
  try {
    const started = await startCheckout(getDb(), paymentService(), actor, visitId, { appUrl: env().APP_URL, address: requestAddress(request.headers) });
    return NextResponse.json(started, { status: started.reused ? 200 : 201 });
  } catch (error) {
    if (error instanceof PaymentRefused) return NextResponse.json({ error: error.message, fields: { [error.field]: error.message } }, { status: 409 });
    throw error;
  }
});
