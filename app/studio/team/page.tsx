import type { Metadata } from "next";
import { InvitationList } from "@/components/team/invitation-list";
import { InviteForm } from "@/components/team/invite-form";
import { MemberList } from "@/components/team/member-list";
import { Card, PageHeader } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { formatInstant } from "@/lib/format";
import { listMembers, listOpenInvitations } from "@/lib/studio/team";
import { changeRoleAction, inviteAction, removeMemberAction, revokeInvitationAction } from "./actions";

const ROLE_LABEL = { admin: "Admin", staff: "Staff", technician: "Technician" } as const;

export const metadata: Metadata = { title: "Team" };

export default async function TeamPage() {
  const ctx = await forPage(requireAdmin);
  const members = listMembers(ctx);
  const invites = listOpenInvitations(ctx);
  return (
    <>
      <PageHeader title="Team" lead="Who works in this studio on Grainward, and what each role can do. A studio always keeps at least one admin." />
      <div className="space-y-6">
        <Card className="space-y-4">
          <h2 className="font-semibold">Invite someone</h2>
          <InviteForm action={inviteAction} />
        </Card>
        <Card>
          <h2 className="mb-3 font-semibold">Members</h2>
          <MemberList
            members={members.map((m) => ({ id: m.id, name: m.name, email: m.email, role: m.role, isYou: m.userId === ctx.user.id }))}
            adminCount={members.filter((m) => m.role === "admin").length}
            changeRole={changeRoleAction}
            remove={removeMemberAction}
          />
        </Card>
        {invites.length ? (
          <Card>
            <h2 className="mb-3 font-semibold">Waiting to join</h2>
            <InvitationList
              invitations={invites.map((i) => ({ id: i.id, email: i.email, roleLabel: ROLE_LABEL[i.role], until: formatInstant(i.expiresAt, ctx.studio.timeZone, { time: true }) }))}
              revoke={revokeInvitationAction}
            />
          </Card>
        ) : null}
      </div>
    </>
  );
}
