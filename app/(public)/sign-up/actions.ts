"use server";

import { redirect } from "next/navigation";
import { signUp } from "@/lib/auth/accounts";
import { safeNextPath } from "@/lib/auth/next-path";
import { clientIp } from "@/lib/auth/session";
import { action } from "@/lib/http/action";
import { signUpSchema } from "@/lib/validation/auth";

// The same answer whether or not the address already has an account (its owner gets a mail instead),
// so no session starts here: the confirmation link signs the new owner in.
export const signUpAction = action({ schema: signUpSchema }, async (input) => {
  const next = safeNextPath(input.next);
  await signUp({ ...input, next }, await clientIp());
  redirect(`/verify-email/sent?${new URLSearchParams({ to: input.email, ...(next ? { next } : {}) })}`);
});
