// The one way a claim's state is written: a conditional UPDATE on (state, version). No server-only
// import: the booking core (lib/visits/core.ts) moves claims inside its transaction in the scheduler
// and the concurrency test's processes too.
import { and, eq, sql } from "drizzle-orm";
import type { getDb } from "@/db/client";
import { claims, type Claim } from "@/db/schema";
import { conflict } from "@/lib/errors";
import { canTransition, type ClaimState } from "./states";

export type Tx = Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0];

/**
 * Moves a claim from `claim.state` to `to` with a conditional UPDATE on (state, version): if another
 * writer changed the claim first, no row matches and the change is refused with a 409.
 */
export function moveState(tx: Tx, claim: Claim, to: ClaimState, expectedVersion: number | undefined, extra: Partial<typeof claims.$inferInsert> = {}): Claim {
  if (!canTransition(claim.state, to)) throw conflict(`A claim that is ${claim.state.replace("_", " ")} cannot move to ${to.replace("_", " ")}.`);
  return writeState(tx, claim, to, expectedVersion, extra);
}

/** The conditional UPDATE of moveState, for a move the caller has already checked. */
export function writeState(tx: Tx, claim: Claim, to: ClaimState, expectedVersion: number | undefined, extra: Partial<typeof claims.$inferInsert> = {}): Claim {
  const version = expectedVersion ?? claim.version;
  const updated = tx
    .update(claims)
    .set({ ...extra, state: to, version: sql`${claims.version} + 1`, updatedAt: new Date() })
    .where(and(eq(claims.id, claim.id), eq(claims.studioId, claim.studioId), eq(claims.state, claim.state), eq(claims.version, version)))
    .returning()
    .get();
  if (!updated) throw conflict("Someone else changed this claim a moment ago. Reload it to see what changed.");
  return updated;
}
