"use server";

import { cookies } from "next/headers";
import { redirect } from "next/navigation";
import { requireUser, STUDIO_COOKIE } from "@/lib/auth/guards";
import { env } from "@/lib/env";
import { createStudio } from "@/lib/studio/create";
import { startStudioSchema } from "@/lib/studio/create-schema";
import { validatedAction } from "@/lib/validation/action";

// The signed-in account becomes the new studio's admin, and the studio becomes the one it works in.
export const startStudioAction = validatedAction(startStudioSchema, async (input) => {
  const user = await requireUser();
  const studio = createStudio(user.id, input);
  (await cookies()).set(STUDIO_COOKIE, studio.id, {
    httpOnly: true,
    sameSite: "lax",
    path: "/",
    secure: env.APP_URL.startsWith("https:"),
  });
  redirect("/studio");
});
