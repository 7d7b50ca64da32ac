"use server";

import { redirect } from "next/navigation";
import { resetPassword } from "@/lib/auth/accounts";
import { homePathFor } from "@/lib/auth/guards";
import { startSession } from "@/lib/auth/session";
import { action } from "@/lib/http/action";
import { resetPasswordSchema } from "@/lib/validation/auth";

export const resetPasswordAction = action({ schema: resetPasswordSchema }, async (input) => {
  const userId = await resetPassword(input);
  await startSession(userId);
  redirect(await homePathFor(userId));
});
