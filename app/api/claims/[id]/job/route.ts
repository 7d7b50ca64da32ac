import { createJobFromClaim } from "@/lib/claims/open-job";
import { route } from "@/lib/http/route";
import { idParam } from "@/lib/validation/claims";

/** Staff open the repair job of an accepted claim: 201 with the job; 409 for a claim not accepted or one that has its job. */
export const POST = route({ roles: ["admin", "staff"], params: idParam, status: 201 }, ({ actor, params }) => ({ job: createJobFromClaim(actor, params.id) }));
