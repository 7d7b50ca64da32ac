// Money given back on a repair job. Two kinds, one list for every reader (the receipt PDF and mail,
// both job pages, the refund mail):
//  - a payment set aside to be refunded in full (payments.refundReason): the job was cancelled, or the
//    payment did not count (an older quote, a second payment) and was refunded on its own (checkout.ts);
//  - a refund staff give on a paid job that stays as it is (job_refunds): all of the payment or a part,
//    with a reason the owner reads. As with a held plan payment (lib/plans/held.ts), money moves only
//    when the job version and the amount still refundable that staff were shown are the current ones:
//    both are checked and the amount set aside (a pending job_refunds row, the job's version moved on)
//    in one transaction, so a second click made on the same page is refused; Stripe is asked after, with
//    the row's id as idempotency key. If Stripe refuses, the row goes and nothing was given back; if it
//    does not answer, the row stays pending until staff ask again with the same key (finishJobRefund), or
//    the scheduler does (finishPendingJobRefunds, jobs/job-refunds.ts) once nobody has for a few minutes.
import { and, eq, isNull, lt } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { jobRefunds, payments, repairJobs, studios, type JobRefund, type Payment, type RepairJob } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { StudioActor } from "@/lib/auth/actor";
import { badRequest, conflict, isAppError, notFound, serviceUnavailable } from "@/lib/errors";
import { formatMoney } from "@/lib/format";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import { callStripe } from "@/lib/payments/stripe";
import { applyRefund } from "./checkout";
import { getStudioJob } from "./jobs";
import { mailJobRefund } from "./mail";
import { refundableOf } from "./refund-rows";

/** What staff confirmed: the amount and reason, and the job version and refundable amount they were shown. */
export const jobRefundSchema = z.object({
  version: z.number({ error: "Reload the page: the job's version is missing." }).int().min(0),
  refundableMinor: z.number({ error: "Reload the page: the amount that can be given back is missing." }).int().min(0),
  amountMinor: z.number({ error: "Enter the amount to give back." }).int("Whole minor units (cents).").min(1, "Enter an amount above zero."),
  reason: z.string({ error: "Say why the money is given back." }).trim().min(3, "Say why the money is given back: the owner reads it.").max(300, "Keep the reason under 300 characters."),
});
export type JobRefundAsk = z.infer<typeof jobRefundSchema>;

/** Staff give back all or part of a paid job's payment; the job stays as it is. */
export async function refundJob(ctx: StudioActor, jobId: string, ask: JobRefundAsk): Promise<{ job: RepairJob; refund: JobRefund }> {
  const first = getStudioJob(ctx, jobId).job;
  // 1. Check what was confirmed and set the amount aside: one transaction.
  const { pending, payment } = getDb().transaction((tx) => {
    const job = tx.select().from(repairJobs).where(and(eq(repairJobs.id, first.id), eq(repairJobs.studioId, ctx.studio.id))).get()!;
    if (job.state === "cancelled") throw conflict("This job is cancelled: its payment was given back when it was cancelled.");
    if (job.version !== ask.version) throw conflict("The job changed since this page was opened, so nothing was given back. Reload to see it as it is now.", { code: "job_changed" });
    const jobPayments = tx.select().from(payments).where(eq(payments.jobId, job.id)).all();
    const refunds = tx.select().from(jobRefunds).where(and(eq(jobRefunds.studioId, job.studioId), eq(jobRefunds.jobId, job.id))).all();
    const open = refundableOf(job, jobPayments, refunds);
    if (!open) throw conflict("This job has no card payment to give money back from.");
    if (open.refundableMinor !== ask.refundableMinor) throw conflict("What can still be given back isn't the amount shown, so nothing was given back. Reload to see it as it is now.", { code: "refundable_changed" });
    if (open.refundableMinor === 0) throw conflict("Everything paid for this job has already been given back.");
    if (ask.amountMinor > open.refundableMinor) {
      const most = formatMoney(open.refundableMinor, open.payment.currency, ctx.studio.country);
      throw badRequest(`At most ${most} can be given back.`, { amountMinor: [`Enter ${most} or less.`] });
    }
    const pending = tx.insert(jobRefunds).values({ studioId: job.studioId, jobId: job.id, paymentId: open.payment.id, amountMinor: ask.amountMinor, currency: open.payment.currency, reason: ask.reason, byId: ctx.user.id }).returning().get();
    // The version moves on with the pending refund, so the same confirmation sent twice is refused.
    tx.update(repairJobs).set({ version: job.version + 1, updatedAt: new Date() }).where(and(eq(repairJobs.id, job.id), eq(repairJobs.version, job.version))).run();
    return { pending, payment: open.payment };
  });
  const refund = await giveBack(staffOf(ctx), pending, payment, { jobVersion: ask.version, part: pending.amountMinor < ask.refundableMinor });
  return { job: getStudioJob(ctx, jobId).job, refund };
}

/**
 * Asks Stripe again for a refund left pending because the payment service did not answer (or the server
 * stopped before writing its answer): the same idempotency key, so Stripe makes it at most once whether
 * or not the first request reached it. One already finished is returned as it is.
 */
export async function finishJobRefund(ctx: StudioActor, jobId: string, refundId: string): Promise<{ job: RepairJob; refund: JobRefund }> {
  const { job } = getStudioJob(ctx, jobId);
  const pending = getDb().select().from(jobRefunds).where(and(eq(jobRefunds.studioId, job.studioId), eq(jobRefunds.jobId, job.id), eq(jobRefunds.id, refundId))).get();
  if (!pending) throw notFound("This refund isn't on this job: reload the page.");
  if (pending.refundedAt) return { job, refund: pending };
  const payment = getDb().select().from(payments).where(and(eq(payments.jobId, job.id), eq(payments.id, pending.paymentId))).get()!;
  const refund = await giveBack(staffOf(ctx), pending, payment, { finishedLater: true, askedBy: pending.byId });
  return { job: getStudioJob(ctx, jobId).job, refund };
}

/**
 * How long a refund stays pending before the scheduler asks Stripe again. Longer than any request of
 * refundJob can still be waiting on Stripe (lib/payments/stripe.ts: 10 s timeout, 2 retries), so the pass
 * never asks alongside the first request, and staff have had the time to press "Finish giving back".
 * Asking alongside would still be safe (the same key; the first answer written wins), only wasted.
 */
export const PENDING_REFUND_WAIT_MS = 5 * 60_000;

export type PendingRefundsPass = { finished: string[]; refused: string[]; waiting: string[] };

/** Refunds Stripe has not taken yet, asked before `cutoff`: read through job_refunds_pending_idx. */
export function refundsPendingBefore(cutoff: Date) {
  return getDb().select().from(jobRefunds).where(and(isNull(jobRefunds.refundedAt), lt(jobRefunds.createdAt, cutoff)));
}

/**
 * The scheduler's pass (jobs/job-refunds.ts): every refund left pending for longer than
 * PENDING_REFUND_WAIT_MS is asked again as finishJobRefund asks it, with the same key; the audit names
 * no actor and says the scheduler finished it. A refusal removes the row (nothing was given back); no
 * answer leaves it for the next pass.
 */
export async function finishPendingJobRefunds(now = new Date()): Promise<PendingRefundsPass> {
  const open = refundsPendingBefore(new Date(now.getTime() - PENDING_REFUND_WAIT_MS)).all();
  const out: PendingRefundsPass = { finished: [], refused: [], waiting: [] };
  for (const pending of open) {
    const payment = getDb().select().from(payments).where(and(eq(payments.studioId, pending.studioId), eq(payments.jobId, pending.jobId), eq(payments.id, pending.paymentId))).get()!;
    const { country } = getDb().select({ country: studios.country }).from(studios).where(eq(studios.id, pending.studioId)).get()!;
    try {
      await giveBack({ actorId: null, country }, pending, payment, { finishedLater: true, askedBy: pending.byId, source: "scheduler" });
      out.finished.push(pending.id);
    } catch (e) {
      if (isAppError(e) && e.code === "payment_service_refused") out.refused.push(pending.id);
      else {
        if (!(isAppError(e) && e.code === "refund_pending")) console.error(`job refund pass: ${pending.id} not finished yet`, e);
        out.waiting.push(pending.id);
      }
    }
  }
  return out;
}

/** Who asks Stripe: a staff member, or the scheduler (no actor). `country` writes the amount in words. */
type Asker = { actorId: string | null; country: string };
const staffOf = (ctx: StudioActor): Asker => ({ actorId: ctx.user.id, country: ctx.studio.country });

/**
 * 2. Stripe, with the pending refund's id as idempotency key. A refusal (Stripe answered no) means no
 * money moved: the pending refund goes. No answer at all is not a refusal: Stripe may have made the
 * refund, so it stays pending (its amount set aside, nothing given back twice) for finishJobRefund.
 * 3. The outcome, who gave what back, and the owner's mail, once, whichever request writes it first.
 */
async function giveBack(by: Asker, pending: JobRefund, payment: Payment, auditData: Record<string, unknown>): Promise<JobRefund> {
  let chargeId: string | undefined;
  let refundId: string;
  try {
    const refund = await callStripe(
      "give back the payment",
      (s) => s.refunds.create({ payment_intent: payment.paymentIntentId!, amount: pending.amountMinor, metadata: { jobId: pending.jobId, jobRefundId: pending.id } }, { idempotencyKey: `job-refund-${pending.id}` }),
      payment,
    );
    refundId = refund.id;
    chargeId = typeof refund.charge === "string" ? refund.charge : refund.charge?.id;
  } catch (e) {
    if (isAppError(e) && e.code === "payment_service_refused") {
      getDb().delete(jobRefunds).where(and(eq(jobRefunds.id, pending.id), isNull(jobRefunds.refundedAt))).run();
      throw e;
    }
    throw serviceUnavailable(
      "refund_pending",
      `The payment service didn't answer, so we can't tell yet whether ${formatMoney(pending.amountMinor, pending.currency, by.country)} went back. It stays listed as being given back, and it can't be given back twice: press “Finish giving back” in a minute.`,
    );
  }
  const done = getDb().transaction((tx) => {
    const row = tx.update(jobRefunds).set({ stripeRefundId: refundId, refundedAt: new Date() }).where(and(eq(jobRefunds.id, pending.id), isNull(jobRefunds.refundedAt))).returning().get();
    // Another request finished it first: it wrote the audit and sends the mail.
    if (!row) return null;
    recordAudit(tx, {
      studioId: pending.studioId,
      actorId: by.actorId,
      action: "job.refunded",
      subjectType: "repair_job",
      subjectId: pending.jobId,
      data: { amountMinor: pending.amountMinor, currency: pending.currency, reason: pending.reason, paymentId: payment.id, stripeRefundId: refundId, ...auditData },
    });
    return row;
  });
  if (!done) return getDb().select().from(jobRefunds).where(eq(jobRefunds.id, pending.id)).get()!;
  // The payment's refunded amount as Stripe now has it (also when charge.refunded arrives later).
  if (chargeId) await applyRefund(chargeId, payment).catch((e: unknown) => console.error("refund: reading the charge back failed; charge.refunded will bring it", e));
  await mailAfterCommit("job refunded", () => mailJobRefund(done));
  return done;
}
