"use server";

import { revalidatePath } from "next/cache";
import { clientIp } from "@/lib/auth/session";
import { action } from "@/lib/http/action";
import { cancelEmailChange, requestEmailChange } from "@/lib/owner/account-email";
import { changeEmailSchema } from "@/lib/validation/account";

export const requestEmailChangeAction = action({ roles: ["owner"], schema: changeEmailSchema }, async (input, { user }) => {
  const pending = await requestEmailChange(user, input, await clientIp());
  revalidatePath("/account", "layout");
  return { ok: true as const, data: pending, message: `We sent a link to ${pending.newEmail}. Your address changes when you open it.` };
});

export const cancelEmailChangeAction = action({ roles: ["owner"] }, (_input, { user }) => {
  const done = cancelEmailChange(user);
  revalidatePath("/account", "layout");
  return { ok: true as const, data: done, message: done.cancelled ? "Change cancelled. Its link no longer works." : "There was no change waiting." };
});
