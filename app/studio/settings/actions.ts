"use server";

import { revalidatePath } from "next/cache";
import { requireAdmin } from "@/lib/auth/guards";
import { createPolicyVersion, updateProfile, updateReminderTiming } from "@/lib/settings";
import { validatedAction } from "@/lib/validation/action";
import { policyVersionSchema, profileSchema, reminderTimingSchema } from "@/lib/validation/settings";

export const saveProfileAction = validatedAction(profileSchema, async (input) => {
  const ctx = await requireAdmin();
  updateProfile(ctx, input);
  revalidatePath("/studio", "layout");
  return { ok: true as const, data: undefined, message: "Studio profile and rates saved." };
});

export const saveReminderTimingAction = validatedAction(reminderTimingSchema, async (input) => {
  const ctx = await requireAdmin();
  const t = updateReminderTiming(ctx, input);
  revalidatePath("/studio/settings/reminders");
  return { ok: true as const, data: undefined, message: t.steps.length ? "Reminder timing saved." : "Saved: no care reminders will be sent." };
});

export const createPolicyVersionAction = validatedAction(policyVersionSchema, async (input) => {
  const ctx = await requireAdmin();
  const row = createPolicyVersion(ctx, input);
  revalidatePath("/studio/settings/warranty");
  return { ok: true as const, data: { version: row.version }, message: `Version ${row.version} saved; it applies to pieces delivered from ${row.effectiveFrom}.` };
});
