import { route } from "@/lib/http/route";
import { cancelAskSchema, cancelPlanAtPeriodEnd } from "@/lib/plans/cancel";
import { idParam } from "@/lib/validation/pieces";

// Staff cancel a plan: POST { version, refundMinor } — the plan version and refund they were shown
// (GET /api/plans/subscriptions/[id]); 409 when either has changed. The refund follows the template's rule.
export const POST = route({ roles: ["admin", "staff"], params: idParam, body: cancelAskSchema, bodyLimit: 1024 }, async ({ actor, params, body }) => ({ subscription: await cancelPlanAtPeriodEnd(actor, params.id, body) }));
