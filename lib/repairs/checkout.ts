// Where a repair job's money moves: Checkout Sessions are closed, completed sessions are weighed
// against the job's current quote, and payments that don't count are refunded. Every function here
// converges on what Stripe reports, so a webhook replayed, late or out of order leaves one state.
import { and, eq, inArray, isNotNull, isNull, ne, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { jobRefunds, payments, pieces, repairJobs, type Payment, type RepairJob } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { callStripe, expireCheckoutSession, type Stripe, type StripeScope } from "@/lib/payments/stripe";
import { moveJob } from "./jobs";
import { mailAutomaticRefund, mailReceipt, mailRefundIssued } from "./mail";
import { ownerActsOnJob } from "./owner-reach";
import { AWAITING_PAYMENT, CAPTURED, isAutomaticRefund, paymentCounts, REFUND_REASON_LABELS, type RefundReason } from "./states";

const intentOf = (session: Stripe.Checkout.Session) => (typeof session.payment_intent === "string" ? session.payment_intent : (session.payment_intent?.id ?? null));

/**
 * A completed session pays the job only while the job awaits payment for exactly the quote version,
 * amount and currency the session was opened for, nothing else has paid it, and its owner still holds
 * the piece (lib/repairs/owner-reach.ts: a page opened before the hand-over and paid after is not
 * theirs to pay any more); otherwise the reason it is to be refunded.
 */
function refundReasonFor(job: RepairJob, payment: Payment, session: Stripe.Checkout.Session, others: Payment[], holderId: string | null): Exclude<RefundReason, "job_cancelled"> | null {
  const current =
    payment.quoteVersion === job.quoteVersion &&
    session.metadata?.quoteVersion === String(job.quoteVersion) &&
    payment.amountMinor === job.totalMinor &&
    session.amount_total === job.totalMinor &&
    session.currency?.toUpperCase() === job.currency.toUpperCase();
  if (!current) return "older_quote";
  if (others.some(paymentCounts)) return "already_paid";
  // Before the state: a hand-over also takes the job out of awaiting payment (lib/repairs/handed-on.ts), and is the reason the payer is told.
  if (!ownerActsOnJob(job, { ownerId: holderId })) return "piece_handed_on";
  if (job.state !== AWAITING_PAYMENT) return "not_awaiting_payment";
  return null;
}

/**
 * Brings our payment and job to what Stripe says of the session; safe to call any number of times.
 * `studioId`: the studio whose own webhook endpoint the event came to, which moves that studio's
 * payments only (another studio's session named there is left for that studio's own event).
 */
export async function applySession(session: Stripe.Checkout.Session, studioId?: string): Promise<{ paidNow: boolean }> {
  const outcome = getDb().transaction((tx): { jobId: string; countedPaymentId?: string; paymentIntentId?: string; scope?: Payment } | null => {
    const payment = tx.select().from(payments).where(eq(payments.checkoutSessionId, session.id)).get();
    if (!payment || (studioId !== undefined && payment.studioId !== studioId)) return null;
    // "expired" too: our row may say so before Stripe does (a close that raced the owner's payment).
    if (session.payment_status === "paid" && (payment.status === "open" || payment.status === "expired")) {
      const now = new Date();
      const taken = tx
        .update(payments)
        .set({ status: "paid", paymentIntentId: intentOf(session), paidAt: now, updatedAt: now })
        .where(and(eq(payments.id, payment.id), eq(payments.status, payment.status)))
        .run().changes;
      if (taken === 0) return { jobId: payment.jobId };
      const written = { paymentIntentId: intentOf(session) ?? undefined, scope: payment };
      const job = tx.select().from(repairJobs).where(eq(repairJobs.id, payment.jobId)).get()!;
      const others = tx.select().from(payments).where(and(eq(payments.jobId, job.id), ne(payments.id, payment.id))).all();
      const holder = tx.select({ ownerId: pieces.ownerId }).from(pieces).where(eq(pieces.id, job.pieceId)).get();
      const reason = refundReasonFor(job, payment, session, others, holder?.ownerId ?? null);
      if (reason === null) {
        moveJob(tx, job, "paid", { paidAt: now });
        recordAudit(tx, { studioId: job.studioId, actorId: null, action: "job.paid", subjectType: "repair_job", subjectId: job.id, data: { checkoutSessionId: session.id, amountMinor: payment.amountMinor, quoteVersion: payment.quoteVersion } });
        return { jobId: job.id, countedPaymentId: payment.id, ...written };
      }
      tx.update(payments).set({ refundReason: reason }).where(eq(payments.id, payment.id)).run();
      recordAudit(tx, {
        studioId: job.studioId,
        actorId: null,
        action: "payment.refund_due",
        subjectType: "payment",
        subjectId: payment.id,
        // The audit page shows "reason" as written: plain words, the code beside it for queries.
        data: { reason: REFUND_REASON_LABELS[reason], reasonCode: reason, quoteVersion: payment.quoteVersion, amountMinor: payment.amountMinor, jobQuoteVersion: job.quoteVersion, jobTotalMinor: job.totalMinor, jobState: job.state },
      });
      return { jobId: job.id, ...written };
    }
    if (session.status === "expired" && payment.status === "open") {
      tx.update(payments).set({ status: "expired", updatedAt: new Date() }).where(and(eq(payments.id, payment.id), eq(payments.status, "open"))).run();
    }
    return { jobId: payment.jobId };
  });
  if (!outcome) return { paidNow: false };
  // A refund made at Stripe before this session was written here (its charge.refunded came first and
  // found no payment with this intent yet) shows on the payment now.
  // Not a reason to fail the payment's own write (the receipt below is sent once, on this first write).
  if (outcome.paymentIntentId) await applyRefundsMadeBefore(outcome.paymentIntentId, outcome.scope).catch((e: unknown) => console.error("checkout: reading refunds made before the payment was written failed", e));
  if (outcome.countedPaymentId) await mailReceipt(outcome.countedPaymentId);
  const job = getDb().select({ state: repairJobs.state }).from(repairJobs).where(eq(repairJobs.id, outcome.jobId)).get();
  // A job that no longer awaits payment keeps no open checkout (done here again on every replay, so
  // a close that failed once is tried again when Stripe retries the event).
  if (job && job.state !== AWAITING_PAYMENT) await closeOpenCheckouts(outcome.jobId);
  await settleRefunds(outcome.jobId);
  return { paidNow: Boolean(outcome.countedPaymentId) };
}

/**
 * Expires every open Checkout Session of the job through Stripe, so none can take money for a quote
 * that is changing or a job that no longer awaits payment. A session the owner completed first is
 * settled as Stripe reports it (it may pay the job, or be refunded). Throws (503/409) when Stripe
 * can't be reached, before anything of ours has changed.
 */
export async function closeOpenCheckouts(jobId: string): Promise<void> {
  const open = getDb().select().from(payments).where(and(eq(payments.jobId, jobId), eq(payments.status, "open"))).all();
  for (const p of open) await applySession(await expireCheckoutSession(p.checkoutSessionId, p));
}

/** Asks Stripe for every refund the job owes and hasn't asked for yet; each payment is refunded once. */
export async function settleRefunds(jobId: string): Promise<void> {
  const due = getDb()
    .select()
    .from(payments)
    .where(and(eq(payments.jobId, jobId), isNotNull(payments.refundReason), isNull(payments.refundRequestedAt), inArray(payments.status, CAPTURED), isNotNull(payments.paymentIntentId)))
    .all();
  for (const p of due) await refundPayment(p);
}

async function refundPayment(payment: Payment) {
  // One key per payment: a retry, a replayed webhook and a cancellation racing it make one refund.
  const refund = await callStripe("refund the payment", (s) => s.refunds.create({ payment_intent: payment.paymentIntentId! }, { idempotencyKey: `refund-${payment.id}` }), payment);
  const first =
    getDb()
      .update(payments)
      .set({ refundRequestedAt: new Date(), updatedAt: new Date() })
      .where(and(eq(payments.id, payment.id), isNull(payments.refundRequestedAt)))
      .run().changes === 1;
  const chargeId = typeof refund.charge === "string" ? refund.charge : refund.charge?.id;
  // The refund shows on the payment now, whether or not charge.refunded arrives before the session's own event.
  if (chargeId) await applyRefund(chargeId, payment);
  if (first && isAutomaticRefund(payment.refundReason)) await mailAutomaticRefund(payment, payment.refundReason);
}

/**
 * Records what Stripe says has been refunded of a charge (from charge.refunded, or right after asking),
 * read under the account the event came from, or the one the payment was made under. Either names a
 * studio: only that studio's payment moves (as applySession).
 */
export async function applyRefund(chargeId: string, scope?: StripeScope): Promise<void> {
  await recordRefunded(await callStripe("read the refunded charge", (s) => s.charges.retrieve(chargeId), scope), scope);
}

/** What was refunded of a payment intent's charge before its session was written here (usually nothing: no write then). */
async function applyRefundsMadeBefore(paymentIntentId: string, scope?: StripeScope): Promise<void> {
  const intent = await callStripe("read the payment", (s) => s.paymentIntents.retrieve(paymentIntentId, { expand: ["latest_charge"] }), scope);
  const charge = intent.latest_charge;
  if (charge && typeof charge !== "string" && charge.amount_refunded > 0) await recordRefunded(charge, scope);
}

async function recordRefunded(charge: Stripe.Charge, scope?: StripeScope): Promise<void> {
  const pi = typeof charge.payment_intent === "string" ? charge.payment_intent : charge.payment_intent?.id;
  if (!pi) return;
  const studioId = typeof scope === "string" ? scope : scope?.studioId;
  const refundedNow = getDb().transaction((tx) => {
    const payment = tx.select().from(payments).where(eq(payments.paymentIntentId, pi)).get();
    if (!payment || (studioId !== undefined && payment.studioId !== studioId) || charge.amount_refunded <= payment.refundedMinor) return null;
    const status: Payment["status"] = charge.amount_refunded >= payment.amountMinor ? "refunded" : "partially_refunded";
    tx.update(payments).set({ refundedMinor: charge.amount_refunded, status, updatedAt: new Date() }).where(eq(payments.id, payment.id)).run();
    recordAudit(tx, { studioId: payment.studioId, actorId: null, action: "payment.refunded", subjectType: "payment", subjectId: payment.id, data: { refundedMinor: charge.amount_refunded, ...(payment.refundReason ? { reason: REFUND_REASON_LABELS[payment.refundReason], reasonCode: payment.refundReason } : {}) } });
    // Staff's refunds on a job that stays as it is (lib/repairs/refunds.ts) are claimed before Stripe is
    // asked and have a mail of their own: only what is beyond them was given back here (a cancellation's
    // refund of the rest, or one made at Stripe by hand).
    const staff = tx.select({ sum: sql<number>`coalesce(sum(${jobRefunds.amountMinor}), 0)` }).from(jobRefunds).where(and(eq(jobRefunds.studioId, payment.studioId), eq(jobRefunds.jobId, payment.jobId), eq(jobRefunds.paymentId, payment.id))).get()!.sum;
    return { payment, amount: charge.amount_refunded - Math.max(payment.refundedMinor, staff) };
  });
  // An automatic refund was announced when it was asked for; this mail is for cancellations and refunds made by hand.
  if (refundedNow && refundedNow.amount > 0 && !isAutomaticRefund(refundedNow.payment.refundReason)) await mailRefundIssued(refundedNow.payment, refundedNow.amount);
}
