"use client";

import { useState } from "react";
import { toast } from "sonner";
import { actionData } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import type { StudioRole } from "@/lib/care/vocabulary";
import type { ActionResult } from "@/lib/validation/action";
import type { ChangeRoleInput, RemoveMemberInput } from "@/lib/validation/settings";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import type { SpriteIconName } from "@/components/ui/sprite-names";

export type MemberView = { id: string; name: string; email: string; role: StudioRole; isYou: boolean };

const ROLE_LOOK: Record<StudioRole, { label: string; icon: SpriteIconName; note: string }> = {
  admin: { label: "Admin", icon: "shield-check", note: "everything, plus team and settings" },
  staff: { label: "Staff", icon: "user", note: "pieces, claims, quotes and bookings" },
  technician: { label: "Technician", icon: "wrench", note: "their visits and visit reports" },
};
const RANK: Record<StudioRole, number> = { admin: 3, staff: 2, technician: 1 };

type Pending = { kind: "role"; member: MemberView; role: StudioRole } | { kind: "remove"; member: MemberView };

export function MemberList({
  members,
  adminCount,
  changeRole,
  remove,
}: {
  members: MemberView[];
  adminCount: number;
  changeRole: (v: ChangeRoleInput) => Promise<ActionResult<unknown>>;
  remove: (v: RemoveMemberInput) => Promise<ActionResult<unknown>>;
}) {
  const [choice, setChoice] = useState<Record<string, StudioRole>>({});
  const [pending, setPending] = useState<Pending | null>(null);
  const { run, busy, vars, error } = useRefreshingMutation(
    (p: Pending) => actionData(p.kind === "role" ? changeRole({ membershipId: p.member.id, role: p.role }) : remove({ membershipId: p.member.id })),
    {
      onSuccess: (r) => {
        setPending(null);
        toast.success(r.message ?? "Saved.");
      },
      onError: () => setPending(null),
    },
  );
  // The refusal shows under the member it was about.
  const errorFor = error && vars ? vars.member.id : null;

  function askRole(m: MemberView) {
    const role = choice[m.id] ?? m.role;
    if (role === m.role) return;
    const p: Pending = { kind: "role", member: m, role };
    // Taking rights away asks first; giving more does not.
    if (RANK[role] < RANK[m.role]) setPending(p);
    else run(p);
  }

  return (
    <>
      <ul className="divide-y divide-line">
        {members.map((m) => {
          const look = ROLE_LOOK[m.role];
          const lastAdmin = m.role === "admin" && adminCount <= 1;
          const selected = choice[m.id] ?? m.role;
          return (
            <li key={m.id} className="flex flex-col gap-3 py-3 md:flex-row md:items-center md:justify-between">
              <div>
                <p className="font-medium">
                  {m.name} {m.isYou ? <span className="text-sm font-normal text-muted">(you)</span> : null}
                </p>
                <p className="text-sm text-muted break-all">{m.email}</p>
                <p className="mt-1 inline-flex items-center gap-1.5 text-sm">
                  <SpriteIcon name={look.icon} className="size-4 text-resin" />
                  <strong>{look.label}</strong> <span className="text-muted">— {look.note}</span>
                </p>
                {lastAdmin ? <p className="text-sm text-muted">The studio&apos;s only admin: make someone else an admin before changing this role.</p> : null}
                {errorFor === m.id ? (
                  <Notice tone="error" className="mt-2">
                    {error}
                  </Notice>
                ) : null}
              </div>
              <div className="flex flex-wrap items-end gap-2">
                <label className="text-sm">
                  <span className="sr-only">Role for {m.name}</span>
                  <select
                    className="min-h-11 rounded-lg border border-line bg-white px-3"
                    value={selected}
                    disabled={lastAdmin || busy}
                    onChange={(e) => setChoice((c) => ({ ...c, [m.id]: e.target.value as StudioRole }))}
                  >
                    <option value="admin">Admin</option>
                    <option value="staff">Staff</option>
                    <option value="technician">Technician</option>
                  </select>
                </label>
                <Button variant="secondary" disabled={selected === m.role || busy} onClick={() => askRole(m)}>
                  Change role
                </Button>
                <Button variant="secondary" className="text-danger hover:border-danger hover:text-danger" disabled={lastAdmin || m.isYou || busy} onClick={() => setPending({ kind: "remove", member: m })}>
                  Remove
                </Button>
              </div>
            </li>
          );
        })}
      </ul>
      <ConfirmDialogFor pending={pending} busy={busy} onCancel={() => setPending(null)} onConfirm={() => pending && run(pending)} />
    </>
  );
}


function ConfirmDialogFor({ pending, busy, onCancel, onConfirm }: { pending: Pending | null; busy: boolean; onCancel: () => void; onConfirm: () => void }) {
  const title = pending?.kind === "remove" ? `Remove ${pending.member.name}?` : pending ? `Make ${pending.member.name} ${ROLE_LOOK[pending.role].label.toLowerCase()}?` : "";
  return (
    <ConfirmDialog open={pending !== null} title={title} confirmLabel={pending?.kind === "remove" ? "Remove from the studio" : "Change role"} busy={busy} onCancel={onCancel} onConfirm={onConfirm}>
      {pending?.kind === "remove" ? (
        <p>They lose access to this studio at once and are signed out on every device. Their past work stays in the records and the audit log.</p>
      ) : pending ? (
        <p>
          They will be able to do only what a {ROLE_LOOK[pending.role].label.toLowerCase()} can: {ROLE_LOOK[pending.role].note}. This takes effect on their next page.
        </p>
      ) : null}
    </ConfirmDialog>
  );
}
