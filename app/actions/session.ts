"use server";

import { redirect } from "next/navigation";
import { z } from "zod";
import { safeNextPath } from "@/lib/auth/next-path";
import { endCurrentSession } from "@/lib/auth/session";
import { action } from "@/lib/http/action";

// `next`: where to come back after signing in again as someone else (a hand-over link opened while signed
// in with another address, app/(public)/hand-over/[token]/page.tsx). Optional, and the body may be absent.
const signOutSchema = z.object({ next: z.string().max(500).optional() }).optional();

/** Anyone may post it, signed in or not: it lands on the sign-in page saying the device is signed out (on a shared computer, that is what one checks for). */
export const signOutAction = action({ refused: "/", schema: signOutSchema }, async (input) => {
  await endCurrentSession();
  const next = safeNextPath(input?.next);
  redirect(`/sign-in?${new URLSearchParams({ "signed-out": "1", ...(next ? { next } : {}) })}`);
});
