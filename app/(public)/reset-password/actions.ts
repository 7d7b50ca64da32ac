"use server";

import { redirect } from "next/navigation";
import { resetPassword } from "@/lib/auth/accounts";
import { homePathFor } from "@/lib/auth/guards";
import { validatedAction } from "@/lib/validation/action";
import { resetPasswordSchema } from "@/lib/validation/auth";

export const resetPasswordAction = validatedAction(resetPasswordSchema, async (input) => {
  const userId = await resetPassword(input);
  redirect(await homePathFor(userId));
});
