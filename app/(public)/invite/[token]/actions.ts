"use server";

import { redirect } from "next/navigation";
import { acceptInvitation } from "@/lib/auth/accounts";
import { getActor } from "@/lib/auth/actor";
import { homePathFor } from "@/lib/auth/guards";
import { startSession } from "@/lib/auth/session";
import { action } from "@/lib/http/action";
import { acceptInvitationSchema } from "@/lib/validation/auth";

/** Signed in or not: a new account is made (and signed in) when the invited address has none. */
export const acceptInvitationAction = action({ schema: acceptInvitationSchema }, async (input) => {
  const actor = await getActor();
  const { userId, newAccount } = await acceptInvitation(input, actor?.user.id ?? null);
  if (newAccount) await startSession(userId);
  redirect(await homePathFor(userId));
});
