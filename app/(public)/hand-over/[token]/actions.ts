"use server";

import { redirect } from "next/navigation";
import { clientIp } from "@/lib/auth/session";
import { action } from "@/lib/http/action";
import { registerByHandover } from "@/lib/pieces/handover";
import { handoverTokenSchema } from "@/lib/validation/clients";

/** One tap: registers the piece behind the hand-over link to the signed-in account. */
export const registerByHandoverAction = action({ roles: ["owner"], schema: handoverTokenSchema }, async ({ token }, actor) => {
  const { pieceId } = await registerByHandover(actor.user, token, await clientIp());
  redirect(`/pieces/${pieceId}?registered=1`);
});
