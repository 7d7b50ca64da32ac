// The claim a repair job was made from moves along with the work. No server-only import: the booking
// core (lib/visits/core.ts) calls this inside its transaction in the scheduler and in the concurrency
// test's processes too.
import { eq } from "drizzle-orm";
import { claims, repairJobs } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { moveState, writeState, type Tx } from "./move-state";
import { canTransition, type ClaimState } from "./states";

/**
 * Moves the claim a repair job was made from along with the work, inside the caller's transaction:
 * accepted → repair booked when the job's visit is booked; closed when the job is done (through
 * repair booked if it never got there). A cancelled visit undoes the booking: repair booked → accepted,
 * a step outside the state table, which staff can't take by hand (it would skip the decision form).
 * A job without a claim, or a claim already past the step, is left as it is.
 */
export function followJob(tx: Tx, jobId: string, event: "visit_booked" | "visit_cancelled" | "job_done", actorId: string | null): ClaimState | null {
  const row = tx.select({ claim: claims }).from(repairJobs).innerJoin(claims, eq(claims.id, repairJobs.claimId)).where(eq(repairJobs.id, jobId)).get();
  if (!row) return null;
  let claim = row.claim;
  const step = (to: ClaimState, move: typeof moveState) => {
    const from = claim.state;
    claim = move(tx, claim, to, undefined);
    recordAudit(tx, { studioId: claim.studioId, actorId, action: `claim.${to}`, subjectType: "claim", subjectId: claim.id, data: { from, to, jobId, by: event } });
  };
  if (event === "visit_cancelled") {
    if (claim.state === "repair_booked") step("accepted", writeState);
    return claim.state;
  }
  for (const to of event === "visit_booked" ? (["repair_booked"] as const) : (["repair_booked", "closed"] as const)) {
    if (canTransition(claim.state, to)) step(to, moveState);
  }
  return claim.state;
}
