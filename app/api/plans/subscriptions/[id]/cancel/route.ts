import { z } from "zod";
import { route } from "@/lib/http/route";
import { cancelPlanAtPeriodEnd } from "@/lib/plans/cancel";

const params = z.object({ id: z.string().min(1).max(64) });

// Staff cancel a plan: it runs to the end of the period already paid.
export const POST = route({ roles: ["admin", "staff"], params }, async ({ actor, params }) => ({ subscription: await cancelPlanAtPeriodEnd(actor, params.id) }));
