import { randomBytes } from "node:crypto";
import http from "node:http";
import type { AddressInfo } from "node:net";
import Stripe from "stripe";

/**
 * A local stand-in for the parts of the payment service's HTTP API that Kinarc calls through the official SDK:
 * Checkout Session create / retrieve / expire and refunds, plus a hosted checkout page of our own and signed webhooks
 * (signed with the SDK's own `webhooks.generateTestHeaderString`, i.e. the documented `t=…,v1=HMAC-SHA256` scheme).
 * Development and tests only: it takes no card details and moves no money.
 */

export interface PaymentFakeOptions {
  port: number;
  secretKey: string;
  webhookSecret: string;
  /** Where signed events are posted (Kinarc's /api/v1/webhooks/payments). */
  webhookUrl: string;
  host?: string;
  quiet?: boolean;
}

export interface WebhookDelivery {
  eventId: string;
  type: string;
  status: number | null;
  attempts: number;
}

export interface PaymentFake {
  url: string;
  deliveries(): WebhookDelivery[];
  close(): Promise<void>;
}

type Params = Record<string, unknown>;

interface Session {
  id: string;
  object: "checkout.session";
  mode: string;
  status: "open" | "complete" | "expired";
  payment_status: "unpaid" | "paid";
  amount_total: number;
  amount_subtotal: number;
  currency: string;
  client_reference_id: string | null;
  customer_email: string | null;
  metadata: Record<string, string>;
  success_url: string;
  cancel_url: string | null;
  url: string | null;
  payment_intent: string | null;
  created: number;
  expires_at: number;
  livemode: false;
  line_items_label: string;
}

const newId = (prefix: string) => `${prefix}_${randomBytes(12).toString("hex")}`;
const nowS = () => Math.floor(Date.now() / 1000);

/** `a[0][b]=1` form fields (the SDK's encoding) into nested objects; numeric keys stay object keys. */
export function parseBracketForm(body: string): Params {
  const out: Params = {};
  for (const [key, value] of new URLSearchParams(body)) {
    const path = key.replace(/\]/g, "").split("[");
    let node = out;
    path.forEach((part, i) => {
      if (i === path.length - 1) node[part] = value;
      else node = (node[part] ??= {}) as Params;
    });
  }
  return out;
}

class ApiError extends Error {
  constructor(
    public readonly status: number,
    message: string,
    public readonly param?: string,
    public readonly code = "parameter_missing",
  ) {
    super(message);
  }
}

function required(params: Params, name: string): string {
  const v = params[name];
  if (typeof v !== "string" || !v) throw new ApiError(400, `Missing required param: ${name}.`, name);
  return v;
}

function money(amountMinor: number, currency: string): string {
  return new Intl.NumberFormat("en-GB", { style: "currency", currency: currency.toUpperCase() }).format(amountMinor / 100);
}

const escape = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);

function checkoutPage(s: Session): string {
  const done = s.status !== "open";
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Payment stand-in (development)</title>
<meta name="viewport" content="width=device-width, initial-scale=1">
<style>body{font-family:system-ui,sans-serif;max-width:520px;margin:40px auto;padding:0 16px;color:#1d2a30}
.banner{background:#fff4d6;border:1px solid #e0b84c;padding:12px;border-radius:8px}button{font:inherit;padding:10px 18px;border-radius:8px;border:1px solid #1b6f67;margin-right:8px}
.pay{background:#1b6f67;color:#fff}</style></head><body>
<p class="banner" role="note"><strong>Development stand-in.</strong> This page imitates a hosted checkout so Kinarc can be tried and tested
on one machine. It asks for no card, and no money moves.</p>
<h1>Checkout</h1>
<p>${escape(s.line_items_label)}: <strong data-testid="amount">${escape(money(s.amount_total, s.currency))}</strong></p>
${
  done
    ? `<p>This checkout is ${s.status}.</p>`
    : `<form method="post" action="/c/pay/${s.id}/complete" style="display:inline"><button class="pay" type="submit">Confirm test payment</button></form>
<form method="post" action="/c/pay/${s.id}/cancel" style="display:inline"><button type="submit">Cancel</button></form>`
}
</body></html>`;
}

export async function startPaymentFake(opts: PaymentFakeOptions): Promise<PaymentFake> {
  const sessions = new Map<string, Session>();
  const idempotent = new Map<string, { status: number; body: unknown }>();
  const deliveries: WebhookDelivery[] = [];
  const signer = new Stripe(opts.secretKey);
  let base = "";

  async function deliver(type: string, object: unknown): Promise<void> {
    const event = {
      id: newId("evt"),
      object: "event",
      api_version: null,
      created: nowS(),
      type,
      data: { object },
      livemode: false,
      pending_webhooks: 1,
      request: { id: null, idempotency_key: null },
    };
    const payload = JSON.stringify(event);
    const record: WebhookDelivery = { eventId: event.id, type, status: null, attempts: 0 };
    deliveries.push(record);
    // Retries with back-off like the real service, so a Kinarc restarting at that moment still gets the event.
    for (const waitMs of [0, 500, 2000, 5000]) {
      if (waitMs) await new Promise((r) => setTimeout(r, waitMs));
      record.attempts++;
      try {
        const header = signer.webhooks.generateTestHeaderString({ payload, secret: opts.webhookSecret });
        const res = await fetch(opts.webhookUrl, { method: "POST", headers: { "content-type": "application/json", "stripe-signature": header }, body: payload });
        record.status = res.status;
        if (res.ok) return;
      } catch {
        record.status = null;
      }
    }
  }

  function find(id: string): Session {
    const s = sessions.get(id);
    if (!s) throw new ApiError(404, `No such checkout.session: '${id}'`, "id", "resource_missing");
    return s;
  }

  function publicSession(s: Session) {
    const rest: Partial<Session> = { ...s };
    delete rest.line_items_label;
    return rest;
  }

  function createSession(p: Params): Session {
    const mode = required(p, "mode");
    if (mode !== "payment") throw new ApiError(400, "This stand-in supports mode=payment only.", "mode", "parameter_invalid");
    const successUrl = required(p, "success_url");
    const items = Object.values((p.line_items ?? {}) as Record<string, Params>);
    if (!items.length) throw new ApiError(400, "Missing required param: line_items.", "line_items");
    let total = 0;
    let currency = "";
    const labels: string[] = [];
    for (const item of items) {
      const price = (item.price_data ?? {}) as Params;
      const unit = Number(price.unit_amount);
      const qty = Number(item.quantity ?? 1);
      if (!Number.isInteger(unit) || unit < 0) throw new ApiError(400, "Invalid integer: line_items[0][price_data][unit_amount]", "line_items[0][price_data][unit_amount]", "parameter_invalid");
      currency = required(price, "currency").toLowerCase();
      total += unit * qty;
      labels.push(String(((price.product_data ?? {}) as Params).name ?? "Item"));
    }
    const id = newId("cs_test");
    const s: Session = {
      id,
      object: "checkout.session",
      mode,
      status: "open",
      payment_status: "unpaid",
      amount_total: total,
      amount_subtotal: total,
      currency,
      client_reference_id: (p.client_reference_id as string) ?? null,
      customer_email: (p.customer_email as string) ?? null,
      metadata: (p.metadata ?? {}) as Record<string, string>,
      success_url: successUrl,
      cancel_url: (p.cancel_url as string) ?? null,
      url: `${base}/c/pay/${id}`,
      payment_intent: null,
      created: nowS(),
      expires_at: nowS() + 24 * 3600,
      livemode: false,
      line_items_label: labels.join(", "),
    };
    sessions.set(id, s);
    return s;
  }

  async function api(method: string, path: string, params: Params): Promise<{ status: number; body: unknown }> {
    if (method === "POST" && path === "/v1/checkout/sessions") return { status: 200, body: publicSession(createSession(params)) };
    let m = path.match(/^\/v1\/checkout\/sessions\/([\w]+)$/);
    if (method === "GET" && m) return { status: 200, body: publicSession(find(m[1])) };
    m = path.match(/^\/v1\/checkout\/sessions\/([\w]+)\/expire$/);
    if (method === "POST" && m) {
      const s = find(m[1]);
      if (s.status !== "open") throw new ApiError(400, `Only open sessions can be expired; this one is ${s.status}.`, undefined, "checkout_session_not_open");
      s.status = "expired";
      s.url = null;
      void deliver("checkout.session.expired", publicSession(s));
      return { status: 200, body: publicSession(s) };
    }
    if (method === "POST" && path === "/v1/refunds") {
      const pi = required(params, "payment_intent");
      const s = [...sessions.values()].find((x) => x.payment_intent === pi);
      if (!s) throw new ApiError(404, `No such payment_intent: '${pi}'`, "payment_intent", "resource_missing");
      const refund = { id: newId("re"), object: "refund", amount: s.amount_total, currency: s.currency, payment_intent: pi, status: "succeeded", created: nowS() };
      void deliver("charge.refunded", {
        id: newId("ch"),
        object: "charge",
        payment_intent: pi,
        amount: s.amount_total,
        amount_refunded: s.amount_total,
        currency: s.currency,
        refunded: true,
        metadata: s.metadata,
      });
      return { status: 200, body: refund };
    }
    throw new ApiError(404, `Unrecognized request URL (${method}: ${path}). This stand-in covers Checkout Sessions and refunds only.`, undefined, "resource_missing");
  }

  const server = http.createServer((req, res) => {
    let raw = "";
    req.on("data", (c) => (raw += c));
    req.on("end", async () => {
      const url = new URL(req.url ?? "/", "http://stand-in");
      const send = (status: number, body: unknown) => {
        res.writeHead(status, { "content-type": "application/json", "request-id": newId("req") });
        res.end(JSON.stringify(body));
      };
      try {
        if (url.pathname.startsWith("/v1/")) {
          if (req.headers.authorization !== `Bearer ${opts.secretKey}`) {
            return send(401, { error: { type: "invalid_request_error", message: "Invalid API Key provided." } });
          }
          const key = req.headers["idempotency-key"];
          const memoKey = typeof key === "string" ? `${req.method} ${url.pathname} ${key}` : null;
          if (memoKey && idempotent.has(memoKey)) {
            const memo = idempotent.get(memoKey)!;
            return send(memo.status, memo.body);
          }
          const params = req.method === "GET" ? parseBracketForm(url.search.slice(1)) : parseBracketForm(raw);
          const out = await api(req.method ?? "GET", url.pathname, params);
          if (memoKey) idempotent.set(memoKey, out);
          return send(out.status, out.body);
        }
        if (url.pathname === "/_stand-in/deliveries") return send(200, deliveries);
        let m = url.pathname.match(/^\/c\/pay\/([\w]+)$/);
        if (req.method === "GET" && m) {
          const s = find(m[1]);
          res.writeHead(200, { "content-type": "text/html; charset=utf-8" });
          return res.end(checkoutPage(s));
        }
        m = url.pathname.match(/^\/c\/pay\/([\w]+)\/(complete|cancel)$/);
        if (req.method === "POST" && m) {
          const s = find(m[1]);
          if (m[2] === "cancel" || s.status !== "open") {
            res.writeHead(303, { location: s.cancel_url ?? s.success_url });
            return res.end();
          }
          s.status = "complete";
          s.payment_status = "paid";
          s.payment_intent = newId("pi");
          s.url = null;
          // The event is sent before the browser returns, as the real service usually does; the return page must
          // still cope with an event that arrives later.
          await deliver("checkout.session.completed", publicSession(s));
          res.writeHead(303, { location: s.success_url.replace("{CHECKOUT_SESSION_ID}", s.id) });
          return res.end();
        }
        send(404, { error: { type: "invalid_request_error", message: "Not found." } });
      } catch (error) {
        if (error instanceof ApiError) return send(error.status, { error: { type: "invalid_request_error", code: error.code, param: error.param, message: error.message } });
        send(500, { error: { type: "api_error", message: String(error) } });
      }
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    if (opts.host) server.listen(opts.port, opts.host, resolve);
    else server.listen(opts.port, resolve);
  });
  const port = (server.address() as AddressInfo).port;
  base = `http://localhost:${port}`;
  if (!opts.quiet) console.log(`Payment stand-in (development only) on ${base}`);
  return {
    url: base,
    deliveries: () => deliveries.map((d) => ({ ...d })),
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
