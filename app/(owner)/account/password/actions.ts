"use server";

import { changePassword } from "@/lib/auth/accounts";
import { clientIp, startSession } from "@/lib/auth/session";
import { action } from "@/lib/http/action";
import { changePasswordSchema } from "@/lib/validation/auth";

export const changePasswordAction = action({ roles: ["owner"], schema: changePasswordSchema }, async (input, { user }) => {
  await changePassword(user.id, input, await clientIp());
  // Every session ended, this one included; carry on in a fresh one.
  await startSession(user.id);
  return { ok: true as const, data: undefined, message: "Password changed. You're signed out on every other device." };
});
