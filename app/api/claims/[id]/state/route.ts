import { transitionClaim } from "@/lib/claims/transition";
import { route } from "@/lib/http/route";
import { claimStateSchema, idParam } from "@/lib/validation/claims";

/** `{ to, expectedVersion? }`: start review, resume review, repair booked, closed. Illegal → 409. */
export const POST = route({ roles: ["admin", "staff"], params: idParam, body: claimStateSchema }, ({ actor, params, body }) => ({ claim: transitionClaim(actor, params.id, body) }));
