"use client";
// Staff give back all or part of a paid job's payment while the job stays as it is (lib/repairs/refunds.ts):
// the amount (at most what can still be given back) and a reason the owner reads, confirmed with the
// amount in words, and sent with the job version and refundable amount this page was drawn with, so a
// page left open after something changed is refused (409) rather than giving money back twice.
import { useState } from "react";
import { toast } from "sonner";
import { apiJson } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { TextField } from "@/components/ui/field";
import { formatMoney } from "@/lib/format";
import { parseMajorAmount } from "@/lib/repairs/lines";

type Props = { jobId: string; version: number; refundableMinor: number; currency: string; exponent: number; country: string; stateLabel: string };

const major = (minor: number, exponent: number) => (exponent ? (minor / 10 ** exponent).toFixed(exponent) : String(minor));

export function JobRefundForm({ jobId, version, refundableMinor, currency, exponent, country, stateLabel }: Props) {
  const [amount, setAmount] = useState(major(refundableMinor, exponent));
  const [reason, setReason] = useState("");
  const [asking, setAsking] = useState<number | null>(null);
  const [fieldError, setFieldError] = useState<{ amount?: string; reason?: string }>({});
  const money = (minor: number) => formatMoney(minor, currency, country);
  const { run, busy, error } = useRefreshingMutation(
    (amountMinor: number) => apiJson(`/api/jobs/${jobId}/refund`, { method: "POST", json: { version, refundableMinor, amountMinor, reason } }),
    {
      refresh: "always",
      onSuccess: (_, amountMinor) => {
        setAsking(null);
        setReason("");
        toast.success(`${money(amountMinor)} is on its way back to the owner's card.`);
      },
      onError: () => setAsking(null),
    },
  );
  const check = () => {
    const minor = parseMajorAmount(amount, exponent);
    const next: typeof fieldError = {};
    if (minor === null || minor <= 0) next.amount = "Enter an amount above zero, like " + major(Math.min(refundableMinor, 10 ** exponent * 10), exponent) + ".";
    else if (minor > refundableMinor) next.amount = `Enter ${money(refundableMinor)} or less.`;
    if (reason.trim().length < 3) next.reason = "Say why the money is given back: the owner reads it.";
    setFieldError(next);
    if (!next.amount && !next.reason && minor !== null) setAsking(minor);
  };
  return (
    <div className="space-y-3">
      <p className="text-sm">
        Up to <strong>{money(refundableMinor)}</strong> can still be given back. The job stays “{stateLabel}”.
      </p>
      {asking !== null ? (
        <div role="group" aria-labelledby="refund-confirm-title" className="space-y-3 rounded-lg border border-line p-3">
          <p id="refund-confirm-title" className="font-semibold">
            Give back {money(asking)}{asking === refundableMinor ? " (all that is left)" : ""}?
          </p>
          <p className="text-sm">It goes back to the card the owner paid with, and they get an e-mail with your reason:</p>
          {/* The reason on a line of its own, so its own full stop isn't followed by a second one. */}
          <p className="break-words text-sm text-muted">“{reason.trim()}”</p>
          <div className="flex flex-wrap gap-2">
            <Button disabled={busy} onClick={() => run(asking)}>
              {busy ? "Giving back…" : `Give back ${money(asking)}`}
            </Button>
            <Button variant="secondary" disabled={busy} onClick={() => setAsking(null)}>
              Go back
            </Button>
          </div>
        </div>
      ) : (
        <>
          <TextField label={`Amount to give back (${currency})`} inputMode="decimal" value={amount} onChange={(e) => setAmount(e.target.value)} error={fieldError.amount} />
          <TextField label="Reason (the owner reads it)" value={reason} maxLength={300} onChange={(e) => setReason(e.target.value)} error={fieldError.reason} placeholder="For example: one coat short" />
          <Button variant="secondary" onClick={check}>
            Give money back…
          </Button>
        </>
      )}
      <ErrorLine>{error}</ErrorLine>
    </div>
  );
}

/**
 * A refund the payment service did not confirm (it did not answer): asked again with the same
 * idempotency key (lib/repairs/refunds.ts finishJobRefund), so the money goes back at most once.
 */
export function FinishRefundButton({ jobId, refundId }: { jobId: string; refundId: string }) {
  const { run, busy, error } = useRefreshingMutation(() => apiJson(`/api/jobs/${jobId}/refund/${refundId}`, { method: "POST" }), {
    refresh: "always",
    onSuccess: () => toast.success("The payment service confirmed the refund."),
  });
  return (
    <span className="mt-1 block">
      <Button variant="secondary" disabled={busy} onClick={() => run()}>
        {busy ? "Asking the payment service…" : "Finish giving back"}
      </Button>
      <ErrorLine>{error}</ErrorLine>
    </span>
  );
}
