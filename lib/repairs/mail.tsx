import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { payments, repairJobs, type Payment } from "@/db/schema";
import { PaymentReceiptEmail } from "@/emails/payment-receipt";
import { PaymentRefundedAutomaticallyEmail, paymentRefundedAutomaticallySubject, type AutomaticRefundReason } from "@/emails/payment-refunded-automatically";
import { RefundIssuedEmail } from "@/emails/refund-issued";
import { formatMinorUnits } from "@/lib/care/quote";
import { studioRecipients } from "@/lib/claims/mail";
import { env } from "@/lib/env";
import { sendMail } from "@/lib/mail";
import { getOwnerJob } from "./jobs";

// Payment mail is sent after the change it reports is committed; sendMail queues what SMTP refuses.

export const money = (minor: number, currency: string) => `${formatMinorUnits(minor, currency)} ${currency}`;
export const jobUrl = (jobId: string, query = "") => new URL(`/jobs/${jobId}${query}`, env.APP_URL).href;
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
  await sendMail({
    studioId: view.studio.id,
    to: view.owner.email,
    subject: `Receipt from ${view.studio.name}: ${money(payment.amountMinor, payment.currency)}`,
    email: PaymentReceiptEmail({
      ownerName: view.owner.name,
      studioName: view.studio.name,
      pieceTitle: view.piece.title,
      amount: money(payment.amountMinor, payment.currency),
      paidOn: (payment.paidAt ?? new Date()).toISOString().slice(0, 10),
      reference: payment.paymentIntentId ?? payment.checkoutSessionId,
      url: jobUrl(payment.jobId),
    }),
  });
}

/** A refund of a cancelled job (or one made at Stripe by hand) reached the charge. */
export async function mailRefundIssued(payment: Payment, amountMinor: number) {
  const view = ownerView(payment.jobId);
  if (!view) return;
  await sendMail({
    studioId: view.studio.id,
    to: view.owner.email,
    subject: `Refund from ${view.studio.name}`,
    email: RefundIssuedEmail({ ownerName: view.owner.name, studioName: view.studio.name, pieceTitle: view.piece.title, amount: money(amountMinor, payment.currency) }),
  });
}

/** A payment that did not count toward its job was refunded on its own: the owner and the studio are told. */
export async function mailAutomaticRefund(payment: Payment, reason: AutomaticRefundReason) {
  const view = ownerView(payment.jobId);
  if (!view) return;
  const common = { ownerName: view.owner.name, studioName: view.studio.name, pieceTitle: view.piece.title, jobTitle: view.job.title, amount: money(payment.amountMinor - payment.refundedMinor, payment.currency), reason };
  await sendMail({
    studioId: view.studio.id,
    to: view.owner.email,
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
