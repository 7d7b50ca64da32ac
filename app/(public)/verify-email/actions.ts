"use server";

import { redirect } from "next/navigation";
import { z } from "zod";
import { verifyEmail } from "@/lib/auth/accounts";
import { homePathFor } from "@/lib/auth/guards";
import { safeNextPath } from "@/lib/auth/next-path";
import { startSession } from "@/lib/auth/session";

const confirmSchema = z.object({ token: z.string().min(10).max(200), next: z.string().max(500).optional() });

/** Takes the verification token (single use), signs its owner in and carries on to where they were going. */
export async function confirmEmailAction(formData: FormData): Promise<void> {
  const parsed = confirmSchema.safeParse({ token: formData.get("token"), next: formData.get("next") ?? undefined });
  const userId = parsed.success ? verifyEmail(parsed.data.token) : null;
  if (!userId) redirect("/verify-email/sent?failed=1");
  await startSession(userId);
  redirect(safeNextPath(parsed.data?.next) ?? `${await homePathFor(userId)}?verified=1`);
}
