"use server";

import { revalidatePath } from "next/cache";
import { requireAdmin } from "@/lib/auth/guards";
import { createPolicyVersion, updateProfile, updateReminderTiming, updateVisitRules } from "@/lib/settings";
import { validatedAction } from "@/lib/validation/action";
import { policyVersionSchema, profileSchema, reminderTimingSchema, visitRulesSchema } from "@/lib/validation/settings";

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

export const saveVisitRulesAction = validatedAction(visitRulesSchema, async (input) => {
  const ctx = await requireAdmin();
  updateVisitRules(ctx, input);
  revalidatePath("/studio/settings/visits");
  return { ok: true as const, data: undefined, message: "Visit booking rules saved. New bookings follow them; visits already booked stay as they are." };
});
