import type { Payment, RepairJob } from "@/db/schema";
import { conflict } from "@/lib/errors";
import { CARE_TASK_LABELS, type CareTaskKind, type ClaimCategory } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS } from "@/lib/claims/labels";
import { formatMoney } from "@/lib/format";

type JobState = RepairJob["state"];

// Repair job states (lib/care/vocabulary.ts): draft → quoted → approved → paid (or covered) → scheduled → done. Editing a quoted
// job takes it back to draft; any open job can be cancelled.
const NEXT: Record<JobState, readonly JobState[]> = {
  draft: ["quoted", "covered", "cancelled"],
  quoted: ["draft", "approved", "covered", "cancelled"],
  approved: ["paid", "draft", "cancelled"],
  paid: ["scheduled", "cancelled"],
  covered: ["scheduled", "cancelled"],
  scheduled: ["done", "paid", "covered", "cancelled"],
  done: [],
  cancelled: [],
};

export const JOB_STATE_LABELS: Record<JobState, string> = {
  draft: "Being priced",
  quoted: "Quote sent",
  approved: "Approved, awaiting payment",
  paid: "Paid",
  // Who covers it is the job's to say (jobStateLabel): the warranty, or the care plan for a plan visit.
  covered: "Covered, nothing to pay",
  scheduled: "Visit booked",
  done: "Done",
  cancelled: "Cancelled",
};

/** The one state in which a payment counts toward the job; leaving it closes the job's open checkouts. */
export const AWAITING_PAYMENT = "approved" satisfies JobState;
/** Staff may still change the quote (the change takes the job back to draft). */
export const QUOTE_EDITABLE: readonly JobState[] = ["draft", "quoted", "approved"];
/** The owner may decline these themselves; anything later is cancelled by the studio. */
export const OWNER_CAN_DECLINE: readonly JobState[] = ["quoted", "approved"];

export function canMove(from: JobState, to: JobState): boolean {
  return NEXT[from].includes(to);
}

export function assertMove(from: JobState, to: JobState): void {
  if (!canMove(from, to)) throw conflict(`A job that is "${JOB_STATE_LABELS[from]}" can't become "${JOB_STATE_LABELS[to]}".`);
}

export const JOB_STATE_TONES: Record<JobState, "neutral" | "progress" | "waiting" | "ok" | "stopped"> = {
  draft: "neutral",
  quoted: "waiting",
  approved: "waiting",
  paid: "progress",
  covered: "progress",
  scheduled: "progress",
  done: "ok",
  cancelled: "stopped",
};

export type PaymentStatus = Payment["status"];
export type RefundReason = NonNullable<Payment["refundReason"]>;

/** Money taken and not (fully) given back: the statuses a payment can count toward its job in. */
export const CAPTURED: readonly PaymentStatus[] = ["paid", "partially_refunded"];

/**
 * A captured payment that pays for the job: not set aside to be refunded. Money the studio gave back of
 * it on a job that stays as it is (lib/repairs/refunds.ts), even all of it, does not undo that it paid.
 */
export function paymentCounts(p: Pick<Payment, "status" | "refundReason">): boolean {
  return (CAPTURED.includes(p.status) || p.status === "refunded") && p.refundReason === null;
}

/**
 * The payment a job's receipt is for: the one that counts, else one that was taken and then given back in
 * full (a paid job cancelled and refunded still had a payment). Undefined while nothing was ever taken.
 */
export function receiptPayment<P extends Pick<Payment, "status" | "refundReason" | "paidAt">>(payments: readonly P[]): P | undefined {
  const givenBack = (p: P) => p.paidAt !== null && p.refundReason !== null;
  return payments.find(paymentCounts) ?? payments.find((p) => givenBack(p) && p.refundReason === "job_cancelled") ?? payments.find(givenBack);
}

export const PAYMENT_STATUS_LABELS: Record<PaymentStatus, string> = {
  open: "Payment page open",
  paid: "Paid",
  expired: "Payment page closed",
  refunded: "Refunded",
  partially_refunded: "Partly refunded",
};

/** Why a payment was given back, for staff (the owner's words are in the refund mail and on their page). */
export const REFUND_REASON_LABELS: Record<RefundReason, string> = {
  older_quote: "paid for an older quote",
  already_paid: "the job was already paid",
  not_awaiting_payment: "paid after the job stopped waiting for payment",
  job_cancelled: "the job was cancelled",
  piece_handed_on: "paid after the owner had handed the piece on",
};

/** The same, in the owner's words, completing "We refunded your payment of 12.00 USD: …". */
export const OWNER_REFUND_REASON_LABELS: Record<RefundReason, string> = {
  older_quote: "it was for an earlier version of the quote, which the studio has changed since",
  already_paid: "the work had already been paid by another payment of yours",
  not_awaiting_payment: "it came in after the job had stopped waiting for payment",
  job_cancelled: "the job was cancelled",
  piece_handed_on: "it came in after you had handed the piece on, so the repair was no longer yours to pay for",
};

/** The product refunds these on its own; staff see a flag on the job. */
export const isAutomaticRefund = (reason: Payment["refundReason"]): reason is Exclude<RefundReason, "job_cancelled"> => reason !== null && reason !== "job_cancelled";

type Cover = Pick<RepairJob, "origin" | "coveredPct">;

/**
 * Who pays a job's covered part, in the words every reader of the job gets (the quote page, both job
 * lists, the client's timeline, the quote and receipt mail, the receipt, the checkout's lines): the
 * owner's care plan for an included visit of a plan (origin "plan", lib/plans/visits.ts), the warranty
 * for any other job. The one place these words are written.
 */
export function coverWords(job: Cover, planName: string | null = null) {
  const plan = job.origin === "plan";
  return {
    /** The totals row of the covered part. */
    share: plan ? `Paid by the care plan (${job.coveredPct} %)` : `Covered by the warranty (${job.coveredPct} %)`,
    /** A job whose covered part leaves nothing to pay, in a line of a list and as its state. */
    whole: plan ? "Included in the care plan" : "Covered by the warranty",
    /** The owner's notice on such a job, naming their plan where it is known. */
    yours: plan ? (planName ? `Included in your care plan “${planName}”` : "Included in your care plan") : "Covered by your warranty",
    /** A checkout line's amount is what is left "after …". */
    after: plan ? "the care plan's share" : "the warranty share",
    /** The quote form's field for the covered percentage. */
    field: plan ? "Care plan share (%)" : "Warranty share (%)",
    /** The quote mail's heading (and, with the piece's title, its subject) when nothing is left to pay: a plan visit is no repair. */
    mailHeading: plan ? "Your care plan visit is included" : "Your repair is covered",
    /** The quote mail's heading when the owner has something to pay: for a plan visit, their share of it (quoteMailWords). */
    quoteHeading: plan ? "Your care plan visit: your share" : "Your repair quote",
  };
}

/**
 * The quote mail's subject and heading, by who pays (coverWords): nothing left to pay reads as covered or
 * included, with the piece's title; a plan visit with a share names the visit and the piece; any other
 * job is the studio's repair quote.
 */
export function quoteMailWords(job: Cover & Pick<RepairJob, "totalMinor">, studioName: string, pieceTitle: string): { subject: string; heading: string } {
  const words = coverWords(job);
  if (job.totalMinor === 0) return { subject: `${words.mailHeading} — ${pieceTitle}`, heading: words.mailHeading };
  if (job.origin === "plan") return { subject: `${words.quoteHeading} — ${pieceTitle}`, heading: words.quoteHeading };
  return { subject: `${words.quoteHeading} from ${studioName}`, heading: words.quoteHeading };
}

/** A job's state for people, naming who covers a covered job: a plan visit is included in the plan, not warranty work. */
export function jobStateLabel(job: Pick<RepairJob, "state" | "origin" | "coveredPct">): string {
  return job.state === "covered" ? coverWords(job).whole : JOB_STATE_LABELS[job.state];
}

/**
 * A job's amount in a line of a list: its total for the studio's country, or who covers it ("Covered by
 * the warranty", "Included in the care plan", coverWords) when that takes all of it (a share but nothing
 * left to pay). A partly covered job shows what the owner pays. A job whose payment was given back
 * (paidMinor and refundedMinor, summed by the list queries in lib/repairs/jobs.ts) says so with the
 * amount refunded: "Refunded $X" when all of it was, "$X paid, $Y refunded" for a part.
 */
export function jobAmountText(job: Pick<RepairJob, "totalMinor" | "coveredPct" | "currency" | "origin"> & { state?: RepairJob["state"]; paidMinor?: number; refundedMinor?: number }, country: string): string {
  if (job.refundedMinor) {
    const refunded = formatMoney(job.refundedMinor, job.currency, country);
    return job.paidMinor && job.refundedMinor < job.paidMinor ? `${formatMoney(job.paidMinor, job.currency, country)} paid, ${refunded} refunded` : `Refunded ${refunded}`;
  }
  if (!jobIsCovered(job)) return formatMoney(job.totalMinor, job.currency, country);
  // In the "covered" state the job's badge already names who covers it (jobStateLabel).
  return job.state === "covered" ? "Nothing to pay" : coverWords(job).whole;
}

/** The warranty (or, for a plan visit, the care plan) pays for all of the job: the owner owes nothing. */
export function jobIsCovered(job: Pick<RepairJob, "totalMinor" | "coveredPct">): boolean {
  return job.totalMinor === 0 && job.coveredPct > 0;
}

/** The quote's total line on a job page: what was paid, what is still to pay, or, once cancelled unpaid or refunded, what was quoted. */
export function jobTotalLabel(state: JobState, paid: boolean): string {
  return paid ? "Paid" : state === "cancelled" ? "Quoted (nothing to pay)" : "To pay";
}

/**
 * A new job's title names the work, not the piece: every page, mail and receipt shows the job beside its
 * piece ("Repair: crack or gap · Cherry writing desk"), so a title of "Repair: <piece>" read the piece
 * twice. A care plan's visit names the tasks it includes ("Care plan visit: re-oil, annual check").
 */
export function defaultJobTitle(source: { claim: ClaimCategory } | { refresh: CareTaskKind | undefined } | { plan: readonly CareTaskKind[] }): string {
  if ("claim" in source) return `Repair: ${CLAIM_CATEGORY_LABELS[source.claim].toLowerCase()}`;
  if ("plan" in source) return `Care plan visit: ${source.plan.map((t) => CARE_TASK_LABELS[t].toLowerCase()).join(", ")}`;
  const task = source.refresh ? CARE_TASK_LABELS[source.refresh] : undefined;
  return task ? `Refresh visit: ${task.toLowerCase()}` : "Refresh visit";
}
