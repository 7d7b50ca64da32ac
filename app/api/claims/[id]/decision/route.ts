import { decideClaim } from "@/lib/claims/decide-claim";
import { route } from "@/lib/http/route";
import { claimDecisionSchema, idParam } from "@/lib/validation/claims";

/** `{ decision, coveredPct?, reason, expectedVersion? }`. Illegal from the claim's state → 409. */
export const POST = route({ roles: ["admin", "staff"], params: idParam, body: claimDecisionSchema }, async ({ actor, params, body }) => ({ claim: await decideClaim(actor, params.id, body) }));
