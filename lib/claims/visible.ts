import "server-only";
import { eq, type SQL } from "drizzle-orm";
import { bound } from "@/db/bound";
import { claims } from "@/db/schema";
import type { ActorRef } from "@/lib/auth/actor";

/**
 * The claims an actor sees, written once as a WHERE over claims: a studio member their studio's, an
 * owner their own (claims.owner_id). Routes let admins, staff and owners in (a technician acts as an owner).
 * An owner's id is bound as `+?` (db/bound.ts): their claims are a few rows of claims_owner_idx whoever
 * they are, so the statement is planned once instead of on every read. The studio keeps `?`: how much
 * of the table a studio holds may rightly change the plan (scan, or which index), as it does for the triage
 * queue's count.
 */
export function claimVisibleTo(actor: ActorRef): SQL {
  return actor.role === "owner" || !actor.studio ? eq(claims.ownerId, bound(actor.user.id)) : eq(claims.studioId, actor.studio.id);
}
