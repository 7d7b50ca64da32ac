"use client";
import { apiJson } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";

/** Opens the plan's checkout (subscription mode) and goes there; a refusal is shown beside the button. */
export function BuyPlanButton({ pieceId, templateId, planName }: { pieceId: string; templateId: string; planName: string }) {
  const { run, busy, error } = useRefreshingMutation(() => apiJson<{ checkoutUrl: string }>("/api/plans/checkout", { method: "POST", json: { pieceId, templateId } }), {
    goTo: ({ checkoutUrl }) => checkoutUrl,
  });
  return (
    <div className="space-y-2">
      <Button onClick={() => run(undefined)} disabled={busy} aria-label={`Start ${planName}`}>
        {busy ? "Opening the payment page…" : `Start ${planName}`}
      </Button>
      <ErrorLine>{error}</ErrorLine>
    </div>
  );
}
