import { route } from "@/lib/http/route";
import { studioPlanDetail } from "@/lib/plans/cancel";
import { idParam } from "@/lib/validation/pieces";

// Staff read one plan of their studio: the plan, what cancelling it now gives (end date, refund, the
// version to confirm), its refund if any, and card payments held because their amount wasn't the plan's.
export const GET = route({ roles: ["admin", "staff"], params: idParam }, ({ actor, params }) => studioPlanDetail(actor, params.id));
