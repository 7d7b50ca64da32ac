import { getClaim } from "@/lib/claims/view-claim";
import { route } from "@/lib/http/route";
import { idParam } from "@/lib/validation/claims";

export const dynamic = "force-dynamic";

export const GET = route({ roles: ["admin", "staff", "owner"], params: idParam }, ({ actor, params }) => getClaim(actor, params.id));
