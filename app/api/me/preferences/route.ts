import { route } from "@/lib/http/route";
import { getPreferences, updatePreferences } from "@/lib/owner/preferences";
import { preferencesPatchSchema } from "@/lib/validation/owner";

export const GET = route({ roles: ["owner"] }, ({ actor }) => ({ preferences: getPreferences(actor.user) }));

export const PATCH = route({ roles: ["owner"], body: preferencesPatchSchema }, ({ actor, body }) => ({ preferences: updatePreferences(actor.user, body) }));
