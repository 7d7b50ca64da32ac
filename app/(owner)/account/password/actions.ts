"use server";

import { changePassword } from "@/lib/auth/accounts";
import { requireUser } from "@/lib/auth/guards";
import { clientIp, startSession } from "@/lib/auth/session";
import { validatedAction } from "@/lib/validation/action";
import { changePasswordSchema } from "@/lib/validation/auth";

export const changePasswordAction = validatedAction(changePasswordSchema, async (input) => {
  const user = await requireUser();
  await changePassword(user.id, input, await clientIp());
  // Every session ended, this one included; carry on in a fresh one.
  await startSession(user.id);
  return { ok: true as const, data: undefined, message: "Password changed. You're signed out on every other device." };
});
