"use server";

import { redirect } from "next/navigation";
import { signUp } from "@/lib/auth/accounts";
import { clientIp, startSession } from "@/lib/auth/session";
import { validatedAction } from "@/lib/validation/action";
import { safeNextPath, signUpSchema } from "@/lib/validation/auth";

export const signUpAction = validatedAction(signUpSchema, async (input) => {
  const user = await signUp({ ...input, next: safeNextPath(input.next) }, await clientIp());
  await startSession(user.id);
  redirect(`/verify-email/sent${input.next ? `?next=${encodeURIComponent(input.next)}` : ""}`);
});
