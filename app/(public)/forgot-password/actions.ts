"use server";

import { requestPasswordReset } from "@/lib/auth/accounts";
import { clientIp } from "@/lib/auth/session";
import { action } from "@/lib/http/action";
import { forgotPasswordSchema } from "@/lib/validation/auth";

export const forgotPasswordAction = action({ schema: forgotPasswordSchema }, async (input) => {
  await requestPasswordReset(input, await clientIp());
  return { ok: true as const, data: undefined };
});
