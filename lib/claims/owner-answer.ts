// An owner's answer to a claim that waits on them (awaiting_owner) takes it back to the studio's
// review, however it came: written on the claim page (lib/claims/reply.ts postClaimMessage) or sent
// as an e-mail reply (lib/mail/inbound.ts). Call it in the transaction that adds the message, after
// the message was added (a reply delivered twice is added once, so it moves the claim once).
// No server-only import: the inbound listener runs under tsx, outside Next.js.
import { and, eq, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { claims, type Claim } from "@/db/schema";
import { conflict } from "@/lib/errors";
import { canTransition } from "./states";

type Tx = Pick<Db, "update">;

/** The claim after the owner's answer: back in review if it waited on them, otherwise as it was. */
export function ownerAnswered(tx: Tx, claim: Claim): Claim {
  if (claim.state !== "awaiting_owner" || !canTransition(claim.state, "in_review")) return claim;
  // Conditional on (state, version), like every claim move: if someone changed the claim meanwhile, 409.
  const updated = tx
    .update(claims)
    .set({ state: "in_review", version: sql`${claims.version} + 1`, updatedAt: new Date() })
    .where(and(eq(claims.id, claim.id), eq(claims.state, claim.state), eq(claims.version, claim.version)))
    .returning()
    .get();
  if (!updated) throw conflict("Someone else changed this claim a moment ago. Reload it to see what changed.");
  return updated;
}
