import "server-only";
import { and, eq } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { payments, repairJobs, stripeEvents, type Payment, type RepairJob } from "@/db/schema";
import { JobQuoteEmail } from "@/emails/job-quote";
import { PaymentReceiptEmail } from "@/emails/payment-receipt";
import { RefundIssuedEmail } from "@/emails/refund-issued";
import { recordAudit } from "@/lib/audit";
import type { StudioContext } from "@/lib/auth/guards";
import { formatMinorUnits } from "@/lib/care/quote";
import { env } from "@/lib/env";
import { badRequest, conflict } from "@/lib/errors";
import { sendMail } from "@/lib/mail";
import { callStripe, getStripe, type Stripe } from "@/lib/payments/stripe";
import { getOwnerJob, getStudioJob, moveJob, type JobView } from "./jobs";
import { assertMove } from "./states";

export const money = (minor: number, currency: string) => `${formatMinorUnits(minor, currency)} ${currency}`;
const jobUrl = (jobId: string, query = "") => new URL(`/jobs/${jobId}${query}`, env.APP_URL).href;

/** Sends the quote to the owner. A job with nothing to pay becomes covered at once. */
export async function sendQuote(ctx: StudioContext, jobId: string): Promise<RepairJob> {
  const view = getStudioJob(ctx, jobId);
  const { job } = view;
  if (!view.owner) throw conflict("This piece has no registered owner to send the quote to.");
  const fullyCovered = job.totalMinor === 0;
  const updated = getDb().transaction((tx) => {
    const next = moveJob(tx, job, fullyCovered ? "covered" : "quoted", { quoteVersion: job.quoteVersion + 1, quotedAt: new Date() });
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "job.quote_sent", subjectType: "repair_job", subjectId: job.id, data: { quoteVersion: next.quoteVersion, totalMinor: job.totalMinor } });
    return next;
  });
  await sendMail({
    to: view.owner.email,
    subject: fullyCovered ? `Your repair is covered — ${view.piece.title}` : `Your repair quote from ${view.studio.name}`,
    email: JobQuoteEmail({
      ownerName: view.owner.name,
      studioName: view.studio.name,
      pieceTitle: view.piece.title,
      lines: job.lines.map((l) => ({ description: l.description, amount: money(l.amountMinor, job.currency) })),
      covered: job.coveredMinor ? money(job.coveredMinor, job.currency) : null,
      tax: money(job.taxMinor, job.currency),
      total: money(job.totalMinor, job.currency),
      fullyCovered,
      url: jobUrl(job.id),
    }),
  });
  return updated;
}

/**
 * The owner approves the quote. A chargeable job gets a Checkout Session (one per job, quote version
 * and attempt, so retries of the same click reuse it) and the owner is sent to its URL.
 */
export async function approveJob(user: Pick<User, "id" | "email">, jobId: string): Promise<{ checkoutUrl: string | null; job: RepairJob }> {
  const view = getOwnerJob(user, jobId);
  let { job } = view;
  if (job.totalMinor === 0) throw conflict("This job is fully covered: there is nothing to pay.");
  if (job.state === "quoted") {
    job = getDb().transaction((tx) => moveJob(tx, job, "approved", { approvedAt: new Date() }));
  } else if (job.state !== "approved") {
    throw conflict(job.state === "paid" ? "This job is already paid." : "This quote can't be approved now.");
  }
  const open = view.payments.find((p) => p.quoteVersion === job.quoteVersion && p.status === "open");
  if (open?.checkoutUrl) {
    const live = await callStripe("check the open payment", (s) => s.checkout.sessions.retrieve(open.checkoutSessionId));
    if (live.status === "open" && live.url) return { checkoutUrl: live.url, job };
    await applySession(live);
  }
  const attempt = view.payments.filter((p) => p.quoteVersion === job.quoteVersion).length + 1;
  const session = await callStripe("start the payment", (stripe) => stripe.checkout.sessions.create(
    {
      mode: "payment",
      client_reference_id: job.id,
      customer_email: user.email,
      metadata: { jobId: job.id, studioId: job.studioId, quoteVersion: String(job.quoteVersion) },
      line_items: [
        {
          quantity: 1,
          price_data: {
            currency: job.currency.toLowerCase(),
            unit_amount: job.totalMinor,
            product_data: { name: `${job.title} (after warranty share, tax included)` },
          },
        },
      ],
      success_url: jobUrl(job.id, "?checkout=success&session_id={CHECKOUT_SESSION_ID}"),
      cancel_url: jobUrl(job.id, "?checkout=cancelled"),
    },
    { idempotencyKey: `job-${job.id}-v${job.quoteVersion}-a${attempt}` },
  ));
  getDb()
    .insert(payments)
    .values({ studioId: job.studioId, jobId: job.id, quoteVersion: job.quoteVersion, checkoutSessionId: session.id, checkoutUrl: session.url, amountMinor: session.amount_total ?? job.totalMinor, currency: job.currency })
    .onConflictDoNothing()
    .run();
  return { checkoutUrl: session.url, job };
}

/** Brings our payment and job to what Stripe says of the session; safe to call any number of times. */
export async function applySession(session: Stripe.Checkout.Session): Promise<{ paidNow: boolean }> {
  const db = getDb();
  const paidNow = db.transaction((tx) => {
    const payment = tx.select().from(payments).where(eq(payments.checkoutSessionId, session.id)).get();
    if (!payment) return false;
    if (session.payment_status === "paid" && payment.status === "open") {
      tx.update(payments)
        .set({ status: "paid", paymentIntentId: typeof session.payment_intent === "string" ? session.payment_intent : (session.payment_intent?.id ?? null), paidAt: new Date(), updatedAt: new Date() })
        .where(eq(payments.id, payment.id))
        .run();
      const job = tx.select().from(repairJobs).where(eq(repairJobs.id, payment.jobId)).get()!;
      if (job.state === "approved" || job.state === "quoted") {
        const paid = job.state === "quoted" ? moveJob(tx, moveJob(tx, job, "approved"), "paid", { paidAt: new Date() }) : moveJob(tx, job, "paid", { paidAt: new Date() });
        recordAudit(tx, { studioId: job.studioId, actorId: null, action: "job.paid", subjectType: "repair_job", subjectId: paid.id, data: { checkoutSessionId: session.id, amountMinor: payment.amountMinor } });
      }
      return true;
    }
    if (session.status === "expired" && payment.status === "open") {
      tx.update(payments).set({ status: "expired", updatedAt: new Date() }).where(eq(payments.id, payment.id)).run();
    }
    return false;
  });
  if (paidNow) await sendReceipt(session.id);
  return { paidNow };
}

async function sendReceipt(sessionId: string) {
  const db = getDb();
  const payment = db.select().from(payments).where(eq(payments.checkoutSessionId, sessionId)).get();
  if (!payment) return;
  const job = db.select().from(repairJobs).where(eq(repairJobs.id, payment.jobId)).get();
  if (!job?.ownerId) return;
  const view = getOwnerJob({ id: job.ownerId }, job.id);
  if (!view.owner) return;
  await sendMail({
    to: view.owner.email,
    subject: `Receipt from ${view.studio.name}: ${money(payment.amountMinor, payment.currency)}`,
    email: PaymentReceiptEmail({
      ownerName: view.owner.name,
      studioName: view.studio.name,
      pieceTitle: view.piece.title,
      amount: money(payment.amountMinor, payment.currency),
      paidOn: new Date().toISOString().slice(0, 10),
      reference: payment.paymentIntentId ?? payment.checkoutSessionId,
      url: jobUrl(job.id),
    }),
  });
}

/** The owner came back from checkout: converge now rather than wait for the webhook. */
export async function syncReturnedCheckout(user: Pick<User, "id">, jobId: string, sessionId: string): Promise<void> {
  const view = getOwnerJob(user, jobId);
  if (!view.payments.some((p) => p.checkoutSessionId === sessionId)) return;
  await applySession(await callStripe("confirm the payment", (s) => s.checkout.sessions.retrieve(sessionId)));
}

async function applyRefund(chargeId: string) {
  const charge = await callStripe("read the refunded charge", (s) => s.charges.retrieve(chargeId));
  const pi = typeof charge.payment_intent === "string" ? charge.payment_intent : charge.payment_intent?.id;
  if (!pi) return;
  const db = getDb();
  const refundedNow = db.transaction((tx) => {
    const payment = tx.select().from(payments).where(eq(payments.paymentIntentId, pi)).get();
    if (!payment || charge.amount_refunded <= payment.refundedMinor) return null;
    const status: Payment["status"] = charge.amount_refunded >= payment.amountMinor ? "refunded" : "partially_refunded";
    tx.update(payments).set({ refundedMinor: charge.amount_refunded, status, updatedAt: new Date() }).where(eq(payments.id, payment.id)).run();
    recordAudit(tx, { studioId: payment.studioId, actorId: null, action: "payment.refunded", subjectType: "payment", subjectId: payment.id, data: { refundedMinor: charge.amount_refunded } });
    return { payment, amount: charge.amount_refunded - payment.refundedMinor };
  });
  if (!refundedNow) return;
  const job = db.select().from(repairJobs).where(eq(repairJobs.id, refundedNow.payment.jobId)).get();
  if (!job?.ownerId) return;
  const view = getOwnerJob({ id: job.ownerId }, job.id);
  if (view.owner) {
    await sendMail({
      to: view.owner.email,
      subject: `Refund from ${view.studio.name}`,
      email: RefundIssuedEmail({ ownerName: view.owner.name, studioName: view.studio.name, pieceTitle: view.piece.title, amount: money(refundedNow.amount, refundedNow.payment.currency) }),
    });
  }
}

const HANDLED = new Set(["checkout.session.completed", "checkout.session.expired", "checkout.session.async_payment_succeeded", "charge.refunded"]);

/**
 * A Stripe webhook: the signature is checked on the raw body by the SDK; each event id is recorded
 * once; the object's truth is re-read from the API and written, so duplicates and out-of-order
 * events end in the same state.
 */
export async function handleStripeWebhook(rawBody: string, signature: string | null): Promise<{ received: true; duplicate?: boolean; ignored?: boolean }> {
  let event: Stripe.Event;
  try {
    event = getStripe().webhooks.constructEvent(rawBody, signature ?? "", env.STRIPE_WEBHOOK_SECRET);
  } catch {
    throw badRequest("The Stripe-Signature header doesn't match this payload.");
  }
  const db = getDb();
  if (db.select({ id: stripeEvents.id }).from(stripeEvents).where(eq(stripeEvents.id, event.id)).get()) return { received: true, duplicate: true };
  if (!HANDLED.has(event.type)) {
    db.insert(stripeEvents).values({ id: event.id, type: event.type }).onConflictDoNothing().run();
    return { received: true, ignored: true };
  }
  const object = event.data.object as { id: string };
  if (event.type === "charge.refunded") await applyRefund(object.id);
  else await applySession(await callStripe("read the checkout session", (s) => s.checkout.sessions.retrieve(object.id)));
  db.insert(stripeEvents).values({ id: event.id, type: event.type, objectId: object.id }).onConflictDoNothing().run();
  return { received: true };
}

/** Cancels a job; a paid one is refunded through Stripe (the payment shows it when charge.refunded arrives). */
export async function cancelJob(actor: { ctx?: StudioContext; owner?: Pick<User, "id"> }, jobId: string): Promise<RepairJob> {
  const view: JobView = actor.ctx ? getStudioJob(actor.ctx, jobId) : getOwnerJob(actor.owner!, jobId);
  const { job } = view;
  if (actor.owner && !["quoted", "approved"].includes(job.state)) throw conflict("Ask the studio to cancel a job that is already paid or booked.");
  // Refuse a job that can't be cancelled (done, already cancelled) before any checkout is closed or payment refunded.
  assertMove(job.state, "cancelled");
  const paid = view.payments.find((p) => p.status === "paid" && p.paymentIntentId);
  // Close open checkouts first, so a cancelled job can't be paid.
  for (const p of view.payments.filter((x) => x.status === "open")) {
    await getStripe().checkout.sessions.expire(p.checkoutSessionId).catch(() => undefined);
  }
  if (paid) {
    await callStripe("refund the payment", (s) => s.refunds.create({ payment_intent: paid.paymentIntentId! }, { idempotencyKey: `refund-${paid.id}` }));
  }
  return getDb().transaction((tx) => {
    const cancelled = moveJob(tx, job, "cancelled", { cancelledAt: new Date() });
    for (const p of view.payments.filter((x) => x.status === "open")) {
      tx.update(payments).set({ status: "expired", updatedAt: new Date() }).where(and(eq(payments.id, p.id), eq(payments.status, "open"))).run();
    }
    recordAudit(tx, { studioId: job.studioId, actorId: actor.ctx?.user.id ?? actor.owner?.id ?? null, action: "job.cancelled", subjectType: "repair_job", subjectId: job.id, data: { refunded: Boolean(paid) } });
    return cancelled;
  });
}

