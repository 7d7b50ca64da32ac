"use server";

import { z } from "zod";
import { sendVerificationEmail } from "@/lib/auth/accounts";
import { safeNextPath } from "@/lib/auth/next-path";
import { consumeAttempt } from "@/lib/auth/rate-limit";
import { action } from "@/lib/http/action";

export const resendVerificationAction = action({ roles: ["owner"], schema: z.object({ next: z.string().max(500).optional() }) }, async ({ next }, { user }) => {
  await consumeAttempt([["resetAccount", `verify:${user.id}`]]);
  await sendVerificationEmail(user.id, safeNextPath(next));
  return { ok: true as const, data: undefined, message: `We sent a new link to ${user.email}.` };
});
