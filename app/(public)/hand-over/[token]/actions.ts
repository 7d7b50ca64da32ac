"use server";

import { redirect } from "next/navigation";
import { requireUser } from "@/lib/auth/guards";
import { clientIp } from "@/lib/auth/session";
import { registerByHandover } from "@/lib/pieces/handover";
import { validatedAction } from "@/lib/validation/action";
import { handoverTokenSchema } from "@/lib/validation/clients";

/** One tap: registers the piece behind the hand-over link to the signed-in account. */
export const registerByHandoverAction = validatedAction(handoverTokenSchema, async ({ token }) => {
  const user = await requireUser();
  const { pieceId } = await registerByHandover(user, token, await clientIp());
  redirect(`/pieces/${pieceId}?registered=1`);
});
