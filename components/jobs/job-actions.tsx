"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { callApi } from "@/components/api-client";
import { Button } from "@/components/ui/button";

const post = (url: string) => callApi<{ checkoutUrl?: string }>(url, { method: "POST" });

/** Staff actions on a job: send the quote, cancel (asks first; a paid job is refunded), send a refund that didn't go through. */
export function StaffJobActions({ jobId, canSend, canCancel, paid, refundOwed = false }: { jobId: string; canSend: boolean; canCancel: boolean; paid: boolean; refundOwed?: boolean }) {
  const router = useRouter();
  const [busy, setBusy] = useState<string | null>(null);
  async function run(kind: "quote" | "cancel") {
    if (kind === "cancel" && !refundOwed && !window.confirm(paid ? "Cancel this job and refund the owner's payment in full?" : "Cancel this job? The owner will no longer be able to approve it.")) return;
    setBusy(kind);
    const r = await post(`/api/jobs/${jobId}/${kind}`);
    setBusy(null);
    // A cancel can stand even when its refund did not go through: the page shows what happened.
    router.refresh();
    if (!r.ok) return void toast.error(r.message);
    toast.success(kind === "quote" ? "Quote sent to the owner." : refundOwed ? "The refund is on its way." : paid ? "Job cancelled; the refund is on its way." : "Job cancelled.");
  }
  return (
    <div className="flex flex-wrap gap-2">
      {canSend ? (
        <Button onClick={() => run("quote")} disabled={busy !== null}>
          {busy === "quote" ? "Sending…" : "Send quote to owner"}
        </Button>
      ) : null}
      {canCancel ? (
        <Button variant="secondary" onClick={() => run("cancel")} disabled={busy !== null}>
          {busy === "cancel" ? "Cancelling…" : paid ? "Cancel and refund" : "Cancel job"}
        </Button>
      ) : null}
      {refundOwed ? (
        <Button onClick={() => run("cancel")} disabled={busy !== null}>
          {busy === "cancel" ? "Sending…" : "Send the refund again"}
        </Button>
      ) : null}
    </div>
  );
}

/** The owner approves a quote and is sent to the payment page. */
export function ApproveAndPay({ jobId, label }: { jobId: string; label: string }) {
  const [busy, setBusy] = useState(false);
  return (
    <Button
      className="w-full sm:w-auto"
      disabled={busy}
      onClick={async () => {
        setBusy(true);
        const r = await post(`/api/jobs/${jobId}/approve`);
        if (!r.ok) {
          setBusy(false);
          return void toast.error(r.message);
        }
        window.location.assign(String(r.data.checkoutUrl));
      }}
    >
      {busy ? "Opening the payment page…" : label}
    </Button>
  );
}

export function OwnerCancelJob({ jobId }: { jobId: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  return (
    <Button
      variant="secondary"
      className="w-full sm:w-auto"
      disabled={busy}
      onClick={async () => {
        if (!window.confirm("Decline this quote? The studio will be told.")) return;
        setBusy(true);
        const r = await post(`/api/jobs/${jobId}/cancel`);
        setBusy(false);
        if (!r.ok) return void toast.error(r.message);
        toast.success("Quote declined.");
        router.refresh();
      }}
    >
      Decline the quote
    </Button>
  );
}
