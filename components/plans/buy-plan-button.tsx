"use client";
import { useState } from "react";
import { apiJson, isApiError } from "@/components/api-client";
import { Button } from "@/components/ui/button";

/** Opens the plan's checkout (subscription mode) and goes there; a refusal is shown beside the button. */
export function BuyPlanButton({ pieceId, templateId, planName }: { pieceId: string; templateId: string; planName: string }) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  async function buy() {
    setBusy(true);
    setError(null);
    try {
      const { checkoutUrl } = await apiJson<{ checkoutUrl: string }>("/api/plans/checkout", { method: "POST", json: { pieceId, templateId } });
      window.location.assign(checkoutUrl);
      return;
    } catch (e) {
      setError(isApiError(e) ? e.message : "The payment page couldn't be opened. Try again in a minute.");
    }
    setBusy(false);
  }
  return (
    <div className="space-y-2">
      <Button onClick={buy} disabled={busy} aria-label={`Start ${planName}`}>
        {busy ? "Opening the payment page…" : `Start ${planName}`}
      </Button>
      {error ? (
        <p role="alert" className="text-sm text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}
