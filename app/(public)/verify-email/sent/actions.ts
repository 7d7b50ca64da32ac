"use server";

import { sendVerificationEmail } from "@/lib/auth/accounts";
import { requireUser } from "@/lib/auth/guards";
import { safeNextPath } from "@/lib/auth/next-path";
import { consumeAttempt } from "@/lib/auth/rate-limit";
import { validatedAction } from "@/lib/validation/action";
import { z } from "zod";

export const resendVerificationAction = validatedAction(z.object({ next: z.string().max(500).optional() }), async ({ next }) => {
  const user = await requireUser();
  await consumeAttempt([["resetAccount", `verify:${user.id}`]]);
  await sendVerificationEmail(user.id, safeNextPath(next));
  return { ok: true as const, data: undefined, message: `We sent a new link to ${user.email}.` };
});
