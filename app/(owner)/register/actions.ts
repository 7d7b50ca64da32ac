"use server";

import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { requireUser } from "@/lib/auth/guards";
import { clientIp } from "@/lib/auth/session";
import { registerPiece } from "@/lib/owner/registration";
import { validatedAction } from "@/lib/validation/action";
import { registrationSchema } from "@/lib/validation/owner";

export const registerAction = validatedAction(registrationSchema, async (input) => {
  const user = await requireUser();
  const { pieceId } = await registerPiece(user, input, await clientIp(), new Date(), { acceptLanguage: (await headers()).get("accept-language") });
  redirect(`/pieces/${pieceId}?registered=1`);
});
