"use server";

import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { clientIp } from "@/lib/auth/session";
import { action } from "@/lib/http/action";
import { registerPiece } from "@/lib/owner/registration";
import { registrationSchema } from "@/lib/validation/owner";

export const registerAction = action({ roles: ["owner"], schema: registrationSchema }, async (input, actor) => {
  const { pieceId } = await registerPiece(actor.user, input, await clientIp(), new Date(), { acceptLanguage: (await headers()).get("accept-language") });
  redirect(`/pieces/${pieceId}?registered=1`);
});
