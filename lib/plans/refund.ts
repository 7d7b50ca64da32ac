// Money back when a plan ends early, by the studio's refund rule on the plan's template version:
//  - "none": a cancelled plan runs to the end of the period paid; nothing is paid back.
//  - "unused_share": a cancelled plan runs to the end of the plan month in progress (that month counts
//    as used); the whole months left of the period paid are paid back, pro rata.
// Two rules on purpose: each can be said to an owner in one sentence before they confirm, and each
// gives one end date and one amount; a monthly plan never has whole months left, so it never refunds.
// The refund is claimed (a plan_refunds row) in the transaction that checks the plan's version, then
// paid through Stripe with an idempotency key, audited, and mailed to the owner after commit.
import { and, desc, eq, isNotNull, lt } from "drizzle-orm";
import { getDb, type Db, type Tx } from "@/db/client";
import { planInvoices, planRefunds, planSubscriptions, type PlanRefund, type PlanSubscription, type PlanTemplate } from "@/db/schema";
import { PlanEndedEmail, planEndedSubject } from "@/emails/plan-ended";
import { recordAudit } from "@/lib/audit";
import { conflict, isAppError } from "@/lib/errors";
import { formatInstant, formatZone } from "@/lib/format/dates";
import { formatMoney } from "@/lib/format/money";
import { sendMail } from "@/lib/mail";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import { callStripe } from "@/lib/payments/stripe";
import { addPeriod } from "./periods";
import { planMailContext } from "./plan-mail";
import { myPiecesUrl, pieceUrl } from "./subscriptions";
import type { PlanRefundRule } from "./terms";


export type RefundQuote = {
  rule: PlanRefundRule;
  /** When the plan stops covering. */
  endsAt: Date;
  /** Whole months of the period paid left after the plan ends, and the months the period has. */
  months: number;
  monthsInPeriod: number;
  refundMinor: number;
  currency: string;
};

/** The months a plan's period has: 12 for a yearly plan, 1 for a monthly one. */
export const monthsIn = (t: Pick<PlanTemplate, "interval">) => (t.interval === "year" ? 12 : 1);

/**
 * What ending `sub` at `at` gives: its end date and the refund by its template's rule. `endsNow` (the
 * piece changed hands) ends it at `at`; a cancellation ends it by the rule. Only a paid period refunds:
 * a plan in grace (its renewal unpaid) or paid for no period gets nothing back.
 */
export function refundQuote(sub: PlanSubscription, template: Pick<PlanTemplate, "interval" | "refundRule">, at: Date, endsNow = false): RefundQuote {
  const monthsInPeriod = monthsIn(template);
  const base = {
    rule: template.refundRule,
    monthsInPeriod,
    currency: sub.currency,
  };
  const { periodStart, periodEnd } = sub;
  if (!periodStart || !periodEnd || periodEnd <= at)
    return {
      ...base,
      endsAt: endsNow || !periodEnd ? at : periodEnd,
      months: 0,
      refundMinor: 0,
    };
  if (template.refundRule === "none" || sub.state === "grace")
    return {
      ...base,
      endsAt: endsNow ? at : periodEnd,
      months: 0,
      refundMinor: 0,
    };
  // The plan month in progress: the first month boundary after `at` (counted from the period's start).
  let k = 1;
  while (k < monthsInPeriod && addPeriod(periodStart, "month", k) <= at) k++;
  const monthEnd = k >= monthsInPeriod ? periodEnd : addPeriod(periodStart, "month", k);
  const months = monthsInPeriod - k;
  // Pro rata by whole months of what was paid for the period, rounded down to the minor unit (common
  // practice, no published source): a renewal staff kept at another amount (lib/plans/held.ts) is
  // shared as paid, less what was paid back of it.
  const refundMinor = Math.floor((paidForPeriod(sub) * months) / monthsInPeriod);
  return { ...base, endsAt: endsNow ? at : monthEnd, months, refundMinor };
}

/** The refund of a plan, if one was claimed. */
export function refundOf(subscriptionId: string, db: Db | Tx = getDb()): PlanRefund | undefined {
  return db.select().from(planRefunds).where(eq(planRefunds.subscriptionId, subscriptionId)).get();
}

/**
 * Claims the refund inside the caller's transaction (the one that checked the plan's version and moved
 * it): one per plan — a second claim, from a cancellation racing this one, is a 409 and moves no money.
 * A plan paid by other means is recorded as the studio's to pay back.
 */
export function claimRefund(tx: Tx, sub: PlanSubscription, quote: RefundQuote, reason: PlanRefund["reason"], actorId: string | null): PlanRefund | null {
  if (quote.refundMinor <= 0) return null;
  if (refundOf(sub.id, tx)) throw conflict("This plan has already been refunded.");
  const row = tx
    .insert(planRefunds)
    .values({
      studioId: sub.studioId,
      subscriptionId: sub.id,
      subscriptionVersion: sub.version,
      amountMinor: quote.refundMinor,
      currency: quote.currency,
      months: quote.months,
      reason,
      status: sub.paidBy === "card" ? "requested" : "other_means",
      requestedById: actorId,
    })
    .returning()
    .get();
  recordAudit(tx, {
    studioId: sub.studioId,
    actorId,
    action: "plan.refund_claimed",
    subjectType: "plan_subscription",
    subjectId: sub.id,
    data: {
      refundId: row.id,
      amountMinor: row.amountMinor,
      months: row.months,
      of: quote.monthsInPeriod,
      rule: quote.rule,
      reason,
      version: sub.version,
    },
  });
  return row;
}

/** The payment that paid the plan's current period: its latest counted invoice (by card, or recorded for other means). */
function periodInvoice(sub: Pick<PlanSubscription, "id">, byCard = false) {
  return getDb()
    .select()
    .from(planInvoices)
    .where(and(eq(planInvoices.subscriptionId, sub.id), eq(planInvoices.status, "paid"), eq(planInvoices.counts, true), byCard ? isNotNull(planInvoices.stripeInvoiceId) : undefined))
    // The latest period first (two payments can carry the same second), then the latest payment.
    .orderBy(desc(planInvoices.periodStart), desc(planInvoices.at))
    .get();
}

/** What was paid for the plan's current period, less what was paid back of it; the plan's price when no payment is recorded. */
function paidForPeriod(sub: PlanSubscription): number {
  const inv = periodInvoice(sub);
  return inv ? inv.amountMinor - inv.heldRefundedMinor : sub.amountMinor;
}

/** The payment intent that paid the plan's current period (its latest counted Stripe invoice). */
async function paymentOfPeriod(sub: PlanSubscription): Promise<string> {
  const inv = periodInvoice(sub, true);
  if (!inv?.stripeInvoiceId) throw conflict("No card payment of this plan was found to refund. Refund it by other means.", { code: NO_CARD_PAYMENT });
  const invoice = await callStripe("read the plan's payment", (s) => s.invoices.retrieve(inv.stripeInvoiceId!, { expand: ["payments"] }), sub);
  const pi = invoice.payments?.data?.[0]?.payment?.payment_intent;
  const id = typeof pi === "string" ? pi : pi?.id;
  if (!id) throw conflict("The plan's payment can't be refunded by card. Refund it by other means.", { code: NO_CARD_PAYMENT });
  return id;
}

const NO_CARD_PAYMENT = "plan_refund_no_card_payment";

/** Staff's words for a refund the payment service refused (kept on the claim, plan_refunds.refused_words). */
const REFUSED_WORDS =
  "The payment service refused this refund, so nothing went back to the owner's card. Usually the card payment was already paid back, in part or in full, at the payment service, or can no longer take a refund. It won't be asked again: check the payment in the payment service, and pay the owner back by other means if it is still owed.";

/**
 * Pays a claimed refund through Stripe (idempotent: the key is the claim's id, so a retry can't pay
 * twice), marks it refunded and audits it. A refund already paid, refused, or owed by other means, is
 * returned as is. A refusal (Stripe answered no, or the plan has no card payment to refund) is not an
 * outage: nothing moved, and asking again would be refused again, so the claim is marked refused with
 * words for staff, audited, and not asked again (finishRequestedPlanRefunds reads only requested ones).
 * No answer at all still throws: Stripe may have made it, and the retry with the same key finds out.
 */
export async function payRefund(refund: PlanRefund, sub: PlanSubscription): Promise<PlanRefund> {
  if (refund.status !== "requested") return refund;
  let r: { id: string };
  try {
    const paymentIntent = await paymentOfPeriod(sub);
    r = await callStripe("pay the refund", (s) =>
      s.refunds.create(
        {
          payment_intent: paymentIntent,
          amount: refund.amountMinor,
          metadata: { planSubscriptionId: sub.id, planRefundId: refund.id },
        },
        { idempotencyKey: `plan-refund-${refund.id}` },
      ),
      sub,
    );
  } catch (e) {
    if (isAppError(e) && (e.code === "payment_service_refused" || e.code === NO_CARD_PAYMENT)) return markRefused(refund, sub, e.message);
    throw e;
  }
  return settleClaim(refund, sub, { status: "refunded", stripeRefundId: r.id, refundedAt: new Date() }, "plan.refunded", (done) => ({ refundId: done.id, stripeRefundId: r.id, amountMinor: done.amountMinor }));
}

/** Writes a claimed refund's outcome once (whichever request writes it first) and audits it; returns the claim as it then stands. */
function settleClaim(refund: PlanRefund, sub: PlanSubscription, set: Partial<PlanRefund>, action: string, data: (done: PlanRefund) => Record<string, unknown>): PlanRefund {
  return getDb().transaction((tx) => {
    const done = tx
      .update(planRefunds)
      .set(set)
      .where(and(eq(planRefunds.id, refund.id), eq(planRefunds.status, "requested")))
      .returning()
      .get();
    if (!done) return refundOf(sub.id, tx)!;
    recordAudit(tx, { studioId: sub.studioId, actorId: null, action, subjectType: "plan_subscription", subjectId: sub.id, data: data(done) });
    return done;
  });
}

/** Marks a claimed refund refused (once, whichever request writes it first) and audits it with the payment service's answer. */
function markRefused(refund: PlanRefund, sub: PlanSubscription, answer: string): PlanRefund {
  return settleClaim(refund, sub, { status: "refused", refusedWords: REFUSED_WORDS, refusedAt: new Date() }, "plan.refund_refused", (done) => ({ refundId: done.id, amountMinor: done.amountMinor, currency: done.currency, answer }));
}

/** Staff's words for the plan's refused refund, with when it was refused (in `timeZone`, named); null unless refused. */
export function refundRefusedForStaff(refund: PlanRefund | null | undefined, country: string, timeZone: string): string | null {
  if (refund?.status !== "refused" || !refund.refusedAt) return null;
  const amount = formatMoney(refund.amountMinor, refund.currency, country);
  return `Refund of ${amount} refused on ${formatInstant(refund.refusedAt, timeZone)} (${formatZone(timeZone)}). ${refund.refusedWords ?? REFUSED_WORDS}`;
}

/** Whether the studio, not the card, pays the refund back: a plan paid by other means, or a card refund the payment service refused. */
export const refundByStudio = (refund: Pick<PlanRefund, "status">) => refund.status === "other_means" || refund.status === "refused";

/** Mails the owner, after the change is committed, when their plan ends and what (if anything) comes back. */
export async function mailPlanEnding(sub: PlanSubscription, quote: RefundQuote, refund: PlanRefund | null, reason: PlanRefund["reason"]): Promise<void> {
  await mailAfterCommit("plan ending", async () => {
    const context = planMailContext(sub);
    if (!context) return;
    const { owner, studio, piece, zone } = context;
    const props = {
      ...context.names,
      reason,
      endsOn: `${formatInstant(quote.endsAt, zone)} (${formatZone(zone)})`,
      refund: refund ? formatMoney(refund.amountMinor, refund.currency, studio.country) : null,
      // A refused card refund is the studio's to pay back, as for a plan paid by other means.
      refundByOtherMeans: refund ? refundByStudio(refund) : false,
      months: quote.months,
      // The piece that changed hands is no longer theirs: its page would answer "not found".
      url: reason === "changed_hands" ? myPiecesUrl() : pieceUrl(piece.id),
    };
    await sendMail({
      studioId: sub.studioId,
      to: owner.email,
      subject: planEndedSubject(props),
      email: PlanEndedEmail(props),
    });
  });
}

/**
 * How long a claimed card refund waits before the scheduled pass asks Stripe for it: longer than a
 * cancellation can still be asking (lib/payments/stripe.ts: 10 s timeout, 2 retries). Asking alongside
 * would still pay once (the claim's idempotency key; the first answer written wins).
 */
export const REQUESTED_REFUND_WAIT_MS = 5 * 60_000;

/**
 * The scheduled pass (jobs/plan-transfers.ts): pays every card refund claimed on a cancellation that
 * Stripe didn't take at the time (an outage): the cancellation stood, the refund stayed owed. A plan
 * whose change of hands is unfinished is left to lib/plans/transfer.ts, which pays its refund itself.
 */
export async function finishRequestedPlanRefunds(now = new Date()): Promise<{ finished: string[]; refused: string[]; failed: string[] }> {
  const cutoff = new Date(now.getTime() - REQUESTED_REFUND_WAIT_MS);
  const open = getDb().select().from(planRefunds).where(and(eq(planRefunds.status, "requested"), lt(planRefunds.createdAt, cutoff))).all();
  const out = { finished: [] as string[], refused: [] as string[], failed: [] as string[] };
  for (const refund of open) {
    const sub = getDb().select().from(planSubscriptions).where(eq(planSubscriptions.id, refund.subscriptionId)).get();
    if (!sub || sub.transferStep) continue;
    try {
      const after = await payRefund(refund, sub);
      (after.status === "refused" ? out.refused : out.finished).push(refund.id);
    } catch (e) {
      console.error(`plan refund pass: ${refund.id} not paid yet`, e);
      out.failed.push(refund.id);
    }
  }
  return out;
}
