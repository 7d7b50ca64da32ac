import type { Metadata } from "next";
import { InviteForm } from "@/components/team/invite-form";
import { Card, PageHeader } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { listMembers, listOpenInvitations } from "@/lib/studio/team";
import { inviteAction } from "./actions";

export const metadata: Metadata = { title: "Team" };

const ROLE_NOTES = {
  admin: "everything, plus team and settings",
  staff: "pieces, claims, quotes and bookings",
  technician: "their visits and visit reports",
} as const;

export default async function TeamPage() {
  const ctx = await forPage(requireAdmin);
  const members = listMembers(ctx);
  const invites = listOpenInvitations(ctx);
  return (
    <>
      <PageHeader title="Team" lead="Who works in this studio on Grainward, and what each role can do." />
      <div className="space-y-6">
        <Card className="space-y-4">
          <h2 className="font-semibold">Invite someone</h2>
          <InviteForm action={inviteAction} />
        </Card>
        <Card>
          <h2 className="mb-3 font-semibold">Members</h2>
          <ul className="divide-y divide-line">
            {members.map((m) => (
              <li key={m.id} className="flex flex-col py-2 sm:flex-row sm:justify-between">
                <span>
                  {m.name} <span className="text-muted">· {m.email}</span>
                </span>
                <span className="text-sm">
                  <strong className="capitalize">{m.role}</strong> <span className="text-muted">— {ROLE_NOTES[m.role]}</span>
                </span>
              </li>
            ))}
          </ul>
        </Card>
        {invites.length ? (
          <Card>
            <h2 className="mb-3 font-semibold">Waiting to join</h2>
            <ul className="divide-y divide-line text-sm">
              {invites.map((i) => (
                <li key={i.id} className="flex justify-between py-2">
                  <span>{i.email}</span>
                  <span className="capitalize text-muted">{i.role} · until {i.expiresAt.toISOString().slice(0, 10)}</span>
                </li>
              ))}
            </ul>
          </Card>
        ) : null}
      </div>
    </>
  );
}
