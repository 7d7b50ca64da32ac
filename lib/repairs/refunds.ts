import "server-only";
// Money given back on a repair job. Two kinds, one list for every reader (the receipt PDF and mail,
// both job pages, the refund mail):
//  - a payment set aside to be refunded in full (payments.refundReason): the job was cancelled, or the
//    payment did not count (an older quote, a second payment) and was refunded on its own (checkout.ts);
//  - a refund staff give on a paid job that stays as it is (job_refunds): all of the payment or a part,
//    with a reason the owner reads. As with a held plan payment (lib/plans/held.ts), money moves only
//    when the job version and the amount still refundable that staff were shown are the current ones:
//    both are checked and the refund claimed (a job_refunds row, the job's version moved on) in one
//    transaction, so a second click made on the same page is refused; Stripe is asked after, with the
//    claim's id as idempotency key; if Stripe refuses, the claim is removed and nothing was given back.
import { and, eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { jobRefunds, payments, repairJobs, type JobRefund, type RepairJob } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { StudioActor } from "@/lib/auth/actor";
import { badRequest, conflict } from "@/lib/errors";
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
  // 1. Check what was confirmed and claim the refund: one transaction.
  const { claim, payment } = getDb().transaction((tx) => {
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
    const claim = tx.insert(jobRefunds).values({ studioId: job.studioId, jobId: job.id, paymentId: open.payment.id, amountMinor: ask.amountMinor, currency: open.payment.currency, reason: ask.reason, byId: ctx.user.id }).returning().get();
    // The version moves on with the claim, so the same confirmation sent twice is refused.
    tx.update(repairJobs).set({ version: job.version + 1, updatedAt: new Date() }).where(and(eq(repairJobs.id, job.id), eq(repairJobs.version, job.version))).run();
    return { claim, payment: open.payment };
  });
  // 2. Stripe; if it refuses, nothing was given back and the claim goes.
  let chargeId: string | undefined;
  let refundId: string;
  try {
    const refund = await callStripe(
      "give back the payment",
      (s) => s.refunds.create({ payment_intent: payment.paymentIntentId!, amount: claim.amountMinor, metadata: { jobId: claim.jobId, jobRefundId: claim.id } }, { idempotencyKey: `job-refund-${claim.id}` }),
      payment,
    );
    refundId = refund.id;
    chargeId = typeof refund.charge === "string" ? refund.charge : refund.charge?.id;
  } catch (e) {
    getDb().delete(jobRefunds).where(eq(jobRefunds.id, claim.id)).run();
    throw e;
  }
  // 3. Write the outcome and who gave what back.
  const refund = getDb().transaction((tx) => {
    const done = tx.update(jobRefunds).set({ stripeRefundId: refundId, refundedAt: new Date() }).where(eq(jobRefunds.id, claim.id)).returning().get()!;
    recordAudit(tx, {
      studioId: claim.studioId,
      actorId: ctx.user.id,
      action: "job.refunded",
      subjectType: "repair_job",
      subjectId: claim.jobId,
      data: { amountMinor: claim.amountMinor, currency: claim.currency, reason: claim.reason, paymentId: payment.id, stripeRefundId: refundId, jobVersion: ask.version, part: claim.amountMinor < ask.refundableMinor },
    });
    return done;
  });
  // The payment's refunded amount as Stripe now has it (also when charge.refunded arrives later).
  if (chargeId) await applyRefund(chargeId, payment).catch((e: unknown) => console.error("refund: reading the charge back failed; charge.refunded will bring it", e));
  await mailAfterCommit("job refunded", () => mailJobRefund(refund));
  return { job: getStudioJob(ctx, jobId).job, refund };
}
