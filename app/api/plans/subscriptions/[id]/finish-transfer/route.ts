import { route } from "@/lib/http/route";
import { finishStudioPlanTransfer } from "@/lib/plans/transfer";
import { idParam } from "@/lib/validation/pieces";

// Staff try again now to finish a plan's change of hands that the payment service couldn't be told of
// (the scheduled pass also does, every few minutes). 503 with plain words while Stripe still fails.
export const POST = route({ roles: ["admin", "staff"], params: idParam }, async ({ actor, params }) => finishStudioPlanTransfer(actor, params.id));
