import { z } from "zod";
import type { StudioActor } from "@/lib/auth/actor";
import { route } from "@/lib/http/route";
import { profileFormValues, reminderTiming, updateProfile, updateReminderTiming, updateVisitRules, visitRules } from "@/lib/settings";
import { profileSchema, reminderTimingSchema, visitRulesSchema } from "@/lib/validation/settings";

function settingsOf(actor: StudioActor) {
  return { profile: profileFormValues(actor), reminders: reminderTiming(actor), visits: visitRules(actor) };
}

const patchSchema = z.object({ profile: profileSchema.optional(), reminders: reminderTimingSchema.optional(), visits: visitRulesSchema.optional() });

/** The studio's profile, rates, reminder timing and visit booking rules (admins). */
export const GET = route({ roles: ["admin"] }, ({ actor }) => settingsOf(actor));

export const PATCH = route({ roles: ["admin"], body: patchSchema }, ({ actor, body }) => {
  if (body.profile) updateProfile(actor, body.profile);
  if (body.reminders) updateReminderTiming(actor, body.reminders);
  if (body.visits) updateVisitRules(actor, body.visits);
  return settingsOf(actor);
});
