import { route } from "@/lib/http/route";
import { startPlanCheckout } from "@/lib/plans/subscriptions";
import { buyPlanSchema } from "@/lib/plans/validation";

// The owner buys a plan for one of their pieces: a Checkout Session in subscription mode.
export const POST = route({ roles: ["owner"], body: buyPlanSchema, bodyLimit: 4096 }, async ({ actor, body }) => startPlanCheckout(actor.user, body.pieceId, body.templateId));
