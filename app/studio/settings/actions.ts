"use server";

import { action } from "@/lib/http/action";
import { revalidatePath } from "next/cache";
import { warrantyTermsName } from "@/lib/claims/coverage";
import { createPolicyVersion, updateProfile, updateReminderTiming, updateVisitRules } from "@/lib/settings";
import { policyVersionSchema, profileSchema, reminderTimingSchema, visitRulesSchema } from "@/lib/validation/settings";

export const saveProfileAction = action({ roles: ["admin"], schema: profileSchema }, async (input, ctx) => {
  updateProfile(ctx, input);
  revalidatePath("/studio", "layout");
  return { ok: true as const, data: undefined, message: "Studio profile and rates saved." };
});

export const saveReminderTimingAction = action({ roles: ["admin"], schema: reminderTimingSchema }, async (input, ctx) => {
  const t = updateReminderTiming(ctx, input);
  revalidatePath("/studio/settings/reminders");
  return { ok: true as const, data: undefined, message: t.steps.length ? "Reminder timing saved." : "Saved: no care reminders will be sent." };
});

export const createPolicyVersionAction = action({ roles: ["admin"], schema: policyVersionSchema }, async (input, ctx) => {
  const row = createPolicyVersion(ctx, input);
  revalidatePath("/studio/settings/warranty");
  return { ok: true as const, data: { version: row.version }, message: `${warrantyTermsName(row.effectiveFrom)} saved. Pieces delivered before then keep the terms they had.` };
});

export const saveVisitRulesAction = action({ roles: ["admin"], schema: visitRulesSchema }, async (input, ctx) => {
  updateVisitRules(ctx, input);
  revalidatePath("/studio/settings/visits");
  return { ok: true as const, data: undefined, message: "Visit booking rules saved. New bookings follow them; visits already booked stay as they are." };
});
