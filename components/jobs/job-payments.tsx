import { Notice } from "@/components/ui/notice";
import { formatMoney } from "@/lib/format";
import { isAutomaticRefund, PAYMENT_STATUS_LABELS, REFUND_REASON_LABELS, type PaymentStatus, type RefundReason } from "@/lib/repairs/states";

export type JobPaymentRow = {
  id: string;
  quoteVersion: number;
  amountMinor: number;
  currency: string;
  status: PaymentStatus;
  refundedMinor: number;
  refundReason: RefundReason | null;
  refundRequestedAt: Date | null;
  /** When the checkout was opened, already written in the studio's time zone. */
  openedOn: string;
};

/** The staff's list of a job's checkouts and payments, with a flag on each one refunded automatically. */
export function JobPayments({ payments, currentQuoteVersion, country = "US" }: { payments: JobPaymentRow[]; currentQuoteVersion: number; country?: string }) {
  if (payments.length === 0) return <p className="text-sm text-muted">No checkout started yet.</p>;
  return (
    <ul className="space-y-3 text-sm">
      {payments.map((p) => (
        <li key={p.id} className="space-y-1">
          <div className="flex justify-between gap-2">
            <span>
              {p.openedOn} · quote {p.quoteVersion}
              {p.quoteVersion !== currentQuoteVersion ? " (an earlier one)" : ""}
            </span>
            <span>
              {formatMoney(p.amountMinor, p.currency, country)} · {PAYMENT_STATUS_LABELS[p.status]}
              {p.status === "partially_refunded" ? ` (${formatMoney(p.refundedMinor, p.currency, country)} refunded)` : ""}
            </span>
          </div>
          {isAutomaticRefund(p.refundReason) ? (
            <Notice tone="warn" title={`Refunded automatically: ${REFUND_REASON_LABELS[p.refundReason]}`}>
              {p.refundRequestedAt
                ? "This payment did not count toward the job and was given back in full. The owner and the studio were told by e-mail."
                : "This payment does not count toward the job. Its refund could not be sent yet because the payment service was unreachable; it is tried again automatically."}
            </Notice>
          ) : p.refundReason === "job_cancelled" && !p.refundRequestedAt ? (
            <Notice tone="warn" title="Refund not sent yet">
              The payment service could not be reached when the job was cancelled. Use “Send the refund again” above.
            </Notice>
          ) : null}
        </li>
      ))}
    </ul>
  );
}
