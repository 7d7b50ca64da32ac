// The Stripe fake's recurring billing: Prices, Customers, Subscriptions and Invoices, started from a
// Checkout Session in subscription mode, and a fake-only test knob (/_test/subscriptions/:id/…) that
// renews a period (paid or failed), settles an overdue invoice, or gives up on it as Stripe does
// when its retries run out. Objects carry the period on the subscription item and the invoice's
// subscription under parent.subscription_details, as current API versions do. Nothing here imports app code.
type Json = Record<string, unknown>;

export type FakeFail = (status: number, message: string, param?: string) => never;

export type FakePrice = { id: string; object: "price"; active: true; currency: string; unit_amount: number; product: string; recurring: { interval: "year" | "month"; interval_count: 1 }; metadata: Record<string, string>; created: number; livemode: false };
export type FakeCustomer = { id: string; object: "customer"; email: string | null; name: string | null; metadata: Record<string, string>; created: number; livemode: false };
export type FakeSubscription = {
  id: string;
  object: "subscription";
  customer: string;
  status: "active" | "past_due" | "canceled";
  cancel_at_period_end: boolean;
  /** A set end (epoch seconds) before the period's end; null when none. */
  cancel_at: number | null;
  canceled_at: number | null;
  ended_at: number | null;
  cancellation_details: { reason: "cancellation_requested" | "payment_failed" | null };
  start_date: number;
  created: number;
  latest_invoice: string | null;
  metadata: Record<string, string>;
  items: { object: "list"; data: { id: string; object: "subscription_item"; price: FakePrice; quantity: 1; current_period_start: number; current_period_end: number }[] };
  livemode: false;
};
export type FakeInvoice = {
  id: string;
  object: "invoice";
  customer: string;
  status: "open" | "paid";
  billing_reason: "subscription_create" | "subscription_cycle";
  amount_due: number;
  amount_paid: number;
  currency: string;
  attempt_count: number;
  period_start: number;
  period_end: number;
  parent: { type: "subscription_details"; subscription_details: { subscription: string; metadata: Record<string, string> } };
  lines: { object: "list"; data: { id: string; amount: number; currency: string; period: { start: number; end: number }; pricing: { price_details: { price: string } } }[] };
  status_transitions: { paid_at: number | null };
  /** The payment that settled the invoice (a payment intent refunds can name), as current API versions list it. */
  payments: { object: "list"; data: { id: string; object: "invoice_payment"; amount_paid: number; status: "paid"; payment: { type: "payment_intent"; payment_intent: string } }[] };
  created: number;
  livemode: false;
};

export function addInterval(epochSec: number, interval: "year" | "month"): number {
  const d = new Date(epochSec * 1000);
  if (interval === "year") d.setUTCFullYear(d.getUTCFullYear() + 1);
  else d.setUTCMonth(d.getUTCMonth() + 1);
  return Math.floor(d.getTime() / 1000);
}

/**
 * deps.charge records a captured charge in the fake's charge book and returns its payment intent, so a
 * paid invoice can be refunded through POST /v1/refunds like any other payment.
 */
export function createSubscriptionBilling(deps: { id: (prefix: string) => string; now: () => number; emit: (type: string, object: Json) => void; fail: FakeFail; charge?: (amount: number, currency: string) => string }) {
  const { id, now, emit, fail } = deps;
  const prices = new Map<string, FakePrice>();
  const customers = new Map<string, FakeCustomer>();
  const subscriptions = new Map<string, FakeSubscription>();
  const invoices = new Map<string, FakeInvoice>();

  const str = (v: unknown) => (typeof v === "string" ? v : undefined);
  const meta = (v: unknown) => (v && typeof v === "object" ? (v as Record<string, string>) : {});
  const snapshot = <T>(o: T) => structuredClone(o) as unknown as Json;

  function createPrice(params: Json): FakePrice {
    const currency = str(params.currency)?.toLowerCase() ?? fail(400, "Missing required param: currency.", "currency");
    const amount = Number(str(params.unit_amount));
    if (!Number.isInteger(amount) || amount <= 0) fail(400, "unit_amount must be a whole number above 0.", "unit_amount");
    const recurring = meta(params.recurring);
    const interval = recurring.interval;
    if (interval !== "year" && interval !== "month") fail(400, "recurring[interval] must be year or month in this fake.", "recurring[interval]");
    const productName = str(meta(params.product_data).name) ?? fail(400, "Missing required param: product_data[name].", "product_data[name]");
    const price: FakePrice = { id: id("price"), object: "price", active: true, currency, unit_amount: amount, product: `prod_${productName.length}_${id("x").slice(-8)}`, recurring: { interval: interval as "year" | "month", interval_count: 1 }, metadata: meta(params.metadata), created: now(), livemode: false };
    prices.set(price.id, price);
    return price;
  }

  function createCustomer(params: Json): FakeCustomer {
    const c: FakeCustomer = { id: id("cus"), object: "customer", email: str(params.email) ?? null, name: str(params.name) ?? null, metadata: meta(params.metadata), created: now(), livemode: false };
    customers.set(c.id, c);
    return c;
  }

  function price(priceId: string, param: string): FakePrice {
    return prices.get(priceId) ?? fail(400, `No such price: '${priceId}'`, param);
  }

  /** The line items of a subscription-mode session: one recurring price, quantity 1. */
  function sessionLines(items: unknown[]) {
    if (items.length !== 1) fail(400, "This fake takes exactly one line item in subscription mode.", "line_items");
    const item = items[0] as Json;
    const p = price(str(item.price) ?? fail(400, "Missing required param: line_items[0][price].", "line_items[0][price]"), "line_items[0][price]");
    if (str(item.quantity) !== undefined && str(item.quantity) !== "1") fail(400, "quantity must be 1 in this fake.", "line_items[0][quantity]");
    return { currency: p.currency, lines: [{ name: `Plan (${p.recurring.interval}ly)`, unit_amount: p.unit_amount, quantity: 1, price: p.id }] };
  }

  function newInvoice(sub: FakeSubscription, reason: FakeInvoice["billing_reason"], paid: boolean, amount?: number): FakeInvoice {
    const item = sub.items.data[0]!;
    const at = now();
    const due = amount ?? item.price.unit_amount;
    const inv: FakeInvoice = {
      id: id("in"),
      object: "invoice",
      customer: sub.customer,
      status: paid ? "paid" : "open",
      billing_reason: reason,
      amount_due: due,
      amount_paid: paid ? due : 0,
      currency: item.price.currency,
      attempt_count: 1,
      period_start: item.current_period_start,
      period_end: item.current_period_end,
      parent: { type: "subscription_details", subscription_details: { subscription: sub.id, metadata: { ...sub.metadata } } },
      lines: { object: "list", data: [{ id: id("il"), amount: due, currency: item.price.currency, period: { start: item.current_period_start, end: item.current_period_end }, pricing: { price_details: { price: item.price.id } } }] },
      status_transitions: { paid_at: paid ? at : null },
      payments: { object: "list", data: [] },
      created: at,
      livemode: false,
    };
    if (paid) markPaid(inv);
    invoices.set(inv.id, inv);
    sub.latest_invoice = inv.id;
    return inv;
  }

  function markPaid(inv: FakeInvoice) {
    const pi = deps.charge?.(inv.amount_paid, inv.currency);
    if (pi) inv.payments.data.push({ id: id("inpay"), object: "invoice_payment", amount_paid: inv.amount_paid, status: "paid", payment: { type: "payment_intent", payment_intent: pi } });
  }

  /** A subscription-mode session was paid: the customer, the subscription and its first invoice. */
  function startFromSession(session: { customer_email: string | null; customer: string | null; line_items: { price?: string }[]; subscription_data: Json }): { customer: string; subscription: string } {
    const customer = session.customer && customers.has(session.customer) ? session.customer : createCustomer({ email: session.customer_email ?? undefined }).id;
    const p = price(session.line_items[0]!.price!, "line_items[0][price]");
    const start = now();
    const sub: FakeSubscription = {
      id: id("sub"),
      object: "subscription",
      customer,
      status: "active",
      cancel_at_period_end: false,
      cancel_at: null,
      canceled_at: null,
      ended_at: null,
      cancellation_details: { reason: null },
      start_date: start,
      created: start,
      latest_invoice: null,
      metadata: meta(session.subscription_data.metadata),
      items: { object: "list", data: [{ id: id("si"), object: "subscription_item", price: p, quantity: 1, current_period_start: start, current_period_end: addInterval(start, p.recurring.interval) }] },
      livemode: false,
    };
    subscriptions.set(sub.id, sub);
    const inv = newInvoice(sub, "subscription_create", true);
    emit("customer.subscription.created", snapshot(sub));
    emit("invoice.paid", snapshot(inv));
    return { customer, subscription: sub.id };
  }

  function subscription(subId: string): FakeSubscription {
    return subscriptions.get(subId) ?? fail(404, `No such subscription: '${subId}'`, "id");
  }

  function end(sub: FakeSubscription, reason: "cancellation_requested" | "payment_failed", at: number) {
    sub.status = "canceled";
    sub.canceled_at ??= now();
    sub.ended_at = at;
    sub.cancellation_details = { reason };
    emit("customer.subscription.deleted", snapshot(sub));
  }

  function update(sub: FakeSubscription, params: Json): FakeSubscription {
    if (sub.status === "canceled") fail(400, "A canceled subscription can't be updated.", "id");
    const flag = str(params.cancel_at_period_end);
    if (flag !== undefined) {
      if (flag !== "true" && flag !== "false") fail(400, "cancel_at_period_end must be true or false.", "cancel_at_period_end");
      sub.cancel_at_period_end = flag === "true";
      sub.canceled_at = sub.cancel_at_period_end ? now() : null;
      sub.cancellation_details = { reason: sub.cancel_at_period_end ? "cancellation_requested" : null };
      if (sub.cancel_at_period_end) sub.cancel_at = null;
    }
    const at = params.cancel_at;
    if (at !== undefined) {
      // As Stripe: an end date before the period's end; "" clears it (the plan renews again).
      if (at === "") {
        sub.cancel_at = null;
        if (!sub.cancel_at_period_end) {
          sub.canceled_at = null;
          sub.cancellation_details = { reason: null };
        }
      } else {
        const when = Number(str(at));
        const periodEnd = sub.items.data[0]!.current_period_end;
        if (!Number.isInteger(when) || when <= now() || when > periodEnd) fail(400, "cancel_at must be a time in the future, no later than the current period's end.", "cancel_at");
        sub.cancel_at_period_end = when === periodEnd;
        sub.cancel_at = when === periodEnd ? null : when;
        sub.canceled_at = now();
        sub.cancellation_details = { reason: "cancellation_requested" };
      }
    }
    if (params.metadata) sub.metadata = { ...sub.metadata, ...meta(params.metadata) };
    emit("customer.subscription.updated", snapshot(sub));
    return sub;
  }

  /**
   * Test knob: the period ends. Paid → a new period and a paid invoice; failed → a new period, an open
   * invoice, past_due; cancel at period end (or at a set end) → canceled then. `amount` bills another
   * amount than the price (as an edited price or a coupon would), to test what the app accepts.
   */
  function renew(sub: FakeSubscription, outcome: string, amount?: string) {
    if (sub.status === "canceled") fail(400, "This subscription has ended.", "id");
    const item = sub.items.data[0]!;
    if (sub.cancel_at_period_end || sub.cancel_at) {
      end(sub, "cancellation_requested", sub.cancel_at ?? item.current_period_end);
      return;
    }
    if (outcome !== "pay" && outcome !== "fail") fail(400, "outcome must be pay or fail.", "outcome");
    const billed = amount === undefined ? undefined : Number(amount);
    if (billed !== undefined && (!Number.isInteger(billed) || billed <= 0)) fail(400, "amount must be a whole number above 0.", "amount");
    item.current_period_start = item.current_period_end;
    item.current_period_end = addInterval(item.current_period_start, item.price.recurring.interval);
    const inv = newInvoice(sub, "subscription_cycle", outcome === "pay", billed);
    sub.status = outcome === "pay" ? "active" : "past_due";
    emit(outcome === "pay" ? "invoice.paid" : "invoice.payment_failed", snapshot(inv));
    emit("customer.subscription.updated", snapshot(sub));
  }

  /** Test knob: the overdue invoice is paid (the owner updated their card). */
  function settle(sub: FakeSubscription) {
    const open = sub.latest_invoice ? invoices.get(sub.latest_invoice) : undefined;
    const inv = sub.status === "past_due" && open?.status === "open" ? open : fail(400, "Nothing is overdue on this subscription.", "id");
    inv.status = "paid";
    inv.amount_paid = inv.amount_due;
    inv.attempt_count += 1;
    inv.status_transitions.paid_at = now();
    markPaid(inv);
    sub.status = "active";
    emit("invoice.paid", snapshot(inv));
    emit("customer.subscription.updated", snapshot(sub));
  }

  /** Test knob: retries ran out on the overdue invoice; the subscription is canceled for non-payment. */
  function lapse(sub: FakeSubscription) {
    if (sub.status !== "past_due") fail(400, "Only an overdue subscription lapses.", "id");
    end(sub, "payment_failed", now());
  }

  /** The /v1 routes of recurring billing; undefined when the path is not one of them. */
  function handle(method: string, path: string[], params: Json): Json | undefined {
    const [resource, a, b] = path;
    if (resource === "prices" && method === "POST" && !a) return snapshot(createPrice(params));
    if (resource === "prices" && method === "GET" && a) return snapshot(price(a, "id"));
    if (resource === "customers" && method === "POST" && !a) return snapshot(createCustomer(params));
    if (resource === "customers" && method === "GET" && a) return snapshot(customers.get(a) ?? fail(404, `No such customer: '${a}'`, "id"));
    if (resource === "subscriptions" && a && !b) {
      if (method === "GET") return snapshot(subscription(a));
      if (method === "POST") return snapshot(update(subscription(a), params));
      if (method === "DELETE") {
        const sub = subscription(a);
        if (sub.status !== "canceled") end(sub, "cancellation_requested", now());
        return snapshot(sub);
      }
    }
    if (resource === "invoices" && method === "GET" && a) return snapshot(invoices.get(a) ?? fail(404, `No such invoice: '${a}'`, "id"));
    return undefined;
  }

  /** POST /_test/subscriptions/:id/(renew|settle|lapse): fake-only, for tests and the demo. */
  function knob(path: string[], params: Json): Json {
    const [resource, subId, action] = path;
    if (resource !== "subscriptions" || !subId) fail(404, "Unknown test knob.");
    const sub = subscription(subId!);
    if (action === "renew") renew(sub, str(params.outcome) ?? "pay", str(params.amount));
    else if (action === "settle") settle(sub);
    else if (action === "lapse") lapse(sub);
    else fail(404, "Unknown test knob.");
    return snapshot(sub);
  }

  return {
    sessionLines,
    startFromSession,
    handle,
    knob,
    subscriptions: () => [...subscriptions.values()].map((s) => structuredClone(s)),
    invoices: () => [...invoices.values()].map((i) => structuredClone(i)),
  };
}
