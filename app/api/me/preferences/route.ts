import { z } from "zod";
import { route } from "@/lib/http/route";
import { getPreferences, updatePreferences } from "@/lib/owner/preferences";

export const GET = route({ roles: ["owner"] }, ({ actor }) => ({ preferences: getPreferences(actor.user) }));

// lib/owner/preferences.ts parses the patch (preferencesPatchSchema).
export const PATCH = route({ roles: ["owner"], body: z.unknown() }, ({ actor, body }) => ({ preferences: updatePreferences(actor.user, body) }));
