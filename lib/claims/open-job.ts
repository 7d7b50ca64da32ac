import "server-only";
import type { StudioContext } from "@/lib/auth/guards";
import { createJob } from "@/lib/repairs/jobs";
import { loadStudioClaim } from "./claim-row";

/**
 * POST /api/claims/[id]/job: staff open the repair job of an accepted claim of their studio, through
 * lib/repairs (which refuses a claim that is not accepted or already has its job).
 */
export function createJobFromClaim(ctx: StudioContext, claimId: string) {
  const claim = loadStudioClaim(ctx.studio.id, claimId);
  const job = createJob(ctx, "claim", claim.id);
  return { id: job.id, state: job.state, claimId: job.claimId, title: job.title };
}
