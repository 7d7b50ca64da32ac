import "server-only";
import { eq } from "drizzle-orm";
import type { z } from "zod";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { StudioContext } from "@/lib/auth/guards";
import { conflict } from "@/lib/errors";
import type { claimDecisionSchema } from "@/lib/validation/claims";
import { claimCore, loadStudioClaim, studioOf } from "./claim-row";
import { coverageOf } from "./claim-piece";
import { suggestionRecord } from "./coverage";
import { mailClaimDecision } from "./mail";
import { moveState } from "./move-state";
import { canTransition, stateForDecision } from "./states";

export type ClaimDecisionValues = z.output<typeof claimDecisionSchema>;

/**
 * Staff decide an in-review claim: covered, partly covered (a share), chargeable, or declined with a
 * reason the owner sees. The coverage check's suggestion is recorded beside the decision, in the
 * claim and in the audit log. Concurrent decisions: the conditional UPDATE lets exactly one win.
 */
export async function decideClaim(ctx: StudioContext, claimId: string, input: ClaimDecisionValues) {
  const claim = loadStudioClaim(ctx.studio.id, claimId);
  const to = stateForDecision(input.decision);
  if (!canTransition(claim.state, to)) {
    throw conflict(claim.state === "submitted" || claim.state === "awaiting_owner" ? "Start (or resume) the review before deciding." : "This claim has already been decided.");
  }
  const studio = studioOf(claim.studioId);
  const { coverage, piece } = coverageOf(claim, studio);
  const suggestion = suggestionRecord(coverage);
  const coveredPct = input.decision === "covered" ? 100 : input.decision === "partly_covered" ? input.coveredPct! : 0;
  const now = new Date();
  const updated = getDb().transaction((tx) => {
    const row = moveState(tx, claim, to, input.expectedVersion, {
      decision: input.decision,
      coveredPct,
      decisionReason: input.reason || null,
      suggestion,
      decidedAt: now,
      decidedById: ctx.user.id,
      firstAnsweredAt: claim.firstAnsweredAt ?? now,
    });
    recordAudit(tx, {
      studioId: claim.studioId,
      actorId: ctx.user.id,
      action: "claim.decided",
      subjectType: "claim",
      subjectId: claim.id,
      data: { from: claim.state, to, decision: input.decision, coveredPct, reason: input.reason, suggestion },
    });
    return row;
  });
  const owner = getDb().select({ id: users.id, name: users.name, email: users.email }).from(users).where(eq(users.id, claim.ownerId)).get()!;
  await mailClaimDecision({ claim: updated, piece, studio, owner });
  return claimCore(updated);
}
