"use server";

import { redirect } from "next/navigation";
import { resetPassword } from "@/lib/auth/accounts";
import { homePathFor } from "@/lib/auth/guards";
import { startSession } from "@/lib/auth/session";
import { validatedAction } from "@/lib/validation/action";
import { resetPasswordSchema } from "@/lib/validation/auth";

export const resetPasswordAction = validatedAction(resetPasswordSchema, async (input) => {
  const userId = await resetPassword(input);
  await startSession(userId);
  redirect(await homePathFor(userId));
});
