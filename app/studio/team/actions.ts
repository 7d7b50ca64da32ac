"use server";

import { revalidatePath } from "next/cache";
import { inviteMember } from "@/lib/auth/accounts";
import { requireAdmin } from "@/lib/auth/guards";
import { validatedAction } from "@/lib/validation/action";
import { inviteSchema } from "@/lib/validation/auth";

export const inviteAction = validatedAction(inviteSchema, async (input) => {
  const ctx = await requireAdmin();
  await inviteMember(ctx, input);
  revalidatePath("/studio/team");
  return { ok: true as const, data: undefined, message: `Invitation sent to ${input.email}.` };
});
