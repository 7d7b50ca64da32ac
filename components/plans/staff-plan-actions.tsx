"use client";
// Staff cancel a plan (at the end of its paid time, with the refund the template's rule gives) or take a
// cancellation back — the same confirm-what-you-were-shown rule as the owner's control: the plan version
// and refund shown here go with the request, and a plan that changed since answers 409 with words.
import { useState } from "react";
import { apiJson } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";

export type StaffPlanAction =
  | { kind: "cancel"; subscriptionId: string; version: number; refundMinor: number; endsOn: string; refundWords: string }
  | { kind: "keep"; subscriptionId: string; version: number }
  | { kind: "none" };

export function StaffPlanActions({ action }: { action: StaffPlanAction }) {
  const [confirming, setConfirming] = useState(false);
  const { run, busy, error } = useRefreshingMutation(
    ({ path, json }: { path: "cancel" | "keep"; json: Record<string, number> }) => apiJson(`/api/plans/subscriptions/${action.kind === "none" ? "" : action.subscriptionId}/${path}`, { method: "POST", json }),
    { onSuccess: () => setConfirming(false) },
  );
  if (action.kind === "none") return null;
  const send = (path: "cancel" | "keep", json: Record<string, number>) => run({ path, json });
  const alert = <ErrorLine>{error}</ErrorLine>;

  if (action.kind === "keep") {
    return (
      <div className="space-y-2">
        <Button variant="secondary" disabled={busy} onClick={() => send("keep", { version: action.version })}>
          {busy ? "Keeping the plan…" : "Take the cancellation back"}
        </Button>
        {alert}
      </div>
    );
  }
  if (!confirming) {
    return (
      <Button variant="secondary" onClick={() => setConfirming(true)}>
        Cancel this plan
      </Button>
    );
  }
  return (
    <div role="group" aria-labelledby="staff-plan-cancel-title" className="space-y-3 rounded-lg border border-line p-3">
      <p id="staff-plan-cancel-title" className="font-semibold">
        Cancel this plan?
      </p>
      <p className="text-sm">
        It keeps working until {action.endsOn} and isn&apos;t renewed. {action.refundWords}
      </p>
      <div className="flex flex-wrap gap-2">
        <Button disabled={busy} onClick={() => send("cancel", { version: action.version, refundMinor: action.refundMinor })}>
          {busy ? "Cancelling…" : "Cancel the plan"}
        </Button>
        <Button variant="secondary" disabled={busy} onClick={() => setConfirming(false)}>
          Keep it running
        </Button>
      </div>
      {alert}
    </div>
  );
}
