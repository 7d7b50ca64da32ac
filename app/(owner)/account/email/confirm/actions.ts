"use server";

import { redirect } from "next/navigation";
import { startSession } from "@/lib/auth/session";
import { action } from "@/lib/http/action";
import { confirmEmailChange } from "@/lib/owner/account-email";
import { confirmEmailChangeSchema } from "@/lib/validation/account";

const FAILED = "/account/email/confirm?failed=1";

/** Takes the change link for the signed-in account (another account's link changes nothing) and carries on in a fresh session. */
export const confirmEmailChangeAction = action({ roles: ["owner"], schema: confirmEmailChangeSchema, refused: FAILED }, async ({ token }, { user }) => {
  const outcome = await confirmEmailChange(user, token);
  if (outcome.kind === "taken") redirect("/account/email/confirm?failed=taken");
  if (outcome.kind !== "changed") redirect(FAILED);
  // Every session ended with the change; this browser carries on in a fresh one.
  await startSession(user.id);
  redirect("/account?email=changed");
});
