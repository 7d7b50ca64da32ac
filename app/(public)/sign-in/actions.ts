"use server";

import { redirect } from "next/navigation";
import { signIn } from "@/lib/auth/accounts";
import { homePathFor } from "@/lib/auth/guards";
import { safeNextPath } from "@/lib/auth/next-path";
import { clientIp, startSession } from "@/lib/auth/session";
import { action } from "@/lib/http/action";
import { signInSchema } from "@/lib/validation/auth";

export const signInAction = action({ schema: signInSchema }, async (input) => {
  const user = await signIn(input, await clientIp());
  await startSession(user.id);
  redirect(safeNextPath(input.next) ?? (await homePathFor(user.id)));
});
