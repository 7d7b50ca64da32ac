"use server";

import { redirect } from "next/navigation";
import { acceptInvitation } from "@/lib/auth/accounts";
import { homePathFor } from "@/lib/auth/guards";
import { getCurrentSession } from "@/lib/auth/session";
import { validatedAction } from "@/lib/validation/action";
import { acceptInvitationSchema } from "@/lib/validation/auth";

export const acceptInvitationAction = validatedAction(acceptInvitationSchema, async (input) => {
  const { user } = await getCurrentSession();
  const userId = await acceptInvitation(input, user?.id ?? null);
  redirect(await homePathFor(userId));
});
