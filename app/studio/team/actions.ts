"use server";

import { action } from "@/lib/http/action";
import { revalidatePath } from "next/cache";
import { inviteMember } from "@/lib/auth/accounts";
import { changeMemberRole, removeMember, revokeInvitation } from "@/lib/studio/team";
import { inviteSchema, revokeInvitationSchema } from "@/lib/validation/auth";
import { changeRoleSchema, removeMemberSchema } from "@/lib/validation/settings";

export const inviteAction = action({ roles: ["admin"], schema: inviteSchema }, async (input, ctx) => {
  const sent = await inviteMember(ctx, input);
  revalidatePath("/studio/team");
  const before = sent.replaced.length ? ` The link sent before (as ${sent.replaced.join(", ")}) no longer works.` : "";
  return { ok: true as const, data: undefined, message: `Invitation sent to ${input.email}.${before}` };
});

export const changeRoleAction = action({ roles: ["admin"], schema: changeRoleSchema }, async (input, ctx) => {
  const m = changeMemberRole(ctx, input);
  revalidatePath("/studio/team");
  return { ok: true as const, data: undefined, message: m.changed ? `${m.name} is now ${m.role === "admin" ? "an admin" : m.role}.` : `${m.name} already had that role.` };
});

export const removeMemberAction = action({ roles: ["admin"], schema: removeMemberSchema }, async (input, ctx) => {
  const m = await removeMember(ctx, input);
  revalidatePath("/studio/team");
  return { ok: true as const, data: undefined, message: `${m.name} was removed and signed out.` };
});

export const revokeInvitationAction = action({ roles: ["admin"], schema: revokeInvitationSchema }, async (input, ctx) => {
  const invitation = revokeInvitation(ctx, input);
  revalidatePath("/studio/team");
  return { ok: true as const, data: undefined, message: `The invitation for ${invitation.email} was withdrawn.` };
});
