import { NextResponse } from "next/server";
import { requireAdmin } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { profileFormValues, reminderTiming, updateProfile, updateReminderTiming } from "@/lib/settings";
import { profileSchema, reminderTimingSchema } from "@/lib/validation/settings";
import { z } from "zod";

/** The studio's profile, rates and reminder timing (admins). */
export const GET = route(async () => {
  const ctx = await requireAdmin();
  return NextResponse.json({ profile: profileFormValues(ctx), reminders: reminderTiming(ctx) });
});

const patchSchema = z.object({ profile: profileSchema.optional(), reminders: reminderTimingSchema.optional() });

export const PATCH = route(async (req) => {
  const ctx = await requireAdmin();
  const body = await parseJson(req, patchSchema);
  if (body.profile) updateProfile(ctx, body.profile);
  if (body.reminders) updateReminderTiming(ctx, body.reminders);
  return NextResponse.json({ profile: profileFormValues(ctx), reminders: reminderTiming(ctx) });
});
