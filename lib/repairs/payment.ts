import "server-only";
import { and, eq, isNull, sql } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { payments, repairJobs, stripeEvents, users, type RepairJob } from "@/db/schema";
import { JobQuoteEmail } from "@/emails/job-quote";
import { recordAudit } from "@/lib/audit";
import { isStudioActor, type Actor } from "@/lib/auth/actor";
import type { StudioContext } from "@/lib/auth/guards";
import { AppError, badRequest, conflict, notFound, rephrased } from "@/lib/errors";
import { sendMail } from "@/lib/mail";
import { replyToFor } from "@/lib/messages/store";
import { accountFor, callStripe, eventObjectId, verifyStripeEvent } from "@/lib/payments/stripe";
import { planRepairDiscount } from "@/lib/plans/repair-discount";
import type { JobQuoteInput } from "@/lib/validation/jobs";
import { applyRefund, applySession, closeOpenCheckouts, settleRefunds } from "./checkout";
import { getOwnerJob, getStudioJob, moveJob } from "./jobs";
import { jobHandedOn } from "./handed-on";
import { jobUrl, quoteFigures } from "./mail";
import { checkoutLineItems } from "./figures";
import { priceJob, totals, unsizedWords } from "./pricing";
import { assertMove, AWAITING_PAYMENT, OWNER_CAN_DECLINE, paymentCounts, QUOTE_EDITABLE, quoteMailWords } from "./states";

const jobRow = (jobId: string) => getDb().select().from(repairJobs).where(eq(repairJobs.id, jobId)).get()!;

/**
 * Staff change the quote; a quoted or approved job goes back to draft until it is sent again. The
 * checkout of the quote being replaced is closed at Stripe first, so it can't take the old amount.
 */
export async function updateJobQuote(ctx: StudioContext, jobId: string, input: JobQuoteInput): Promise<RepairJob> {
  const { job, piece, studio, products } = getStudioJob(ctx, jobId);
  if (!QUOTE_EDITABLE.includes(job.state)) throw conflict("This job's quote can no longer be changed.");
  const unknown = input.productIds.filter((p) => !products.some((x) => x.id === p));
  if (unknown.length) throw notFound("One of those products is not in this studio's catalog.");
  // A running care plan's repair discount, as it stands when the quote is priced.
  const priced = priceJob(studio, piece, input, products, job.lines, planRepairDiscount(piece.id, new Date()));
  if (priced.lines.length === 0) {
    // Work on a surface with no size proposes nothing (lib/repairs/pricing): say which, and what to do.
    const sizes = priced.unsized.map(unsizedWords).join(" ");
    throw badRequest(sizes ? `${sizes} Type its area for this quote, or add a line.` : "A quote needs at least one line.", { lines: ["Add a line, or pick a task to propose lines from."] });
  }
  await closeOpenCheckouts(job.id);
  // The owner may have finished paying the old quote a moment ago: that payment stands.
  const fresh = getStudioJob(ctx, jobId).job;
  if (!QUOTE_EDITABLE.includes(fresh.state)) throw conflict(fresh.state === "paid" ? "The owner has just paid this quote, so it can no longer be changed." : "This job's quote can no longer be changed.");
  return getDb().transaction((tx) => {
    // What the proposal is made from is kept; the lines as sent live in their own column.
    const { lines: _sent, ...proposalInput } = input;
    const set = { title: input.title, quoteInput: proposalInput, coveredPct: input.coveredPct, notes: input.notes, ...totals(priced) };
    const updated =
      fresh.state === "draft"
        ? tx.update(repairJobs).set({ ...set, version: sql`${repairJobs.version} + 1`, updatedAt: new Date() }).where(and(eq(repairJobs.id, fresh.id), eq(repairJobs.version, fresh.version))).returning().get()
        : moveJob(tx, fresh, "draft", set);
    if (!updated) throw conflict("The job changed while you were working on it. Reload and try again.");
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "job.quote_edited", subjectType: "repair_job", subjectId: job.id, data: { totalMinor: priced.totalMinor } });
    return updated;
  });
}

/** Sends the quote to the owner. A job with nothing to pay becomes covered at once. */
export async function sendQuote(ctx: StudioContext, jobId: string): Promise<RepairJob> {
  // A new quote version: no checkout of an earlier one may stay open (closed when the quote was edited; again here in case).
  await closeOpenCheckouts(jobId);
  const view = getStudioJob(ctx, jobId);
  const { job } = view;
  // A job set back because its piece changed hands (lib/repairs/handed-on.ts) goes to whoever holds the piece now.
  const handedOn = jobHandedOn(job, view.piece);
  const owner = handedOn ? (view.piece.ownerId ? (getDb().select({ id: users.id, name: users.name, email: users.email }).from(users).where(eq(users.id, view.piece.ownerId)).get() ?? null) : null) : view.owner;
  if (!owner) throw conflict(handedOn ? "The piece changed hands and nobody has registered it since, so there is no one to send the quote to. Send it once the new owner has registered the piece, or cancel the job." : "This piece has no registered owner to send the quote to.");
  const fullyCovered = job.totalMinor === 0;
  const words = quoteMailWords(job, view.studio.name, view.piece.title);
  const updated = getDb().transaction((tx) => {
    const next = moveJob(tx, job, fullyCovered ? "covered" : "quoted", { quoteVersion: job.quoteVersion + 1, quotedAt: new Date(), ...(handedOn ? { ownerId: owner.id } : {}) });
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "job.quote_sent", subjectType: "repair_job", subjectId: job.id, data: { quoteVersion: next.quoteVersion, totalMinor: job.totalMinor, ...(handedOn ? { toNewOwner: true } : {}) } });
    return next;
  });
  await sendMail({
    studioId: view.studio.id,
    to: owner.email,
    // An answer by e-mail lands in the job's conversation (lib/messages).
    replyTo: replyToFor(getDb(), { kind: "job", id: job.id }),
    subject: words.subject,
    email: JobQuoteEmail({
      ownerName: owner.name,
      studioName: view.studio.name,
      pieceTitle: view.piece.title,
      ...quoteFigures(job, view.studio),
      fullyCovered,
      heading: words.heading,
      url: jobUrl(job.id),
    }),
  });
  return updated;
}

/** The quote an owner's page showed when they pressed approve: its version and total (minor units). */
export type ShownQuote = { quoteVersion: number; totalMinor: number };

/**
 * The owner approves the quote. A chargeable job gets a Checkout Session (one per job, quote version
 * and attempt, so retries of the same click reuse it), opened for the job's current quote version and
 * amount, and the owner is sent to its URL. `shown` (what the owner's page showed, sent by it) must be
 * the current quote: a page opened before the studio changed and sent the quote again approves nothing.
 * The approve route (app/api/jobs/[id]/approve/route.ts) always has it: a request without it is a 400.
 */
export async function approveJob(user: Pick<User, "id" | "email">, jobId: string, shown?: ShownQuote): Promise<{ checkoutUrl: string | null; job: RepairJob }> {
  const view = getOwnerJob(user, jobId, "act");
  let { job } = view;
  if (shown && (shown.quoteVersion !== job.quoteVersion || shown.totalMinor !== job.totalMinor)) {
    throw conflict("The quote changed since you opened this page, so nothing was approved. Reload the page to see the current quote.", { code: "quote_changed" });
  }
  if (job.totalMinor === 0) throw conflict("This job is fully covered: there is nothing to pay.");
  if (job.state === "quoted") {
    job = getDb().transaction((tx) => moveJob(tx, job, AWAITING_PAYMENT, { approvedAt: new Date() }));
  } else if (job.state !== AWAITING_PAYMENT) {
    throw conflict(job.state === "paid" ? "This job is already paid." : "This quote can't be approved now.");
  }
  const open = view.payments.find((p) => p.quoteVersion === job.quoteVersion && p.amountMinor === job.totalMinor && p.status === "open");
  if (open?.checkoutUrl) {
    const live = await callStripe("check the open payment", (s) => s.checkout.sessions.retrieve(open.checkoutSessionId), open);
    if (live.status === "open" && live.url) return { checkoutUrl: live.url, job };
    await applySession(live);
    if (jobRow(job.id).state !== AWAITING_PAYMENT) throw conflict("This job is already paid.");
  }
  const attempt = view.payments.filter((p) => p.quoteVersion === job.quoteVersion).length + 1;
  // The account the payment is taken under now; its refund later uses the same one.
  const home = { studioId: job.studioId, stripeAccount: accountFor(job.studioId) };
  const session = await callStripe("start the payment", (stripe) => stripe.checkout.sessions.create(
    {
      mode: "payment",
      client_reference_id: job.id,
      customer_email: user.email,
      metadata: { jobId: job.id, studioId: job.studioId, quoteVersion: String(job.quoteVersion) },
      line_items: checkoutLineItems(job),
      success_url: jobUrl(job.id, "?checkout=success&session_id={CHECKOUT_SESSION_ID}"),
      cancel_url: jobUrl(job.id, "?checkout=cancelled"),
    },
    { idempotencyKey: `job-${job.id}-v${job.quoteVersion}-a${attempt}` },
  ), home);
  getDb()
    .insert(payments)
    .values({ studioId: job.studioId, jobId: job.id, quoteVersion: job.quoteVersion, checkoutSessionId: session.id, checkoutUrl: session.url, stripeAccount: home.stripeAccount, amountMinor: session.amount_total ?? job.totalMinor, currency: job.currency })
    .onConflictDoNothing()
    .run();
  // The quote may have changed (or the job been paid or cancelled) while the session was being opened:
  // then the new session is closed before anyone can pay it.
  const now = jobRow(job.id);
  if (now.state !== AWAITING_PAYMENT || now.quoteVersion !== job.quoteVersion || now.totalMinor !== job.totalMinor) {
    await closeOpenCheckouts(job.id);
    throw conflict(now.state === "paid" ? "This job is already paid." : "The quote changed while the payment page was opening. Reload the page to see the current quote.");
  }
  return { checkoutUrl: session.url, job };
}

/** The owner came back from checkout: converge now rather than wait for the webhook. */
export async function syncReturnedCheckout(user: Pick<User, "id">, jobId: string, sessionId: string): Promise<void> {
  const view = getOwnerJob(user, jobId);
  const payment = view.payments.find((p) => p.checkoutSessionId === sessionId);
  if (!payment) return;
  await applySession(await callStripe("confirm the payment", (s) => s.checkout.sessions.retrieve(sessionId), payment));
}

const HANDLED = new Set(["checkout.session.completed", "checkout.session.expired", "checkout.session.async_payment_succeeded", "charge.refunded"]);

/**
 * A Stripe webhook: the signature is checked on the raw body by the SDK; each event id is recorded
 * once; the object's truth is re-read from the API and written, so duplicates and out-of-order
 * events end in the same state.
 */
export async function handleStripeWebhook(rawBody: string, signature: string | null, studioId?: string): Promise<{ received: true; duplicate?: boolean; ignored?: boolean }> {
  const event = verifyStripeEvent(rawBody, signature, studioId);
  const db = getDb();
  if (db.select({ id: stripeEvents.id }).from(stripeEvents).where(eq(stripeEvents.id, event.id)).get()) return { received: true, duplicate: true };
  if (!HANDLED.has(event.type)) {
    db.insert(stripeEvents).values({ id: event.id, type: event.type }).onConflictDoNothing().run();
    return { received: true, ignored: true };
  }
  const objectId = eventObjectId(event);
  if (event.type === "charge.refunded") await applyRefund(objectId, studioId);
  else await applySession(await callStripe("read the checkout session", (s) => s.checkout.sessions.retrieve(objectId), studioId), studioId);
  db.insert(stripeEvents).values({ id: event.id, type: event.type, objectId }).onConflictDoNothing().run();
  return { received: true };
}

/**
 * Cancels a job. Open checkouts are closed at Stripe first (one the owner completed meanwhile is
 * settled as Stripe reports it), then the job is cancelled and every payment that counted is marked to
 * be refunded in the same transaction, and the refunds are asked of Stripe. If Stripe can't be reached
 * for a refund, cancelling the (already cancelled) job again asks for what is still owed.
 */
export async function cancelJob(actor: Actor, jobId: string): Promise<RepairJob> {
  const load = () => (isStudioActor(actor) ? getStudioJob(actor, jobId) : getOwnerJob(actor.user, jobId, "act"));
  const check = (job: RepairJob) => {
    if (actor.role === "owner" && !OWNER_CAN_DECLINE.includes(job.state)) throw conflict("Ask the studio to cancel a job that is already paid or booked.");
    // Refuse a job that can't be cancelled (done, already cancelled) before any checkout is closed or payment refunded.
    assertMove(job.state, "cancelled");
  };
  const before = load();
  if (before.job.state === "cancelled" && isStudioActor(actor) && before.payments.some((p) => p.refundReason && !p.refundRequestedAt && p.status !== "refunded")) {
    await settleRefundsOf(jobId, "The job stays cancelled, but");
    return before.job;
  }
  check(before.job);
  await closeOpenCheckouts(jobId);
  const { job, payments: jobPayments } = load();
  check(job);
  const toRefund = jobPayments.filter((p) => paymentCounts(p) && p.paymentIntentId);
  const cancelled = getDb().transaction((tx) => {
    const next = moveJob(tx, job, "cancelled", { cancelledAt: new Date() });
    for (const p of toRefund) tx.update(payments).set({ refundReason: "job_cancelled", updatedAt: new Date() }).where(and(eq(payments.id, p.id), isNull(payments.refundReason))).run();
    recordAudit(tx, { studioId: job.studioId, actorId: actor.user.id, action: "job.cancelled", subjectType: "repair_job", subjectId: job.id, data: { refunded: toRefund.length } });
    return next;
  });
  await settleRefundsOf(jobId, "The job is cancelled, but");
  return cancelled;
}

/** Asks for the refunds a cancelled job owes; a refusal or outage says the job stands and how to try again. */
async function settleRefundsOf(jobId: string, lead: string) {
  try {
    await settleRefunds(jobId);
  } catch (e) {
    if (!(e instanceof AppError)) throw e;
    throw rephrased(e, `${lead} its refund has not gone through yet. ${e.message} Try “Send the refund again” on the job page in a little while.`);
  }
}
