"use server";

import { redirect } from "next/navigation";
import { action } from "@/lib/http/action";
import { confirmSignOff } from "@/lib/visits/sign-off";
import { signOffSchema } from "@/lib/validation/visits";

const FAILED = "/visit-sign-off?failed=1";

/** Takes the sign-off link (single use) and says so; an unknown, used or expired link changes nothing. */
export const confirmSignOffAction = action({ schema: signOffSchema, refused: FAILED }, ({ token }) => {
  redirect(confirmSignOff(token) ? "/visit-sign-off?done=1" : FAILED);
});
