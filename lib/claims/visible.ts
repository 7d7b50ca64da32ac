import "server-only";
import { eq, type SQL } from "drizzle-orm";
import { claims } from "@/db/schema";
import type { ActorRef } from "@/lib/auth/actor";

/**
 * The claims an actor sees, written once as a WHERE over claims: a studio member their studio's, an
 * owner their own (claims.owner_id). Routes let admins, staff and owners in (a technician acts as an owner).
 */
export function claimVisibleTo(actor: ActorRef): SQL {
  return actor.role === "owner" || !actor.studio ? eq(claims.ownerId, actor.user.id) : eq(claims.studioId, actor.studio.id);
}
