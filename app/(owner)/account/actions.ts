"use server";

import { revalidatePath } from "next/cache";
import { requireUser } from "@/lib/auth/guards";
import { updatePreferences } from "@/lib/owner/preferences";
import { validatedAction } from "@/lib/validation/action";
import { preferencesSchema } from "@/lib/validation/owner";

export const savePreferencesAction = validatedAction(preferencesSchema, async (input) => {
  const saved = updatePreferences(await requireUser(), input);
  revalidatePath("/", "layout");
  return saved;
});
