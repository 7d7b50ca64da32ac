"use server";

import { revalidatePath } from "next/cache";
import { inviteMember } from "@/lib/auth/accounts";
import { requireAdmin } from "@/lib/auth/guards";
import { changeMemberRole, removeMember, revokeInvitation } from "@/lib/studio/team";
import { validatedAction } from "@/lib/validation/action";
import { inviteSchema, revokeInvitationSchema } from "@/lib/validation/auth";
import { changeRoleSchema, removeMemberSchema } from "@/lib/validation/settings";

export const inviteAction = validatedAction(inviteSchema, async (input) => {
  const ctx = await requireAdmin();
  await inviteMember(ctx, input);
  revalidatePath("/studio/team");
  return { ok: true as const, data: undefined, message: `Invitation sent to ${input.email}.` };
});

export const changeRoleAction = validatedAction(changeRoleSchema, async (input) => {
  const ctx = await requireAdmin();
  const m = changeMemberRole(ctx, input);
  revalidatePath("/studio/team");
  return { ok: true as const, data: undefined, message: m.changed ? `${m.name} is now ${m.role === "admin" ? "an admin" : m.role}.` : `${m.name} already had that role.` };
});

export const removeMemberAction = validatedAction(removeMemberSchema, async (input) => {
  const ctx = await requireAdmin();
  const m = await removeMember(ctx, input);
  revalidatePath("/studio/team");
  return { ok: true as const, data: undefined, message: `${m.name} was removed and signed out.` };
});

export const revokeInvitationAction = validatedAction(revokeInvitationSchema, async (input) => {
  const ctx = await requireAdmin();
  const invitation = revokeInvitation(ctx, input);
  revalidatePath("/studio/team");
  return { ok: true as const, data: undefined, message: `The invitation for ${invitation.email} was withdrawn.` };
});
