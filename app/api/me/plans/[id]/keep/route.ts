import { route } from "@/lib/http/route";
import { keepAskSchema, keepMyPlan } from "@/lib/plans/cancel";
import { idParam } from "@/lib/validation/pieces";

// The owner takes their cancellation back before the plan ends: POST { version }. Someone else's plan is a 404.
export const POST = route({ roles: ["owner"], params: idParam, body: keepAskSchema, bodyLimit: 1024 }, async ({ actor, params, body }) => ({ subscription: await keepMyPlan(actor.user, params.id, body) }));
