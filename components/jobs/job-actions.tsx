"use client";

import { useState } from "react";
import { toast } from "sonner";
import { apiJson } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { useQuoteDraftUnsaved } from "@/components/jobs/quote-draft";

const post = (url: string) => apiJson<{ checkoutUrl?: string }>(url, { method: "POST" });

/** Staff actions on a job: send the quote, cancel (asks first; a paid job is refunded), send a refund that didn't go through. */
export function StaffJobActions({ jobId, canSend, canCancel, paid, refundOwed = false }: { jobId: string; canSend: boolean; canCancel: boolean; paid: boolean; refundOwed?: boolean }) {
  // A cancel can stand even when its refund did not go through: the page is read again either way and shows what happened.
  const { run, busy, vars } = useRefreshingMutation((kind: "quote" | "cancel") => post(`/api/jobs/${jobId}/${kind}`), {
    refresh: "always",
    onError: (words) => toast.error(words),
    onSuccess: (_, kind) => toast.success(kind === "quote" ? "Quote sent to the owner." : refundOwed ? "The refund is on its way." : paid ? "Job cancelled; the refund is on its way." : "Job cancelled."),
  });
  // Cancelling asks first in the app's own dialog (as a claim's decision does), never the browser's confirm().
  const [asking, setAsking] = useState(false);
  const start = (kind: "quote" | "cancel") => {
    if (kind === "cancel" && !refundOwed) return setAsking(true);
    run(kind);
  };
  const doing = busy ? vars : null;
  // The owner is sent the quote as last saved: while the form beside holds other figures, saving comes first.
  const unsaved = useQuoteDraftUnsaved() && canSend;
  return (
    <div className="flex flex-wrap gap-2">
      <ConfirmDialog
        open={asking}
        title={paid ? "Cancel this job and refund the owner?" : "Cancel this job?"}
        confirmLabel={paid ? "Cancel and refund" : "Cancel the job"}
        cancelLabel="Keep the job"
        busy={busy}
        onConfirm={() => {
          setAsking(false);
          run("cancel");
        }}
        onCancel={() => setAsking(false)}
      >
        <p>{paid ? "The owner's payment is refunded in full, and they are told by e-mail." : "The owner will no longer be able to approve it."}</p>
      </ConfirmDialog>
      {canSend ? (
        <Button onClick={() => start("quote")} disabled={busy || unsaved} aria-describedby={unsaved ? "quote-unsaved" : undefined}>
          {doing === "quote" ? "Sending…" : "Send quote to owner"}
        </Button>
      ) : null}
      {canCancel ? (
        <Button variant="secondary" onClick={() => start("cancel")} disabled={busy}>
          {doing === "cancel" ? "Cancelling…" : paid ? "Cancel and refund" : "Cancel job"}
        </Button>
      ) : null}
      {refundOwed ? (
        <Button onClick={() => start("cancel")} disabled={busy}>
          {doing === "cancel" ? "Sending…" : "Send the refund again"}
        </Button>
      ) : null}
      {unsaved ? (
        <p id="quote-unsaved" className="w-full text-sm text-warn">
          The quote has changes not saved yet. Save the quote first: the owner is sent the quote as last saved.
        </p>
      ) : null}
    </div>
  );
}

/** The owner approves the quote the page shows (its version and total: a quote changed since is refused) and is sent to the payment page. */
export function ApproveAndPay({ jobId, label, quoteVersion, totalMinor }: { jobId: string; label: string; quoteVersion: number; totalMinor: number }) {
  const { run, busy } = useRefreshingMutation(() => apiJson<{ checkoutUrl?: string }>(`/api/jobs/${jobId}/approve`, { method: "POST", json: { quoteVersion, totalMinor } }), {
    onError: (words) => toast.error(words),
    goTo: (r) => String(r.checkoutUrl),
  });
  return (
    <Button className="w-full sm:w-auto" disabled={busy} onClick={() => run(undefined)}>
      {busy ? "Opening the payment page…" : label}
    </Button>
  );
}

export function OwnerCancelJob({ jobId }: { jobId: string }) {
  const { run, busy } = useRefreshingMutation(() => post(`/api/jobs/${jobId}/cancel`), {
    onError: (words) => toast.error(words),
    onSuccess: () => toast.success("Quote declined."),
  });
  const [asking, setAsking] = useState(false);
  return (
    <>
      <ConfirmDialog
        open={asking}
        title="Decline this quote?"
        confirmLabel="Decline the quote"
        cancelLabel="Keep the quote"
        busy={busy}
        onConfirm={() => {
          setAsking(false);
          run(undefined);
        }}
        onCancel={() => setAsking(false)}
      >
        <p>The repair is closed and nothing is charged. The studio is told, and you can still write to them about the piece or ask for another quote.</p>
      </ConfirmDialog>
      <Button variant="secondary" className="w-full sm:w-auto" disabled={busy} onClick={() => setAsking(true)}>
        Decline the quote
      </Button>
    </>
  );
}
