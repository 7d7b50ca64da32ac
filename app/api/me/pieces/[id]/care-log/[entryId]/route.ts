import { z } from "zod";
import { route } from "@/lib/http/route";
import { deleteCareLogEntry, updateCareLogEntry } from "@/lib/owner/care-log";
import { careLogPatchSchema } from "@/lib/validation/owner";

const params = z.object({ id: z.string().min(1).max(64), entryId: z.string().min(1).max(64) });

export const PATCH = route({ roles: ["owner"], params, body: careLogPatchSchema }, ({ actor, params, body }) => updateCareLogEntry(actor.user, params.id, params.entryId, body));

export const DELETE = route({ roles: ["owner"], params }, ({ actor, params }) => deleteCareLogEntry(actor.user, params.id, params.entryId));
