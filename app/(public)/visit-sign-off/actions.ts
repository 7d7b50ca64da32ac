"use server";

import { redirect } from "next/navigation";
import { z } from "zod";
import { confirmSignOff } from "@/lib/visits/sign-off";

const signOffSchema = z.object({ token: z.string().min(10).max(200) });

/** Takes the sign-off link (single use) and says so; an unknown, used or expired link changes nothing. */
export async function confirmSignOffAction(formData: FormData): Promise<void> {
  const parsed = signOffSchema.safeParse({ token: formData.get("token") });
  const done = parsed.success ? confirmSignOff(parsed.data.token) : null;
  redirect(done ? "/visit-sign-off?done=1" : "/visit-sign-off?failed=1");
}
