import { route } from "@/lib/http/route";
import { keepAskSchema, keepStudioPlan } from "@/lib/plans/cancel";
import { idParam } from "@/lib/validation/pieces";

// Staff take a cancellation back before the plan ends: POST { version }; 409 once anything was refunded.
export const POST = route({ roles: ["admin", "staff"], params: idParam, body: keepAskSchema, bodyLimit: 1024 }, async ({ actor, params, body }) => ({ subscription: await keepStudioPlan(actor, params.id, body) }));
