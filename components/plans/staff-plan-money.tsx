"use client";
// Staff settle what is left open about a plan's money (data from lib/plans/cancel studioPlanDetail):
// a renewal payment held because its amount wasn't the plan's — keep it, pay back the difference, or pay
// it all back and end the plan, each confirmed with the words of what happens and sent with the plan
// version and amounts shown (a plan that changed since answers 409 with words); and a change of hands
// the payment service couldn't be told of yet, which they can try again now.
import { useState } from "react";
import { apiJson } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
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
      {error ? (
        <p role="alert" className="text-sm text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}

export function FinishTransferButton({ subscriptionId, words }: { subscriptionId: string; words: string }) {
  const { run, busy, error } = useRefreshingMutation(() => apiJson(`/api/plans/subscriptions/${subscriptionId}/finish-transfer`, { method: "POST" }));
  return (
    <div className="space-y-2">
      <p className="text-sm">{words}</p>
      <Button variant="secondary" disabled={busy} onClick={() => run(undefined)}>
        {busy ? "Trying again…" : "Try again now"}
      </Button>
      {error ? (
        <p role="alert" className="text-sm text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}
