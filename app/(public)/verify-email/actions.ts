"use server";

import { redirect } from "next/navigation";
import { verifyEmail } from "@/lib/auth/accounts";
import { homePathFor } from "@/lib/auth/guards";
import { safeNextPath } from "@/lib/auth/next-path";
import { startSession } from "@/lib/auth/session";
import { action } from "@/lib/http/action";
import { confirmEmailSchema } from "@/lib/validation/auth";

const FAILED = "/verify-email/sent?failed=1";

/** Takes the verification token (single use), signs its owner in and carries on to where they were going. */
export const confirmEmailAction = action({ schema: confirmEmailSchema, refused: FAILED }, async ({ token, next }) => {
  const userId = verifyEmail(token);
  if (!userId) redirect(FAILED);
  await startSession(userId);
  redirect(safeNextPath(next) ?? `${await homePathFor(userId)}?verified=1`);
});
