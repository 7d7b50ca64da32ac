"use client";

import { useState } from "react";
import { toast } from "sonner";
import { actionData } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { Notice } from "@/components/ui/notice";
import type { ActionResult } from "@/lib/validation/action";
import type { RevokeInvitationInput } from "@/lib/validation/auth";

export type InvitationView = { id: string; email: string; roleLabel: string; until: string };

/** Invitations still waiting to be accepted, each of which an admin can withdraw. */
export function InvitationList({ invitations, revoke }: { invitations: InvitationView[]; revoke: (v: RevokeInvitationInput) => Promise<ActionResult<unknown>> }) {
  const [pending, setPending] = useState<InvitationView | null>(null);
  const { run: withdraw, busy, error } = useRefreshingMutation((invitation: InvitationView) => actionData(revoke({ invitationId: invitation.id })), {
    onSuccess: (r) => {
      setPending(null);
      toast.success(r.message ?? "Invitation withdrawn.");
    },
    onError: () => setPending(null),
  });

  return (
    <>
      {error ? <Notice tone="error" className="mb-3">{error}</Notice> : null}
      <ul className="divide-y divide-line text-sm" aria-label="Invitations waiting">
        {invitations.map((i) => (
          <li key={i.id} className="flex flex-col gap-2 py-2 sm:flex-row sm:items-center sm:justify-between">
            <div>
              <p className="break-all font-medium">{i.email}</p>
              <p className="text-muted">
                {i.roleLabel} · the link works until {i.until}
              </p>
            </div>
            <Button variant="secondary" className="text-danger hover:border-danger hover:text-danger" disabled={busy} onClick={() => setPending(i)}>
              Withdraw<span className="sr-only"> the invitation for {i.email}</span>
            </Button>
          </li>
        ))}
      </ul>
      <ConfirmDialog
        open={pending !== null}
        title={pending ? `Withdraw the invitation for ${pending.email}?` : ""}
        confirmLabel="Withdraw the invitation"
        busy={busy}
        onCancel={() => setPending(null)}
        onConfirm={() => pending && withdraw(pending)}
      >
        <p>The link in their e-mail stops working at once. You can invite them again later.</p>
      </ConfirmDialog>
    </>
  );
}
