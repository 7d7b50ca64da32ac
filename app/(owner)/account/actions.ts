"use server";

import { revalidatePath } from "next/cache";
import { action } from "@/lib/http/action";
import { updateName, updatePreferences } from "@/lib/owner/preferences";
import { changeNameSchema } from "@/lib/validation/auth";
import { preferencesSchema } from "@/lib/validation/owner";

export const savePreferencesAction = action({ roles: ["owner"], schema: preferencesSchema }, (input, actor) => {
  const saved = updatePreferences(actor.user, input);
  revalidatePath("/", "layout");
  return saved;
});

export const saveNameAction = action({ roles: ["owner"], schema: changeNameSchema }, (input, actor) => {
  const saved = updateName(actor.user, input.name);
  revalidatePath("/", "layout");
  return saved;
});
