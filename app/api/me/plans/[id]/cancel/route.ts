import { route } from "@/lib/http/route";
import { cancelAskSchema, cancelMyPlan } from "@/lib/plans/cancel";
import { idParam } from "@/lib/validation/pieces";

// The owner cancels their plan: POST { version, refundMinor } as shown on their piece page; 409 when
// either has changed meanwhile. Someone else's plan is a 404.
export const POST = route({ roles: ["owner"], params: idParam, body: cancelAskSchema, bodyLimit: 1024 }, async ({ actor, params, body }) => ({ subscription: await cancelMyPlan(actor.user, params.id, body) }));
