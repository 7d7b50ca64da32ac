// What was given back on a repair job, read for every place that shows it (the receipt PDF and mail,
// both job pages, the refund mail): staff's refunds (job_refunds, lib/repairs/refunds.ts) and each
// payment set aside to be refunded in full (payments.refundReason: the job was cancelled, or the
// payment did not count and was refunded on its own, lib/repairs/checkout.ts). No server-only: the
// scheduler loads lib/repairs/mail.tsx, which reads these.
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { jobRefunds, type JobRefund, type Payment, type RepairJob } from "@/db/schema";
import { formatInstant, formatMoney } from "@/lib/format";
import { OWNER_REFUND_REASON_LABELS, paymentCounts } from "./states";

/** A paid job in these states stays as it is when staff give money back; a job still open is cancelled instead. */
const REFUNDABLE_STATES: readonly RepairJob["state"][] = ["paid", "scheduled", "done"];

/** A reason as staff typed it, ended as a sentence ("… the legs" → "… the legs."), for "Their reason: …". */
export const asSentence = (text: string) => (/[.!?…]$/.test(text.trim()) ? text.trim() : `${text.trim()}.`);

/** Staff's refunds on a job the caller has already reached (its studio and id: job_refunds_studio_job_idx), oldest first. */
export function refundsOfJob(job: Pick<RepairJob, "id" | "studioId">): JobRefund[] {
  return getDb().select().from(jobRefunds).where(and(eq(jobRefunds.studioId, job.studioId), eq(jobRefunds.jobId, job.id))).orderBy(asc(jobRefunds.createdAt)).all();
}

const staffShareOf = (payment: Pick<Payment, "id">, refunds: readonly JobRefund[]) => refunds.filter((r) => r.paymentId === payment.id).reduce((sum, r) => sum + r.amountMinor, 0);

/** What was given back of a payment: all of one set aside for refund, else staff's refunds or what Stripe reports refunded, whichever is more. */
export function givenBackOf(payment: Payment, refunds: readonly JobRefund[]): number {
  return payment.refundReason !== null ? payment.amountMinor : Math.max(payment.refundedMinor, staffShareOf(payment, refunds));
}

/**
 * The payment staff can still give money back from, and how much of it: the one that counts (paid by
 * card), less what was given back of it (staff's refunds, or one made at Stripe by hand). Null when
 * the job is not paid, or not in a state where it stays as it is.
 */
export function refundableOf(job: Pick<RepairJob, "state">, jobPayments: readonly Payment[], refunds: readonly JobRefund[]): { payment: Payment; refundableMinor: number } | null {
  if (!REFUNDABLE_STATES.includes(job.state)) return null;
  const payment = jobPayments.find((p) => paymentCounts(p) && p.paymentIntentId);
  if (!payment) return null;
  return { payment, refundableMinor: Math.max(0, payment.amountMinor - givenBackOf(payment, refunds)) };
}

export type RefundRow = {
  /** "$12.00" */
  amount: string;
  /** When Stripe took it, with its zone ("3 December 2026, 14:05 PST"); null while it is still being paid back. */
  on: string | null;
  /** Why, in the owner's words. */
  why: string;
  at: number;
  /** A staff refund the payment service has not confirmed yet (lib/repairs/refunds.ts finishJobRefund). */
  pendingId: string | null;
};

/**
 * Every refund on the job, oldest first: staff's refunds with their reason, and each payment given back
 * in full (less what staff had already given back of it). Times in `timeZone`, named.
 */
export function refundRows(jobPayments: readonly Payment[], refunds: readonly JobRefund[], timeZone: string, country: string): RefundRow[] {
  const rows: RefundRow[] = [];
  for (const r of refunds) {
    rows.push({ amount: formatMoney(r.amountMinor, r.currency, country), on: r.refundedAt ? formatInstant(r.refundedAt, timeZone, { time: true }) : null, why: asSentence(r.reason), at: (r.refundedAt ?? r.createdAt).getTime(), pendingId: r.refundedAt ? null : r.id });
  }
  for (const p of jobPayments) {
    if (p.refundReason === null) continue;
    const amountMinor = p.amountMinor - staffShareOf(p, refunds);
    if (amountMinor <= 0) continue;
    const why = OWNER_REFUND_REASON_LABELS[p.refundReason];
    rows.push({ amount: formatMoney(amountMinor, p.currency, country), on: p.refundRequestedAt ? formatInstant(p.refundRequestedAt, timeZone, { time: true }) : null, why: asSentence(why.charAt(0).toUpperCase() + why.slice(1)), at: (p.refundRequestedAt ?? p.updatedAt).getTime(), pendingId: null });
  }
  return rows.sort((a, b) => a.at - b.at);
}


