"use server";

import { redirect } from "next/navigation";
import { clientIp, endCurrentSession } from "@/lib/auth/session";
import { action } from "@/lib/http/action";
import { deleteAccount } from "@/lib/owner/account-delete";
import { deleteAccountSchema } from "@/lib/validation/account";

/** Deletes the signed-in owner's account (lib/owner/account-delete.ts); every session ends and the browser lands on the page that says so. */
export const deleteAccountAction = action({ roles: ["owner"], schema: deleteAccountSchema }, async ({ current }, actor) => {
  await deleteAccount(actor, current, await clientIp());
  await endCurrentSession();
  redirect("/account-deleted");
});
