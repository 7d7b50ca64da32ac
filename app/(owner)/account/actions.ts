"use server";

import { revalidatePath } from "next/cache";
import { action } from "@/lib/http/action";
import { updatePreferences } from "@/lib/owner/preferences";
import { preferencesSchema } from "@/lib/validation/owner";

export const savePreferencesAction = action({ roles: ["owner"], schema: preferencesSchema }, (input, actor) => {
  const saved = updatePreferences(actor.user, input);
  revalidatePath("/", "layout");
  return saved;
});
