// A local stand-in for the parts of Stripe's API Grainward uses, for development and tests only.
// The app reaches it with the real `stripe` SDK (host/port/protocol settings), exactly as it would
// reach Stripe: form-encoded requests with a bearer key, Idempotency-Key, Checkout Sessions, a hosted
// payment page where the test card decides the outcome, refunds, events, and webhooks signed in
// Stripe's `Stripe-Signature` scheme (t=…,v1=HMAC-SHA256(secret, "t.payload")) with retries.
// Nothing here imports app code.
import { createHmac, randomBytes } from "node:crypto";
import http from "node:http";
import type { AddressInfo } from "node:net";
import { createSubscriptionBilling, type FakeInvoice, type FakeSubscription } from "./stripe-fake-subscriptions";

export const SUCCESS_CARD = "4242424242424242";
export const DECLINE_CARD = "4000000000000002";

type Json = Record<string, unknown>;

export type FakeSession = {
  id: string;
  object: "checkout.session";
  mode: "payment" | "subscription";
  status: "open" | "complete" | "expired";
  payment_status: "unpaid" | "paid";
  amount_total: number;
  amount_subtotal: number;
  currency: string;
  line_items: { name: string; unit_amount: number; quantity: number; price?: string }[];
  metadata: Record<string, string>;
  client_reference_id: string | null;
  customer_email: string | null;
  success_url: string;
  cancel_url: string | null;
  url: string | null;
  payment_intent: string | null;
  /** Subscription mode: the customer and subscription made when the session is paid. */
  customer: string | null;
  subscription: string | null;
  subscription_data: Json;
  created: number;
  expires_at: number;
  livemode: false;
};

export type FakeCharge = { id: string; payment_intent: string; amount: number; amount_refunded: number; currency: string };
export type FakeEvent = { id: string; object: "event"; type: string; created: number; api_version: string; livemode: false; data: { object: Json }; pending_webhooks: number };
export type Delivery = { eventId: string; type: string; attempt: number; status: number | null; at: string };

/** A charge made before the fake started (lib/fakes/seeded-charges.ts: the demo seed's invented payments). */
export type FakeChargeSeed = { paymentIntent: string; amount: number; currency: string; amountRefunded: number };

export type StripeFakeOptions = {
  /** Charges it knows from the start, under the install's key, so they can be refunded. */
  charges?: FakeChargeSeed[];
  host?: string;
  port?: number;
  secretKey: string;
  webhookSecret: string;
  /** Where events are posted; none → events are only recorded. */
  webhookUrl?: string;
  /** Waits between webhook attempts; the number of entries + 1 is the number of tries. */
  retryDelaysMs?: number[];
  /**
   * Further Stripe accounts (a studio's own), each with its key, signing secret and webhook endpoint.
   * As at Stripe, a Checkout Session or charge made under one key is not found under another, and its
   * events are signed with and sent to its own account's secret and endpoint.
   */
  accounts?: FakeAccount[];
};

export type FakeAccount = { secretKey: string; webhookSecret: string; webhookUrl?: string };
/** One API request as the fake received it: which key it came with. */
export type FakeRequest = { method: string; path: string; key: string };

export type StripeFake = {
  port: number;
  url: string;
  sessions(): FakeSession[];
  /** Every captured charge with what has been refunded of it: the money that really moved. */
  charges(): FakeCharge[];
  events(): FakeEvent[];
  /** Every API request with the key it used, oldest first. */
  requests(): FakeRequest[];
  /** The key the Checkout Session was created under. */
  sessionKey(sessionId: string): string | undefined;
  subscriptions(): FakeSubscription[];
  invoices(): FakeInvoice[];
  deliveries(): Delivery[];
  /** Sends an event to the webhook again, as Stripe's "resend" does. */
  redeliver(eventId: string): Promise<number | null>;
  /**
   * Tests only: the next `times` API requests with this method and path answer 500 as a Stripe outage
   * would (marked not to be retried by the SDK), and change nothing. Over HTTP, for a fake in its own
   * process (the e2e server's): POST /_test/fail-next with method, path and times (a form body).
   */
  failNext(method: string, path: string, times?: number): void;
  close(): Promise<void>;
};

class StripeError extends Error {
  constructor(
    readonly status: number,
    readonly type: string,
    message: string,
    readonly param?: string,
    readonly code?: string,
  ) {
    super(message);
  }
}

// ISO 4217 minor units of the currencies the fake accepts (a subset; JPY has none).
const ZERO_DECIMAL = new Set(["jpy", "krw", "vnd", "clp", "isk", "ugx"]);
const CURRENCIES = new Set(["usd", "eur", "gbp", "cad", "aud", "chf", "sek", "nok", "dkk", "nzd", "jpy"]);

/** Parses Stripe's form encoding (a[b][0][c]=v) into nested objects and arrays. */
export function parseStripeForm(body: string): Json {
  const out: Json = {};
  for (const [rawKey, value] of new URLSearchParams(body)) {
    const parts = rawKey.replace(/\]/g, "").split("[");
    let node: Record<string, unknown> | unknown[] = out;
    parts.forEach((part, i) => {
      const last = i === parts.length - 1;
      const nextIsIndex = !last && /^\d+$/.test(parts[i + 1]!);
      const container = node as Record<string, unknown>;
      if (last) {
        container[part] = value;
        return;
      }
      container[part] ??= nextIsIndex ? [] : {};
      node = container[part] as Record<string, unknown>;
    });
  }
  return out;
}

const id = (prefix: string) => `${prefix}_test_${randomBytes(12).toString("base64url").replace(/[-_]/g, "x")}`;
const now = () => Math.floor(Date.now() / 1000);

function requireString(obj: Json, key: string, where = key): string {
  const v = obj[key];
  if (typeof v !== "string" || v === "") throw new StripeError(400, "invalid_request_error", `Missing required param: ${where}.`, where, "parameter_missing");
  return v;
}

function requireInteger(v: unknown, where: string): number {
  if (typeof v !== "string" || !/^-?\d+$/.test(v)) throw new StripeError(400, "invalid_request_error", `Invalid integer: ${String(v)}`, where, "parameter_invalid_integer");
  return Number(v);
}

function escapeHtml(s: string) {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

function formatAmount(amount: number, currency: string) {
  const digits = ZERO_DECIMAL.has(currency) ? 0 : 2;
  return `${(amount / 10 ** digits).toFixed(digits)} ${currency.toUpperCase()}`;
}

export async function startStripeFake(options: StripeFakeOptions): Promise<StripeFake> {
  const sessions = new Map<string, FakeSession>();
  const events: FakeEvent[] = [];
  const deliveries: Delivery[] = [];
  const charges = new Map<string, FakeCharge>(
    (options.charges ?? []).map((c) => [c.paymentIntent, { id: id("ch"), payment_intent: c.paymentIntent, amount: c.amount, amount_refunded: c.amountRefunded, currency: c.currency.toLowerCase() }]),
  );
  const idempotency = new Map<string, { body: string; status: number; response: Json }>();
  const retryDelays = options.retryDelaysMs ?? [1000, 3000, 10000, 30000];
  const timers = new Set<NodeJS.Timeout>();
  let baseUrl = "";
  const install: FakeAccount = { secretKey: options.secretKey, webhookSecret: options.webhookSecret, webhookUrl: options.webhookUrl };
  const accounts = new Map<string, FakeAccount>([install, ...(options.accounts ?? [])].map((a) => [a.secretKey, a]));
  const requests: FakeRequest[] = [];
  const failures: { method: string; path: string; times: number }[] = [];
  const failNext = (method: string, path: string, times = 1) => void failures.push({ method: method.toUpperCase(), path, times });
  /** The account (its key) each session, charge and event belongs to. */
  const ownerOf = new Map<string, string>();

  function sign(payload: string, account: FakeAccount): string {
    const t = now();
    const v1 = createHmac("sha256", account.webhookSecret).update(`${t}.${payload}`).digest("hex");
    return `t=${t},v1=${v1}`;
  }

  async function deliverOnce(event: FakeEvent, attempt: number): Promise<number | null> {
    const account = accounts.get(ownerOf.get(event.id) ?? options.secretKey)!;
    if (!account.webhookUrl) return null;
    const payload = JSON.stringify(event, null, 2);
    let status: number | null = null;
    try {
      const res = await fetch(account.webhookUrl, {
        method: "POST",
        headers: { "content-type": "application/json", "stripe-signature": sign(payload, account), "user-agent": "Stripe/1.0 (+local fake)" },
        body: payload,
        signal: AbortSignal.timeout(10_000),
      });
      status = res.status;
      await res.arrayBuffer();
    } catch {
      status = null;
    }
    deliveries.push({ eventId: event.id, type: event.type, attempt, status, at: new Date().toISOString() });
    return status;
  }

  async function deliver(event: FakeEvent, attempt = 1) {
    const status = await deliverOnce(event, attempt);
    const ok = status !== null && status >= 200 && status < 300;
    if (!ok && attempt <= retryDelays.length && accounts.get(ownerOf.get(event.id) ?? options.secretKey)!.webhookUrl) {
      const timer = setTimeout(() => {
        timers.delete(timer);
        void deliver(event, attempt + 1);
      }, retryDelays[attempt - 1]);
      timers.add(timer);
    }
  }

  function emit(type: string, object: Json, accountKey?: string) {
    const event: FakeEvent = { id: id("evt"), object: "event", type, created: now(), api_version: "2025-01-01", livemode: false, data: { object: structuredClone(object) }, pending_webhooks: 1 };
    if (accountKey) ownerOf.set(event.id, accountKey);
    events.push(event);
    void deliver(event);
    return event;
  }

  /** The account a subscription is being started for (its events and first charge belong to it). */
  let acting: string | undefined;
  const billing = createSubscriptionBilling({
    id,
    now,
    // A subscription's events go to the account it was bought under: known by the subscription's id
    // (its own events) or the invoice's subscription.
    emit: (type, object) => {
      const o = object as { id?: unknown; subscription?: unknown };
      const key = acting ?? (typeof o.subscription === "string" ? ownerOf.get(o.subscription) : undefined) ?? (typeof o.id === "string" ? ownerOf.get(o.id) : undefined);
      emit(type, object, key);
    },
    fail: (status, message, param) => {
      throw new StripeError(status, "invalid_request_error", message, param, status === 404 ? "resource_missing" : undefined);
    },
    // A paid subscription invoice is a captured charge like a Checkout payment, so it can be refunded.
    charge: (amount, currency) => {
      const pi = id("pi");
      const charge = { id: id("ch"), payment_intent: pi, amount, amount_refunded: 0, currency };
      charges.set(pi, charge);
      if (acting) ownerOf.set(charge.id, acting);
      return pi;
    },
  });

  function createSession(params: Json): FakeSession {
    const mode = requireString(params, "mode");
    if (mode !== "payment" && mode !== "subscription") throw new StripeError(400, "invalid_request_error", "This fake supports mode=payment and mode=subscription.", "mode");
    const successUrl = requireString(params, "success_url");
    const items = params.line_items;
    if (!Array.isArray(items) || items.length === 0) throw new StripeError(400, "invalid_request_error", "Missing required param: line_items.", "line_items", "parameter_missing");
    let currency: string | undefined;
    const recurring = mode === "subscription" ? billing.sessionLines(items) : null;
    if (recurring) currency = recurring.currency;
    const lineItems = recurring ? recurring.lines : items.map((raw, i) => {
      const item = raw as Json;
      const price = item.price_data as Json | undefined;
      if (!price) throw new StripeError(400, "invalid_request_error", `Missing required param: line_items[${i}][price_data].`, `line_items[${i}][price_data]`, "parameter_missing");
      const c = requireString(price, "currency", `line_items[${i}][price_data][currency]`).toLowerCase();
      if (!CURRENCIES.has(c)) throw new StripeError(400, "invalid_request_error", `Invalid currency: ${c}.`, `line_items[${i}][price_data][currency]`);
      if (currency && c !== currency) throw new StripeError(400, "invalid_request_error", "All line items must use the same currency.", `line_items[${i}][price_data][currency]`);
      currency = c;
      const unitAmount = requireInteger(price.unit_amount, `line_items[${i}][price_data][unit_amount]`);
      if (unitAmount < 0) throw new StripeError(400, "invalid_request_error", "unit_amount must be at least 0.", `line_items[${i}][price_data][unit_amount]`);
      const product = price.product_data as Json | undefined;
      const name = product ? requireString(product, "name", `line_items[${i}][price_data][product_data][name]`) : "";
      if (!product) throw new StripeError(400, "invalid_request_error", `Missing required param: line_items[${i}][price_data][product_data].`, `line_items[${i}][price_data][product_data]`, "parameter_missing");
      const quantity = requireInteger(item.quantity, `line_items[${i}][quantity]`);
      if (quantity < 1) throw new StripeError(400, "invalid_request_error", "quantity must be at least 1.", `line_items[${i}][quantity]`);
      return { name, unit_amount: unitAmount, quantity };
    });
    const total = lineItems.reduce((sum, l) => sum + l.unit_amount * l.quantity, 0);
    // Stripe's minimum charge is about 0.50 USD; the fake only refuses a zero or negative total.
    if (total <= 0) throw new StripeError(400, "invalid_request_error", "The Checkout Session's total amount due must be greater than zero.", "line_items", "amount_too_small");
    const metadata = (params.metadata as Record<string, string> | undefined) ?? {};
    const sessionId = id("cs");
    const session: FakeSession = {
      id: sessionId,
      object: "checkout.session",
      mode,
      status: "open",
      payment_status: "unpaid",
      amount_total: total,
      amount_subtotal: total,
      currency: currency!,
      line_items: lineItems,
      metadata,
      client_reference_id: typeof params.client_reference_id === "string" ? params.client_reference_id : null,
      customer_email: typeof params.customer_email === "string" ? params.customer_email : null,
      success_url: successUrl,
      cancel_url: typeof params.cancel_url === "string" ? params.cancel_url : null,
      url: `${baseUrl}/pay/${sessionId}`,
      payment_intent: null,
      customer: typeof params.customer === "string" ? params.customer : null,
      subscription: null,
      subscription_data: (params.subscription_data as Json | undefined) ?? {},
      created: now(),
      expires_at: params.expires_at ? requireInteger(params.expires_at, "expires_at") : now() + 24 * 3600,
      livemode: false,
    };
    sessions.set(session.id, session);
    return session;
  }

  function publicSession(s: FakeSession): Json {
    const { line_items: _items, subscription_data: _data, ...rest } = s;
    return rest;
  }

  /** GET /v1/checkout/sessions/:id/line_items, as Stripe lists them (one page). */
  function lineItemList(s: FakeSession): Json {
    const data = s.line_items.map((l, i) => ({
      id: `li_${s.id.slice(-12)}_${i}`,
      object: "item",
      description: l.name,
      quantity: l.quantity,
      currency: s.currency,
      amount_subtotal: l.unit_amount * l.quantity,
      amount_total: l.unit_amount * l.quantity,
      price: { object: "price", currency: s.currency, unit_amount: l.unit_amount },
    }));
    return { object: "list", data, has_more: false, url: `/v1/checkout/sessions/${s.id}/line_items` };
  }

  function expire(s: FakeSession) {
    if (s.status !== "open") throw new StripeError(400, "invalid_request_error", `Only Checkout Sessions with a status of open can be expired (this one is ${s.status}).`);
    s.status = "expired";
    s.url = null;
    emit("checkout.session.expired", publicSession(s), ownerOf.get(s.id));
  }

  function pay(s: FakeSession) {
    if (s.mode === "subscription") {
      acting = ownerOf.get(s.id);
      let started: ReturnType<typeof billing.startFromSession>;
      try {
        started = billing.startFromSession(s);
      } finally {
        acting = undefined;
      }
      const owner = ownerOf.get(s.id);
      if (owner) ownerOf.set(started.subscription, owner);
      s.customer = started.customer;
      s.subscription = started.subscription;
      s.status = "complete";
      s.payment_status = "paid";
      s.url = null;
      emit("checkout.session.completed", publicSession(s), owner);
      return;
    }
    const pi = id("pi");
    const charge = { id: id("ch"), payment_intent: pi, amount: s.amount_total, amount_refunded: 0, currency: s.currency };
    charges.set(pi, charge);
    const owner = ownerOf.get(s.id);
    if (owner) ownerOf.set(charge.id, owner);
    s.status = "complete";
    s.payment_status = "paid";
    s.payment_intent = pi;
    s.url = null;
    emit("checkout.session.completed", publicSession(s), owner);
  }

  /** The subscription an invoice bills (its account is the invoice's). */
  const invoiceSubscription = (invoiceId: string) => billing.invoices().find((i) => i.id === invoiceId)?.parent.subscription_details.subscription;

  /** Stripe keeps accounts apart: another account's object reads as missing. */
  const mine = (objectId: string, key: string) => (ownerOf.get(objectId) ?? options.secretKey) === key;

  function refund(params: Json, key: string): Json {
    const pi = requireString(params, "payment_intent");
    const charge = charges.get(pi);
    if (!charge || !mine(charge.id, key)) throw new StripeError(404, "invalid_request_error", `No such payment_intent: '${pi}'`, "payment_intent", "resource_missing");
    const remaining = charge.amount - charge.amount_refunded;
    const amount = params.amount === undefined ? remaining : requireInteger(params.amount, "amount");
    if (amount <= 0 || amount > remaining) {
      throw new StripeError(400, "invalid_request_error", `Refund amount (${amount}) is greater than unrefunded amount on charge (${remaining}).`, "amount", "amount_too_large");
    }
    charge.amount_refunded += amount;
    const refundObj = { id: id("re"), object: "refund", amount, currency: charge.currency, payment_intent: pi, charge: charge.id, status: "succeeded", created: now() };
    emit("charge.refunded", { id: charge.id, object: "charge", amount: charge.amount, amount_refunded: charge.amount_refunded, currency: charge.currency, payment_intent: pi, refunded: charge.amount_refunded === charge.amount }, ownerOf.get(charge.id));
    return refundObj;
  }

  function paymentPage(s: FakeSession, message?: string): string {
    const lines = s.line_items.map((l) => `<tr><td>${escapeHtml(l.name)}${l.quantity > 1 ? ` × ${l.quantity}` : ""}</td><td style="text-align:right">${escapeHtml(formatAmount(l.unit_amount * l.quantity, s.currency))}</td></tr>`).join("");
    return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><title>Test payment</title>
<style>body{font-family:system-ui,sans-serif;background:#f4f4f5;color:#18181b;margin:0;padding:24px}main{max-width:420px;margin:auto;background:#fff;border-radius:12px;padding:24px;box-shadow:0 1px 3px #0002}
table{width:100%;border-collapse:collapse;margin:12px 0}td{padding:6px 0;border-bottom:1px solid #e4e4e7}label{display:block;font-weight:600;margin:16px 0 6px}input{width:100%;box-sizing:border-box;font-size:18px;padding:10px;border:1px solid #a1a1aa;border-radius:8px}
button{width:100%;min-height:48px;margin-top:16px;font-size:16px;font-weight:600;border:0;border-radius:8px;background:#3f3f46;color:#fff}.err{background:#fee2e2;padding:10px;border-radius:8px}.note{font-size:13px;color:#52525b}a{color:#3f3f46}</style></head>
<body><main><p class="note">Local payment test page — no real money moves.</p><h1>Pay ${escapeHtml(formatAmount(s.amount_total, s.currency))}</h1><table>${lines}</table>
${message ? `<p class="err" role="alert">${escapeHtml(message)}</p>` : ""}
<form method="post" action="/pay/${s.id}"><label for="card">Card number</label><input id="card" name="card" inputmode="numeric" autocomplete="off" placeholder="4242 4242 4242 4242">
<p class="note">Test cards: 4242 4242 4242 4242 succeeds; 4000 0000 0000 0002 is declined.</p><button type="submit">Pay</button></form>
${s.cancel_url ? `<form method="post" action="/pay/${s.id}/cancel"><button type="submit" style="background:#fff;color:#3f3f46;border:1px solid #a1a1aa">Cancel and go back</button></form>` : ""}
</main></body></html>`;
  }

  function closedPage(s: FakeSession): string {
    const what = s.status === "expired" ? "This payment page has expired" : "This payment is already complete";
    return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Test payment</title></head><body style="font-family:system-ui,sans-serif;padding:24px">
<p>Local payment test page — no real money moves.</p><h1>${what}</h1><p>Nothing was charged on this page.</p>
${s.cancel_url ? `<p><a href="${escapeHtml(s.cancel_url)}">Go back</a></p>` : ""}</body></html>`;
  }

  async function readBody(req: http.IncomingMessage): Promise<string> {
    const chunks: Buffer[] = [];
    let size = 0;
    for await (const chunk of req) {
      size += (chunk as Buffer).length;
      if (size > 1_000_000) throw new StripeError(413, "invalid_request_error", "Request body too large.");
      chunks.push(chunk as Buffer);
    }
    return Buffer.concat(chunks).toString("utf8");
  }

  function sendJson(res: http.ServerResponse, status: number, body: Json) {
    res.writeHead(status, { "content-type": "application/json", "request-id": id("req") });
    res.end(JSON.stringify(body));
  }

  function checkKey(req: http.IncomingMessage) {
    const auth = req.headers.authorization ?? "";
    const key = auth.startsWith("Bearer ") ? auth.slice(7) : auth.startsWith("Basic ") ? Buffer.from(auth.slice(6), "base64").toString().split(":")[0] : "";
    if (!key) throw new StripeError(401, "invalid_request_error", "You did not provide an API key.");
    if (!accounts.has(key)) throw new StripeError(401, "invalid_request_error", `Invalid API Key provided: ${key.slice(0, 8)}…`);
    return key;
  }

  function session(sessionId: string, key?: string): FakeSession {
    const s = sessions.get(sessionId);
    if (!s || (key !== undefined && !mine(s.id, key))) throw new StripeError(404, "invalid_request_error", `No such checkout.session: '${sessionId}'`, "id", "resource_missing");
    if (s.status === "open" && s.expires_at <= now()) expire(s);
    return s;
  }

  async function handleApi(req: http.IncomingMessage, res: http.ServerResponse, path: string[]) {
    const apiKey = checkKey(req);
    requests.push({ method: req.method ?? "GET", path: `/v1/${path.join("/")}`, key: apiKey });
    const outage = failures.find((f) => f.times > 0 && f.method === req.method && f.path === `/v1/${path.join("/")}`);
    if (outage) {
      outage.times--;
      await readBody(req);
      res.setHeader("stripe-should-retry", "false");
      throw new StripeError(500, "api_error", "An error occurred with our connection to Stripe (a failure set by the test).");
    }
    const body = req.method === "POST" || req.method === "DELETE" ? await readBody(req) : "";
    const key = req.headers["idempotency-key"];
    const idemKey = typeof key === "string" ? `${apiKey}:${path.join("/")}:${key}` : null;
    if (idemKey) {
      const seen = idempotency.get(idemKey);
      if (seen) {
        if (seen.body !== body) throw new StripeError(400, "idempotency_error", "Keys for idempotent requests can only be used with the same parameters they were first used with.");
        res.setHeader("idempotent-replayed", "true");
        return sendJson(res, seen.status, seen.response);
      }
    }
    const params = parseStripeForm(body);
    let out: Json;
    const [resource, a, b] = path;
    if (req.method === "POST" && resource === "checkout" && a === "sessions" && !b) {
      const s = createSession(params);
      if (apiKey !== options.secretKey) ownerOf.set(s.id, apiKey);
      out = publicSession(s);
    } else if (req.method === "GET" && resource === "checkout" && a === "sessions" && b && path[3] === "line_items") out = lineItemList(session(b, apiKey));
    else if (req.method === "GET" && resource === "checkout" && a === "sessions" && b && !path[3]) out = publicSession(session(b, apiKey));
    else if (req.method === "POST" && resource === "checkout" && a === "sessions" && b && path[3] === "expire") {
      const s = session(b, apiKey);
      expire(s);
      out = publicSession(s);
    } else if (req.method === "POST" && resource === "refunds" && !a) out = refund(params, apiKey);
    else if (req.method === "GET" && resource === "charges" && a) {
      const charge = [...charges.values()].find((c) => c.id === a);
      if (!charge || !mine(charge.id, apiKey)) throw new StripeError(404, "invalid_request_error", `No such charge: '${a}'`, "id", "resource_missing");
      out = { ...charge, object: "charge", refunded: charge.amount_refunded === charge.amount };
    } else if (req.method === "GET" && resource === "payment_intents" && a && !b) {
      // A payment intent with its charge: as Stripe answers with expand[]=latest_charge (the app's only read of one).
      const charge = charges.get(a);
      if (!charge || !mine(charge.id, apiKey)) throw new StripeError(404, "invalid_request_error", `No such payment_intent: '${a}'`, "id", "resource_missing");
      const latest = { ...charge, object: "charge", refunded: charge.amount_refunded === charge.amount };
      out = { id: a, object: "payment_intent", amount: charge.amount, currency: charge.currency, status: "succeeded", latest_charge: latest };
    } else if (req.method === "GET" && resource === "events" && a) {
      const e = events.find((x) => x.id === a);
      if (!e) throw new StripeError(404, "invalid_request_error", `No such event: '${a}'`, "id", "resource_missing");
      out = e as unknown as Json;
    } else if (req.method === "GET" && resource === "balance" && !a) out = { object: "balance", livemode: false, available: [], pending: [] };
    else {
      // A subscription (and its invoices) belongs to the account it was bought under, as at Stripe.
      if ((resource === "subscriptions" || resource === "invoices") && a && !mine(resource === "invoices" ? (invoiceSubscription(a) ?? a) : a, apiKey)) {
        throw new StripeError(404, "invalid_request_error", `No such ${resource === "invoices" ? "invoice" : "subscription"}: '${a}'`, "id", "resource_missing");
      }
      const recurring = billing.handle(req.method ?? "GET", path, params);
      if (!recurring) throw new StripeError(404, "invalid_request_error", `Unrecognized request URL (${req.method}: /v1/${path.join("/")}).`);
      out = recurring;
    }
    if (idemKey) idempotency.set(idemKey, { body, status: 200, response: out });
    sendJson(res, 200, out);
  }

  const server = http.createServer(async (req, res) => {
    const url = new URL(req.url ?? "/", "http://fake.local");
    const path = url.pathname.split("/").filter(Boolean);
    try {
      if (path[0] === "v1") return await handleApi(req, res, path.slice(1));
      // Fake-only test knobs (no such endpoints at Stripe): an outage of the next calls to one path (failNext);
      // renew, settle or lapse a subscription.
      if (path[0] === "_test" && req.method === "POST") {
        checkKey(req);
        const body = parseStripeForm(await readBody(req));
        if (path[1] === "fail-next" && typeof body.method === "string" && typeof body.path === "string") {
          failNext(body.method, body.path, Number(body.times ?? 1));
          return sendJson(res, 200, { failing: { method: body.method, path: body.path } });
        }
        // A renewal's charge and events belong to the account the subscription was bought under.
        acting = path[1] === "subscriptions" && path[2] ? ownerOf.get(path[2]) : undefined;
        try {
          return sendJson(res, 200, billing.knob(path.slice(1), body));
        } finally {
          acting = undefined;
        }
      }
      if (path[0] === "pay" && path[1]) {
        const s = session(path[1]);
        if (req.method === "POST" && path[2] === "cancel") {
          if (s.status === "open") expire(s);
          res.writeHead(303, { location: s.cancel_url ?? "/" });
          return res.end();
        }
        // As Stripe does: a session that expired (or was paid already) takes no payment; its page says so.
        if (s.status !== "open") {
          res.writeHead(410, { "content-type": "text/html; charset=utf-8" });
          return res.end(closedPage(s));
        }
        if (req.method === "GET") {
          res.writeHead(200, { "content-type": "text/html; charset=utf-8" });
          return res.end(paymentPage(s));
        }
        if (req.method === "POST") {
          const card = (new URLSearchParams(await readBody(req)).get("card") ?? "").replace(/\D/g, "");
          if (card === DECLINE_CARD) {
            res.writeHead(402, { "content-type": "text/html; charset=utf-8" });
            return res.end(paymentPage(s, "Your card was declined. Try another card, or cancel and go back."));
          }
          if (card !== SUCCESS_CARD) {
            res.writeHead(400, { "content-type": "text/html; charset=utf-8" });
            return res.end(paymentPage(s, "Use one of the test card numbers below."));
          }
          pay(s);
          res.writeHead(303, { location: s.success_url.replace("{CHECKOUT_SESSION_ID}", s.id) });
          return res.end();
        }
      }
      if (path[0] === "health") return sendJson(res, 200, { ok: true });
      throw new StripeError(404, "invalid_request_error", "Not found.");
    } catch (e) {
      const err = e instanceof StripeError ? e : new StripeError(500, "api_error", "The fake failed.");
      if (!(e instanceof StripeError)) console.error(e);
      sendJson(res, err.status, { error: { type: err.type, message: err.message, ...(err.param ? { param: err.param } : {}), ...(err.code ? { code: err.code } : {}) } });
    }
  });

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port ?? 0, options.host ?? "127.0.0.1", () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  baseUrl = `http://${options.host ?? "127.0.0.1"}:${port}`;

  return {
    port,
    url: baseUrl,
    sessions: () => [...sessions.values()],
    charges: () => [...charges.values()].map((c) => ({ ...c })),
    events: () => [...events],
    requests: () => [...requests],
    sessionKey: (sessionId) => (sessions.has(sessionId) ? (ownerOf.get(sessionId) ?? options.secretKey) : undefined),
    subscriptions: () => billing.subscriptions(),
    invoices: () => billing.invoices(),
    deliveries: () => [...deliveries],
    redeliver: async (eventId) => {
      const e = events.find((x) => x.id === eventId);
      if (!e) throw new Error(`no event ${eventId}`);
      return deliverOnce(e, 0);
    },
    failNext,
    close: () =>
      new Promise<void>((resolve) => {
        for (const t of timers) clearTimeout(t);
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
