"use server";

import { cookies } from "next/headers";
import { redirect } from "next/navigation";
import { STUDIO_COOKIE } from "@/lib/auth/actor";
import { env } from "@/lib/env";
import { action } from "@/lib/http/action";
import { createStudio } from "@/lib/studio/create";
import { startStudioSchema } from "@/lib/studio/create-schema";

// The signed-in account becomes the new studio's admin, and the studio becomes the one it works in.
export const startStudioAction = action({ roles: ["owner"], schema: startStudioSchema }, async (input, { user }) => {
  const studio = createStudio(user.id, input);
  (await cookies()).set(STUDIO_COOKIE, studio.id, {
    httpOnly: true,
    sameSite: "lax",
    path: "/",
    secure: env.APP_URL.startsWith("https:"),
  });
  redirect("/studio");
});
