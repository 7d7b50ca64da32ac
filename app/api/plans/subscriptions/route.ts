import { route } from "@/lib/http/route";
import { startPlanByOtherMeans } from "@/lib/plans/subscriptions";
import { startPlanSchema } from "@/lib/plans/validation";

// Staff start a plan for a client who paid by other means (recorded as such).
export const POST = route({ roles: ["admin", "staff"], body: startPlanSchema, bodyLimit: 4096, status: 201 }, ({ actor, body }) => ({ subscription: startPlanByOtherMeans(actor, body) }));
