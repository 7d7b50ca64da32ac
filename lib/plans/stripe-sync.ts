// Plan subscriptions as Stripe reports them. A webhook event only says "look again": the subscription
// (and the invoice) are re-read from Stripe and written, one subscription at a time, so replayed and
// out-of-order events end in the one state Stripe holds. Event ids are recorded as the payments code does.
import { and, eq, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { planInvoices, planSubscriptions, studios, stripeEvents, type PlanSubscription } from "@/db/schema";
import { PlanGraceEmail, planGraceSubject } from "@/emails/plan-grace";
import { recordAudit } from "@/lib/audit";
import { formatInstant } from "@/lib/format/dates";
import { conflict } from "@/lib/errors";
import { formatMoney } from "@/lib/format/money";
import { sendMail } from "@/lib/mail";
import { callStripe, eventObjectId, verifyStripeEvent, type Stripe, type StripeScope } from "@/lib/payments/stripe";
import { PLAN_FINAL, type PlanState } from "./states";
import { buyerHoldsPiece, livePlanOfPiece, moveSubscription, PLAN_GRACE_DAYS, pieceUrl } from "./subscriptions";
import { mailPaidAfterHandOn, mailPaidBackUnowed, mailRenewalHeld, planMailContext } from "./plan-mail";
import { planPrice } from "./price";
import { templateOf } from "./templates";

const PLAN_EVENTS = new Set(["customer.subscription.created", "customer.subscription.updated", "customer.subscription.deleted", "invoice.paid", "invoice.payment_failed", "checkout.session.completed"]);
const STRIPE = { actorId: null, source: "stripe" } as const;
const DAY_MS = 86_400_000;

// One sync (or staff/owner cancellation) per plan at a time in this process: each reads Stripe after
// the one before it has written, so an older answer can never be written over a newer one. Across
// processes the plan's version column (moveSubscription) and the one refund claim per plan hold.
const queues = new Map<string, Promise<unknown>>();
/** Runs `fn` after every earlier call with the same key (a Stripe subscription id, or the plan's id when it has none) has settled. */
export function withPlanLock<T>(key: string, fn: () => Promise<T>): Promise<T> {
  const run = (queues.get(key) ?? Promise.resolve()).then(fn, fn);
  const settled = run.catch(() => undefined);
  queues.set(key, settled);
  void settled.then(() => {
    if (queues.get(key) === settled) queues.delete(key);
  });
  return run;
}

const ms = (sec: number | null | undefined) => (sec == null ? null : new Date(sec * 1000));

/** The state Stripe's subscription stands for. */
function stateOf(s: Stripe.Subscription): PlanState {
  switch (s.status) {
    case "active":
    case "trialing":
      return s.cancel_at_period_end || s.cancel_at ? "ending" : "running";
    case "past_due":
    case "unpaid":
      // Cancelled while a renewal is overdue: it ends as asked (at cancel_at), no longer waits in grace.
      return s.cancel_at_period_end || s.cancel_at ? "ending" : "grace";
    case "canceled":
      return s.cancellation_details?.reason === "payment_failed" ? "lapsed" : "ended";
    case "incomplete_expired":
      return "ended";
    default:
      return "awaiting_payment";
  }
}

function findRow(s: Stripe.Subscription): PlanSubscription | undefined {
  const db = getDb();
  const byId = db.select().from(planSubscriptions).where(eq(planSubscriptions.stripeSubscriptionId, s.id)).get();
  if (byId) return byId;
  const { planSubscriptionId, studioId } = s.metadata ?? {};
  if (!planSubscriptionId || !studioId) return undefined;
  return db.select().from(planSubscriptions).where(and(eq(planSubscriptions.id, planSubscriptionId), eq(planSubscriptions.studioId, studioId))).get();
}

/**
 * Why a paid invoice is owed by nobody, or null when it is owed:
 *  - "after_end": it bills a period that starts at or after the end the plan was given (cancelled, or its
 *    piece changed hands, lib/plans/transfer.ts), or any new one after the plan passed on with its piece
 *    (no buyer: it isn't renewed on the former owner's card). Stripe charges one only when it renewed
 *    before it was told of the end (the hand-over's Stripe step failed and waits for its retry).
 *  - "piece_covered": the first payment of a plan for a piece another plan already covers (one piece,
 *    one plan: staff started one paid by other means, or another checkout was paid first, while this
 *    payment page was open).
 */
type NotOwed = "after_end" | "piece_covered";
function notOwed(sub: PlanSubscription, inv: Stripe.Invoice): NotOwed | null {
  const end = sub.endsAt ?? sub.endedAt;
  const start = ms(inv.lines?.data?.[0]?.period?.start ?? inv.period_start);
  if (sub.ownerId === null || (end && start && start >= end)) return "after_end";
  if (sub.state === "awaiting_payment") {
    const live = livePlanOfPiece(sub.pieceId);
    if (live && live.sub.id !== sub.id) return "piece_covered";
  }
  return null;
}

/**
 * Whether a paid invoice is the plan's: the amount, currency and template version it was bought at,
 * owed by someone (notOwed), and, for the first payment, paid while its buyer holds the piece (a
 * checkout opened before they handed it on and paid after is held for staff like a wrong amount,
 * lib/plans/held.ts; a running plan's hand-over is lib/plans/transfer.ts's).
 */
function matchesPlan(sub: PlanSubscription, inv: Stripe.Invoice): boolean {
  const meta = inv.parent?.subscription_details?.metadata ?? {};
  return (
    inv.amount_paid === sub.amountMinor &&
    meta.templateId === sub.templateId &&
    inv.currency.toUpperCase() === sub.currency.toUpperCase() &&
    (sub.state !== "awaiting_payment" || buyerHoldsPiece(sub)) &&
    notOwed(sub, inv) === null
  );
}

/** Held or unowed payments paid back in full (by staff, lib/plans/held.ts, or at once here): they never count. */
const PAID_BACK_IN_FULL: readonly (string | null)[] = ["refunded_and_ended", "refunded_after_end", "refunded_not_owed"];

/** What was written of an invoice before: whether it counted, and what was decided about it if it was held. */
function writtenBefore(invoiceId: string | undefined) {
  if (!invoiceId) return undefined;
  return getDb().select({ counts: planInvoices.counts, resolution: planInvoices.heldResolution }).from(planInvoices).where(eq(planInvoices.stripeInvoiceId, invoiceId)).get();
}

/**
 * Whether an invoice counts whatever it is compared with now: one that counted keeps counting when it is
 * read again after the plan ended or moved on, and one staff took as the period's payment though it was
 * held (lib/plans/held.ts) counts; one paid back in full never does.
 */
function takenByStaff(invoiceId: string | undefined): boolean {
  const row = writtenBefore(invoiceId);
  if (!row || PAID_BACK_IN_FULL.includes(row.resolution)) return false;
  return row.counts || row.resolution === "accepted" || row.resolution === "difference_refunded";
}

const paidBackInFull = (invoiceId: string | undefined) => PAID_BACK_IN_FULL.includes(writtenBefore(invoiceId)?.resolution ?? null);

/** A paid invoice that isn't the plan's price: not accepted as a payment of the plan; held for staff (unless staff took it). */
const isHeld = (sub: PlanSubscription, inv: Stripe.Invoice | null) => inv?.status === "paid" && !matchesPlan(sub, inv) && !takenByStaff(inv.id);

/** The payment intent of one of the plan's Stripe invoices, read under the account the plan was bought under. */
export async function invoicePaymentIntent(sub: PlanSubscription, stripeInvoiceId: string): Promise<string> {
  const invoice = await callStripe("read the held payment", (s) => s.invoices.retrieve(stripeInvoiceId, { expand: ["payments"] }), sub);
  const pi = invoice.payments?.data?.[0]?.payment?.payment_intent;
  const id = typeof pi === "string" ? pi : pi?.id;
  if (!id) throw conflict("This payment can't be paid back by card. Settle it with the owner by other means.");
  return id;
}

/**
 * A paid invoice owed by nobody (notOwed) is not held for staff: there is nothing to decide. It is paid
 * back in full at once: claimed on its row first (one claim per invoice, so a replayed event pays back
 * once); for a plan that must not start (its piece is covered), its Stripe subscription is ended so
 * nothing more is charged; the refund is asked with the invoice row's idempotency key; then the plan
 * ends (that case), it is audited, and the person who paid is told. If Stripe fails, the claim is undone
 * and the error stands, so Stripe sends the event again.
 */
async function payBackUnowed(sub: PlanSubscription, inv: Stripe.Invoice): Promise<void> {
  const why = inv.status === "paid" ? notOwed(sub, inv) : null;
  if (!why) return;
  const db = getDb();
  const claimed = db
    .update(planInvoices)
    .set({ heldResolution: why === "after_end" ? "refunded_after_end" : "refunded_not_owed", heldRefundedMinor: inv.amount_paid, heldResolvedAt: new Date(), heldResolvedById: null })
    .where(and(eq(planInvoices.stripeInvoiceId, inv.id!), eq(planInvoices.counts, false), isNull(planInvoices.heldResolution)))
    .returning()
    .get();
  if (!claimed) return;
  try {
    if (why === "piece_covered" && sub.stripeSubscriptionId) {
      await callStripe("end the plan that can't start", (s) => s.subscriptions.cancel(sub.stripeSubscriptionId!, {}, { idempotencyKey: `plan-not-owed-end-${claimed.id}` }), sub);
    }
    const paymentIntent = await invoicePaymentIntent(sub, inv.id!);
    await callStripe("pay back a payment nobody owed", (s) => s.refunds.create({ payment_intent: paymentIntent, metadata: { planSubscriptionId: sub.id, planInvoiceId: claimed.id } }, { idempotencyKey: `plan-after-end-${claimed.id}` }), sub);
  } catch (e) {
    db.update(planInvoices).set({ heldResolution: null, heldRefundedMinor: 0, heldResolvedAt: null }).where(eq(planInvoices.id, claimed.id)).run();
    throw e;
  }
  db.transaction((tx) => {
    const cur = tx.select().from(planSubscriptions).where(eq(planSubscriptions.id, sub.id)).get()!;
    if (why === "piece_covered" && !PLAN_FINAL.includes(cur.state)) moveSubscription(tx, cur, "ended", { endedAt: new Date(), endsAt: new Date() }, STRIPE);
    const data = { invoiceId: claimed.id, stripeInvoiceId: inv.id, amountMinor: inv.amount_paid, currency: claimed.currency, reason: why, periodStart: claimed.periodStart?.toISOString() ?? null };
    recordAudit(tx, { studioId: sub.studioId, actorId: null, action: "plan.payment_refunded_automatically", subjectType: "plan_subscription", subjectId: sub.id, data });
  });
  // The person charged, from our own records: the plan's owner, or (a plan that passed on with its piece
  // has none) the person who paid for it, kept on the plan (payerId) — no call to Stripe that could fail.
  await mailPaidBackUnowed(sub, sub.ownerId ?? sub.payerId, claimed, why);
}

/**
 * Writes one Stripe invoice of the plan: paid or failed, and whether it counts (the plan's amount and
 * template version). A paid invoice that doesn't count is audited once, when first written, for staff;
 * then it is answered (what was held), else null.
 */
function recordInvoice(sub: PlanSubscription, inv: Stripe.Invoice): { amountMinor: number; currency: string; at: Date } | null {
  const paid = inv.status === "paid";
  const counts = paid && !paidBackInFull(inv.id) && (matchesPlan(sub, inv) || takenByStaff(inv.id));
  const template = templateOf(sub.studioId, sub.templateId);
  const studio = getDb().select().from(studios).where(eq(studios.id, sub.studioId)).get()!;
  const price = planPrice(studio, template);
  const taxMinor = counts && price.totalMinor === inv.amount_paid ? price.taxMinor : 0;
  const values = {
    studioId: sub.studioId,
    subscriptionId: sub.id,
    stripeInvoiceId: inv.id!,
    status: paid ? ("paid" as const) : ("failed" as const),
    amountMinor: paid ? inv.amount_paid : inv.amount_due,
    taxMinor,
    currency: inv.currency.toUpperCase(),
    counts,
    periodStart: ms(inv.lines?.data?.[0]?.period?.start ?? inv.period_start),
    periodEnd: ms(inv.lines?.data?.[0]?.period?.end ?? inv.period_end),
    at: ms(inv.status_transitions?.paid_at ?? inv.created)!,
  };
  return getDb().transaction((tx) => {
    const before = tx.select({ counts: planInvoices.counts, status: planInvoices.status }).from(planInvoices).where(eq(planInvoices.stripeInvoiceId, inv.id!)).get();
    tx.insert(planInvoices)
      .values(values)
      .onConflictDoUpdate({ target: planInvoices.stripeInvoiceId, set: { status: values.status, amountMinor: values.amountMinor, taxMinor, counts, at: values.at } })
      .run();
    // A payment nobody owes is not held for staff: payBackUnowed pays it back.
    if (paid && !counts && notOwed(sub, inv) === null && !(before?.status === "paid" && !before.counts)) {
      const data = { stripeInvoiceId: inv.id, amountMinor: inv.amount_paid, expectedMinor: sub.amountMinor, currency: values.currency, templateId: inv.parent?.subscription_details?.metadata?.templateId ?? null };
      recordAudit(tx, { studioId: sub.studioId, actorId: null, action: "plan.payment_held", subjectType: "plan_subscription", subjectId: sub.id, data });
      return { amountMinor: values.amountMinor, currency: values.currency, at: values.at };
    }
    return null;
  });
}

/**
 * Re-reads a Stripe subscription (and, when given, one of its invoices) and writes what it says: the
 * plan's state and period, the invoice, and the grace mail when the plan has just entered grace.
 * `scope` is whose account to read it under: the studio whose endpoint the event came to, the plan
 * row itself (the account it was bought under), or nothing for the install's endpoint.
 */
export function syncPlanSubscription(stripeSubscriptionId: string, invoiceId?: string, scope?: StripeScope): Promise<PlanSubscription | null> {
  const studioId = typeof scope === "string" ? scope : scope?.studioId;
  return withPlanLock(stripeSubscriptionId, async () => {
    const s = await callStripe("read the plan's subscription", (stripe) => stripe.subscriptions.retrieve(stripeSubscriptionId), scope);
    const row = findRow(s);
    // Read under a studio's own key (its own webhook endpoint), a subscription moves only that studio's plan.
    if (!row || (studioId !== undefined && row.studioId !== studioId)) return null;
    const invoice = invoiceId ? await callStripe("read the plan's invoice", (stripe) => stripe.invoices.retrieve(invoiceId), scope) : null;
    const latestId = typeof s.latest_invoice === "string" ? s.latest_invoice : (s.latest_invoice?.id ?? null);
    const latest = latestId ? (latestId === invoice?.id ? invoice : await callStripe("read the plan's latest invoice", (stripe) => stripe.invoices.retrieve(latestId), scope)) : null;
    const stripeState = stateOf(s);
    const overdue = stripeState === "grace" ? latest : null;
    // The latest invoice paid at an amount that isn't the plan's is not a renewal: the plan keeps the
    // period (and state) it had, and the payment is held for staff (recordInvoice audits it).
    const held = isHeld(row, latest);
    const item = s.items.data[0];
    const db = getDb();
    const { before, after } = db.transaction((tx) => {
      const fresh = tx.select().from(planSubscriptions).where(eq(planSubscriptions.id, row.id)).get()!;
      const target: PlanState = held && stripeState === "running" ? fresh.state : stripeState;
      const set: Partial<PlanSubscription> = {
        stripeSubscriptionId: s.id,
        stripeCustomerId: typeof s.customer === "string" ? s.customer : s.customer.id,
        ...(held ? {} : { periodStart: ms(item?.current_period_start), periodEnd: ms(item?.current_period_end) }),
      };
      if (target === "ending") set.endsAt = ms(s.cancel_at) ?? (held ? fresh.periodEnd : ms(item?.current_period_end));
      if (target === "running") set.endsAt = null;
      if (target === "lapsed") set.lapsedAt = ms(s.ended_at ?? s.canceled_at);
      if (target === "ended") set.endedAt = ms(s.ended_at ?? s.canceled_at);
      if (target === "grace" && stripeState === "grace") set.graceEndsAt = new Date((overdue?.created ?? Math.floor(Date.now() / 1000)) * 1000 + PLAN_GRACE_DAYS * DAY_MS);
      if (target === "running" || target === "ending") set.graceEndsAt = null;
      if (!fresh.startedAt && target !== "awaiting_payment") set.startedAt = ms(s.start_date);
      // A final plan stays as it is: Stripe can't bring back a lapsed or ended plan.
      if (PLAN_FINAL.includes(fresh.state)) return { before: fresh, after: fresh };
      return { before: fresh, after: moveSubscription(tx, fresh, target, set, STRIPE) };
    });
    const heldNow = [invoice ? recordInvoice(after, invoice) : null, latest && latest.id !== invoice?.id && latest.status === "paid" ? recordInvoice(after, latest) : null].find(Boolean);
    for (const inv of new Set([invoice, latest])) if (inv) await payBackUnowed(after, inv);
    if (before.state !== "grace" && after.state === "grace") await mailGrace(after);
    // A first payment held because its buyer had handed the piece on: they are told (lib/plans/held.ts).
    if (heldNow && after.state === "awaiting_payment" && !buyerHoldsPiece(after)) await mailPaidAfterHandOn(after, heldNow, "held");
    // A renewal held because it was charged at another amount than the plan's price: the owner is told
    // it is being checked (once: recordInvoice answers a hold only when it first writes it). A hold for a
    // template version alone charged the right amount and has no words for the owner beyond the settling.
    else if (heldNow && after.state !== "awaiting_payment" && (heldNow.amountMinor !== after.amountMinor || heldNow.currency !== after.currency.toUpperCase())) await mailRenewalHeld(after, heldNow);
    return after;
  });
}

async function mailGrace(sub: PlanSubscription) {
  const context = planMailContext(sub);
  if (!context) return;
  const { owner, studio, piece, zone, names } = context;
  await sendMail({
    studioId: sub.studioId,
    to: owner.email,
    subject: planGraceSubject(names),
    email: PlanGraceEmail({
      ...names,
      amount: formatMoney(sub.amountMinor, sub.currency, studio.country),
      graceEndsOn: formatInstant(sub.graceEndsAt ?? new Date(), zone),
      url: pieceUrl(piece.id),
    }),
  });
}

type EventObject = { id: string; object?: string; mode?: string; subscription?: string | { id: string } | null; parent?: { subscription_details?: { subscription?: string | { id: string } } | null } | null };

/** The Stripe subscription an event is about, or null when the event is not a plan's. */
function subscriptionOfEvent(event: Stripe.Event): { subscriptionId: string; invoiceId?: string } | null {
  if (!PLAN_EVENTS.has(event.type)) return null;
  const o = event.data.object as unknown as EventObject;
  // Text ids only: a signed body of another shape names no subscription.
  const idOf = (v: string | { id: string } | null | undefined) => {
    const id: unknown = typeof v === "string" ? v : v?.id;
    return typeof id === "string" && id !== "" ? id : null;
  };
  if (event.type.startsWith("customer.subscription.")) return { subscriptionId: eventObjectId(event) };
  if (event.type.startsWith("invoice.")) {
    const sid = idOf(o.parent?.subscription_details?.subscription);
    return sid ? { subscriptionId: sid, invoiceId: eventObjectId(event) } : null;
  }
  if (event.type === "checkout.session.completed" && o.mode === "subscription") {
    const sid = idOf(o.subscription);
    return sid ? { subscriptionId: sid } : null;
  }
  return null;
}

/**
 * A Stripe webhook for plans: verified on the raw body like every event; null when it is not a plan's
 * event (the payments code handles it then). Each event id is recorded once.
 */
export async function handlePlanWebhook(rawBody: string, signature: string | null, studioId?: string): Promise<{ received: true; duplicate?: boolean } | null> {
  const event = verifyStripeEvent(rawBody, signature, studioId);
  const about = subscriptionOfEvent(event);
  if (!about) return null;
  const db = getDb();
  if (db.select({ id: stripeEvents.id }).from(stripeEvents).where(eq(stripeEvents.id, event.id)).get()) return { received: true, duplicate: true };
  await syncPlanSubscription(about.subscriptionId, about.invoiceId, studioId);
  db.insert(stripeEvents).values({ id: event.id, type: event.type, objectId: about.invoiceId ?? about.subscriptionId }).onConflictDoNothing().run();
  return { received: true };
}
