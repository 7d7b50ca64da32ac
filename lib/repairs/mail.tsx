import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { payments, repairJobs, type JobRefund, type Payment } from "@/db/schema";
import { JobRefundEmail, jobRefundSubject } from "@/emails/job-refund";
import { PaymentReceiptEmail } from "@/emails/payment-receipt";
import { PaymentRefundedAutomaticallyEmail, paymentRefundedAutomaticallySubject, type AutomaticRefundReason } from "@/emails/payment-refunded-automatically";
import { RefundIssuedEmail } from "@/emails/refund-issued";
import { studioRecipients } from "@/lib/claims/mail";
import { env } from "@/lib/env";
import { sendMail } from "@/lib/mail";
import { replyToFor } from "@/lib/messages/store";
import { formatInstant, formatMoney } from "@/lib/format";
import { jobFigures } from "./figures";
import { getOwnerJob, type JobView } from "./jobs";
import { asSentence, givenBackOf, refundRows, refundsOfJob } from "./refund-rows";

// Payment mail is sent after the change it reports is committed; sendMail queues what SMTP refuses.

export const jobUrl = (jobId: string, query = "") => new URL(`/jobs/${jobId}${query}`, env.APP_URL).href;
export const receiptUrl = (jobId: string) => new URL(`/api/jobs/${jobId}/receipt`, env.APP_URL).href;

/** The quote's lines and totals as the quote mail prints them. */
export function quoteFigures(job: JobView["job"], studio: JobView["studio"]) {
  const f = jobFigures(job, studio);
  return {
    lines: f.lines.map((l) => ({ description: l.description, detail: l.quantityText, amount: l.amount })),
    subtotal: f.text.subtotal,
    covered: f.text.covered ? { label: f.coveredLabel, amount: f.text.covered } : null,
    discount: f.text.discount ? { label: f.discountLabel, amount: f.text.discount } : null,
    net: f.text.net,
    taxLabel: f.taxLabel,
    tax: f.text.tax,
    total: f.text.total,
    roundingNote: f.roundingNote,
    taxNumber: f.taxNumber,
  };
}
/** An owner's answer by e-mail lands in the job's conversation (lib/messages, lib/mail/inbound.ts). */
const jobReplyTo = (jobId: string) => replyToFor(getDb(), { kind: "job", id: jobId });
const staffJobUrl = (jobId: string) => new URL(`/studio/jobs/${jobId}`, env.APP_URL).href;

/** The job as its owner sees it, or null when the piece has no registered owner any more. */
function ownerView(jobId: string) {
  const job = getDb().select({ ownerId: repairJobs.ownerId }).from(repairJobs).where(eq(repairJobs.id, jobId)).get();
  if (!job?.ownerId) return null;
  const view = getOwnerJob({ id: job.ownerId }, jobId);
  return view.owner ? { ...view, owner: view.owner } : null;
}

export async function mailReceipt(paymentId: string) {
  const payment = getDb().select().from(payments).where(eq(payments.id, paymentId)).get();
  const view = payment && ownerView(payment.jobId);
  if (!payment || !view) return;
  const money = (minor: number) => formatMoney(minor, payment.currency, view.studio.country);
  await sendMail({
    studioId: view.studio.id,
    to: view.owner.email,
    replyTo: jobReplyTo(payment.jobId),
    subject: `Receipt from ${view.studio.name}: ${money(payment.amountMinor)}`,
    email: PaymentReceiptEmail({
      ownerName: view.owner.name,
      studioName: view.studio.name,
      studioAddress: view.studio.address,
      pieceTitle: view.piece.title,
      amount: money(payment.amountMinor),
      // The day in the owner's own zone, written out.
      paidOn: formatInstant(payment.paidAt ?? new Date(), view.owner.timeZone),
      reference: payment.paymentIntentId ?? payment.checkoutSessionId,
      ...quoteFigures(view.job, view.studio),
      url: jobUrl(payment.jobId),
      pdfUrl: receiptUrl(payment.jobId),
      // Refunds already made on the job (another payment for it given back), as the PDF lists them.
      refunds: refundRows(view.payments, refundsOfJob(view.job), view.owner.timeZone, view.studio.country),
    }),
  });
}

/** Staff gave back money on a job that stays as it is (lib/repairs/refunds.ts): what, when, why, and every refund so far. */
export async function mailJobRefund(refund: JobRefund) {
  const view = ownerView(refund.jobId);
  if (!view) return;
  const refunds = refundsOfJob(view.job);
  const payment = view.payments.find((p) => p.id === refund.paymentId)!;
  const money = (minor: number) => formatMoney(minor, refund.currency, view.studio.country);
  const props = {
    ownerName: view.owner.name,
    studioName: view.studio.name,
    pieceTitle: view.piece.title,
    jobTitle: view.job.title,
    amount: money(refund.amountMinor),
    on: formatInstant(refund.refundedAt ?? refund.createdAt, view.owner.timeZone, { time: true }),
    reason: asSentence(refund.reason),
    paid: money(payment.amountMinor),
    kept: money(payment.amountMinor - givenBackOf(payment, refunds)),
    refunds: refundRows(view.payments, refunds, view.owner.timeZone, view.studio.country),
    url: jobUrl(refund.jobId),
    pdfUrl: receiptUrl(refund.jobId),
  };
  await sendMail({ studioId: view.studio.id, to: view.owner.email, replyTo: jobReplyTo(refund.jobId), subject: jobRefundSubject(props), email: <JobRefundEmail {...props} /> });
}

/** A refund of a cancelled job, or one made at Stripe by hand on a job that stands, reached the charge. */
export async function mailRefundIssued(payment: Payment, amountMinor: number) {
  const view = ownerView(payment.jobId);
  if (!view) return;
  await sendMail({
    studioId: view.studio.id,
    to: view.owner.email,
    replyTo: jobReplyTo(payment.jobId),
    subject: `Refund from ${view.studio.name}`,
    email: RefundIssuedEmail({ ownerName: view.owner.name, studioName: view.studio.name, pieceTitle: view.piece.title, amount: formatMoney(amountMinor, payment.currency, view.studio.country), jobTitle: view.job.title, cancelled: view.job.state === "cancelled" }),
  });
}

/** A payment that did not count toward its job was refunded on its own: the owner and the studio are told. */
export async function mailAutomaticRefund(payment: Payment, reason: AutomaticRefundReason) {
  const view = ownerView(payment.jobId);
  if (!view) return;
  const common = { ownerName: view.owner.name, studioName: view.studio.name, pieceTitle: view.piece.title, jobTitle: view.job.title, amount: formatMoney(payment.amountMinor - payment.refundedMinor, payment.currency, view.studio.country), reason };
  await sendMail({
    studioId: view.studio.id,
    to: view.owner.email,
    replyTo: jobReplyTo(payment.jobId),
    subject: paymentRefundedAutomaticallySubject({ audience: "owner", ...common }),
    email: <PaymentRefundedAutomaticallyEmail audience="owner" url={jobUrl(payment.jobId)} {...common} />,
  });
  const studio = studioRecipients(view.studio);
  if (studio.length === 0) return;
  await sendMail({
    studioId: view.studio.id,
    to: studio,
    replyTo: view.owner.email,
    subject: paymentRefundedAutomaticallySubject({ audience: "studio", ...common }),
    email: <PaymentRefundedAutomaticallyEmail audience="studio" url={staffJobUrl(payment.jobId)} {...common} />,
  });
}
