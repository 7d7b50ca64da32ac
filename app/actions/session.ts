"use server";

import { redirect } from "next/navigation";
import { endCurrentSession } from "@/lib/auth/session";
import { action } from "@/lib/http/action";

/** Anyone may post it: signed out already, it just goes home. */
export const signOutAction = action({ refused: "/" }, async () => {
  await endCurrentSession();
  redirect("/");
});
