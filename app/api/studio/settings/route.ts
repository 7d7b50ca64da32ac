import { NextResponse } from "next/server";
import { requireAdmin } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { profileFormValues, reminderTiming, updateProfile, updateReminderTiming, updateVisitRules, visitRules } from "@/lib/settings";
import { profileSchema, reminderTimingSchema, visitRulesSchema } from "@/lib/validation/settings";
import { z } from "zod";

/** The studio's profile, rates, reminder timing and visit booking rules (admins). */
export const GET = route(async () => {
  const ctx = await requireAdmin();
  return NextResponse.json(settingsOf(ctx));
});

function settingsOf(ctx: Awaited<ReturnType<typeof requireAdmin>>) {
  return { profile: profileFormValues(ctx), reminders: reminderTiming(ctx), visits: visitRules(ctx) };
}

const patchSchema = z.object({ profile: profileSchema.optional(), reminders: reminderTimingSchema.optional(), visits: visitRulesSchema.optional() });

export const PATCH = route(async (req) => {
  const ctx = await requireAdmin();
  const body = await parseJson(req, patchSchema);
  if (body.profile) updateProfile(ctx, body.profile);
  if (body.reminders) updateReminderTiming(ctx, body.reminders);
  if (body.visits) updateVisitRules(ctx, body.visits);
  return NextResponse.json(settingsOf(ctx));
});
