"use server";

import { redirect } from "next/navigation";
import { endCurrentSession } from "@/lib/auth/session";
import { action } from "@/lib/http/action";

/** Anyone may post it, signed in or not: it lands on the sign-in page saying the device is signed out (on a shared computer, that is what one checks for). */
export const signOutAction = action({ refused: "/" }, async () => {
  await endCurrentSession();
  redirect("/sign-in?signed-out=1");
});
