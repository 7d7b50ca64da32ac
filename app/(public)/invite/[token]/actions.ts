"use server";

import { redirect } from "next/navigation";
import { acceptInvitation } from "@/lib/auth/accounts";
import { homePathFor } from "@/lib/auth/guards";
import { getCurrentSession, startSession } from "@/lib/auth/session";
import { validatedAction } from "@/lib/validation/action";
import { acceptInvitationSchema } from "@/lib/validation/auth";

export const acceptInvitationAction = validatedAction(acceptInvitationSchema, async (input) => {
  const { user } = await getCurrentSession();
  const { userId, newAccount } = await acceptInvitation(input, user?.id ?? null);
  if (newAccount) await startSession(userId);
  redirect(await homePathFor(userId));
});
