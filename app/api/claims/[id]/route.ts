import { getClaim } from "@/lib/claims/view-claim";
import { claimViewerOf } from "@/lib/claims/visible";
import { route } from "@/lib/http/route";
import { idParam } from "@/lib/validation/claims";

export const dynamic = "force-dynamic";

export const GET = route({ roles: ["admin", "staff", "owner"], params: idParam }, ({ actor, params }) => getClaim(claimViewerOf(actor), params.id));
