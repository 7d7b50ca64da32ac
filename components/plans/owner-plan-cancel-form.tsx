"use client";
// The owner's cancel control for the plan on their piece (data from lib/plans/cancel myPlanControl):
// a confirm step that names the day the plan ends, with its zone, and the refund that applies; and,
// while a cancelled plan hasn't ended and nothing was paid back, a way to keep it.
import { useState } from "react";
import { apiJson } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { formatInstant, formatMoney, formatZone } from "@/lib/format";
import type { OwnerPlanControl } from "@/lib/plans/cancel";

const monthsWord = (n: number) => (n === 1 ? "one unused month" : `${n} unused months`);

export function OwnerPlanCancelForm({ control, timeZone, country }: { control: OwnerPlanControl; timeZone: string; country: string }) {
  const [confirming, setConfirming] = useState(false);
  const { run, busy, error } = useRefreshingMutation(
    ({ path, json }: { path: "cancel" | "keep"; json: Record<string, number> }) => apiJson(`/api/me/plans/${control.subscriptionId}/${path}`, { method: "POST", json }),
    { onSuccess: () => setConfirming(false) },
  );
  const send = (path: "cancel" | "keep", json: Record<string, number>) => run({ path, json });
  const day = (ms: number) => `${formatInstant(ms, timeZone)} (${formatZone(timeZone)})`;
  const money = (minor: number) => formatMoney(minor, control.quote?.currency ?? "USD", country);

  const alert = <ErrorLine>{error}</ErrorLine>;

  if (control.state === "ending") {
    return (
      <div className="space-y-2" data-testid="plan-cancelled">
        <p className="text-sm">
          You cancelled this plan. It keeps working until {control.endsAt ? day(control.endsAt) : "the end of the period you paid for"} and isn&apos;t renewed.
          {control.refundedMinor ? ` ${money(control.refundedMinor)} ${control.refundBy === "card" ? "is on its way back to your card" : "is being paid back to you by the studio"}.` : ""}
        </p>
        {control.canUndo ? (
          <Button variant="secondary" disabled={busy} onClick={() => send("keep", { version: control.version })}>
            {busy ? "Keeping your plan…" : "Keep my plan after all"}
          </Button>
        ) : null}
        {alert}
      </div>
    );
  }

  const q = control.quote;
  const held = control.held ? (
    <p className="text-sm" data-testid="plan-payment-held">
      {control.held}
    </p>
  ) : null;
  if (!q) return held;
  if (!confirming) {
    return (
      <div className="space-y-2">
        {held}
        <Button variant="secondary" onClick={() => setConfirming(true)}>
          Cancel this plan
        </Button>
      </div>
    );
  }
  return (
    <div role="group" aria-labelledby="plan-cancel-title" className="space-y-3 rounded-lg border border-line p-3">
      <p id="plan-cancel-title" className="font-semibold">
        Cancel {control.planName}?
      </p>
      <p className="text-sm">If you cancel now, the plan keeps working until {day(q.endsAt)} and isn&apos;t renewed after that.</p>
      <p className="text-sm">
        {q.refundMinor > 0
          ? `You get ${money(q.refundMinor)} back for ${monthsWord(q.months)}${control.paidBy === "card" ? ", to the card you paid with" : ", paid back by the studio"}. Once the money is on its way, the cancellation can't be taken back.`
          : q.rule === "unused_share"
            ? "No whole months of the period you paid for are left after that, so nothing is paid back."
            : "Nothing is paid back under the studio's terms for this plan. You can keep the plan again until it ends."}
      </p>
      <div className="flex flex-wrap gap-2">
        <Button variant="danger" disabled={busy} onClick={() => send("cancel", { version: control.version, refundMinor: q.refundMinor })}>
          {busy ? "Cancelling…" : "Yes, cancel the plan"}
        </Button>
        <Button variant="secondary" disabled={busy} onClick={() => setConfirming(false)}>
          Keep my plan
        </Button>
      </div>
      {alert}
    </div>
  );
}
