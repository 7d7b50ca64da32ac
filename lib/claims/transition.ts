import "server-only";
import type { z } from "zod";
import { getDb } from "@/db/client";
import { recordAudit } from "@/lib/audit";
import type { StudioContext } from "@/lib/auth/guards";
import { conflict } from "@/lib/errors";
import type { claimStateSchema } from "@/lib/validation/claims";
import { claimCore, loadStudioClaim } from "./claim-row";
import { moveState } from "./move-state";
import { canTransition } from "./states";

export type TransitionInput = z.output<typeof claimStateSchema> & { data?: Record<string, unknown> };

/**
 * A staff change of state that is not a decision (start review, back to review, and — for the repair
 * and visit work — repair booked and closed). Decisions go through decideClaim, which records the
 * coverage suggestion.
 */
export function transitionClaim(ctx: StudioContext, claimId: string, input: TransitionInput) {
  const claim = loadStudioClaim(ctx.studio.id, claimId);
  if (input.to === "accepted" || input.to === "declined") {
    if (!canTransition(claim.state, input.to)) throw conflict(`A claim that is ${claim.state.replace("_", " ")} cannot move to ${input.to}.`);
    throw conflict("Accepting or declining a claim is a decision: use the decision form, so the coverage suggestion is recorded with it.");
  }
  return getDb().transaction((tx) => {
    const updated = moveState(tx, claim, input.to, input.expectedVersion);
    recordAudit(tx, { studioId: claim.studioId, actorId: ctx.user.id, action: `claim.${input.to}`, subjectType: "claim", subjectId: claim.id, data: { from: claim.state, to: input.to, ...(input.data ?? {}) } });
    return claimCore(updated);
  });
}
