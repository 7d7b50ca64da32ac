"use client";
// Staff settle what is left open about a plan's money (data from lib/plans/cancel studioPlanDetail):
// a renewal payment held because its amount wasn't the plan's — keep it, pay back the difference, or pay
// it all back and end the plan, each confirmed with the words of what happens and sent with the plan
// version and amounts shown (a plan that changed since answers 409 with words); and a change of hands
// the payment service couldn't be told of yet, which they can try again now (and are told when it is done).
import { useState } from "react";
import { apiJson } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { formatInstant } from "@/lib/format";
import type { HeldView } from "@/lib/plans/held";

export function HeldPaymentActions({ subscriptionId, held }: { subscriptionId: string; held: HeldView }) {
  const [chosen, setChosen] = useState<HeldView["options"][number] | null>(null);
  const { run, busy, error } = useRefreshingMutation(
    (o: HeldView["options"][number]) =>
      apiJson(`/api/plans/subscriptions/${subscriptionId}/held`, {
        method: "POST",
        json: { invoiceId: held.invoiceId, resolution: o.resolution, version: held.version, amountMinor: held.amountMinor, refundMinor: o.refundMinor },
      }),
    { onSuccess: () => setChosen(null) },
  );
  return (
    <div className="space-y-3">
      <p className="text-sm">{held.words}</p>
      {chosen ? (
        <div role="group" aria-labelledby="held-confirm-title" className="space-y-3 rounded-lg border border-line p-3">
          <p id="held-confirm-title" className="font-semibold">
            {chosen.label}?
          </p>
          <p className="text-sm">{chosen.words}</p>
          <div className="flex flex-wrap gap-2">
            <Button disabled={busy} onClick={() => run(chosen)}>
              {busy ? "Saving…" : "Confirm"}
            </Button>
            <Button variant="secondary" disabled={busy} onClick={() => setChosen(null)}>
              Go back
            </Button>
          </div>
        </div>
      ) : (
        <div className="flex flex-wrap gap-2">
          {held.options.map((o) => (
            <Button key={o.resolution} variant="secondary" onClick={() => setChosen(o)}>
              {o.label}
            </Button>
          ))}
        </div>
      )}
      <ErrorLine>{error}</ErrorLine>
    </div>
  );
}

type FinishedTransfer = { subscription: { state: string; transferStep: string | null; updatedAt: string }; pending: string | null };

/** What staff read once a try finished the change of hands: what the payment service confirmed, and when (in the studio's zone). Null while a step is left. */
export function transferDoneWords(sub: FinishedTransfer["subscription"], timeZone: string): string | null {
  if (sub.transferStep) return null;
  const at = formatInstant(sub.updatedAt, timeZone, { time: true });
  return sub.state === "ended"
    ? `Done, ${at}: the change of hands is finished. The payment service confirmed the plan's end, and any refund due to the former owner is paid.`
    : `Done, ${at}: the change of hands is finished. The payment service confirmed it no longer renews on the former owner's card; the plan carries on for the new owner.`;
}

/** "Try again now" for a change of hands left unfinished (`words` says what is left; null when nothing is), and the line saying it is done once a try finishes it. */
export function FinishTransferButton({ subscriptionId, words, timeZone }: { subscriptionId: string; words: string | null; timeZone: string }) {
  const [done, setDone] = useState<string | null>(null);
  const { run, busy, error } = useRefreshingMutation(() => apiJson<FinishedTransfer>(`/api/plans/subscriptions/${subscriptionId}/finish-transfer`, { method: "POST" }), {
    onSuccess: (r) => setDone(transferDoneWords(r.subscription, timeZone)),
  });
  if (done) {
    return (
      <p role="status" className="text-sm">
        {done}
      </p>
    );
  }
  if (!words) return null;
  return (
    <div className="space-y-2">
      <p className="text-sm">{words}</p>
      <Button variant="secondary" disabled={busy} onClick={() => run(undefined)}>
        {busy ? "Trying again…" : "Try again now"}
      </Button>
      <ErrorLine>{error}</ErrorLine>
    </div>
  );
}
