"use server";

import { redirect } from "next/navigation";
import { signIn } from "@/lib/auth/accounts";
import { homePathFor } from "@/lib/auth/guards";
import { safeNextPath } from "@/lib/auth/next-path";
import { clientIp, startSession } from "@/lib/auth/session";
import { validatedAction } from "@/lib/validation/action";
import { signInSchema } from "@/lib/validation/auth";

export const signInAction = validatedAction(signInSchema, async (input) => {
  const user = await signIn(input, await clientIp());
  await startSession(user.id);
  redirect(safeNextPath(input.next) ?? (await homePathFor(user.id)));
});
