import { and, eq, isNull, type SQL } from "drizzle-orm";
import { pieces } from "@/db/schema";
import type { ActorRef } from "@/lib/auth/actor";

/**
 * The pieces an actor sees, written once as a WHERE over pieces: a studio member their studio's
 * (archived ones too: staff keep the record), an owner the pieces they hold now and that are not archived.
 */
export function pieceVisibleTo(actor: ActorRef): SQL {
  return actor.role === "owner" || !actor.studio ? and(eq(pieces.ownerId, actor.user.id), isNull(pieces.archivedAt))! : eq(pieces.studioId, actor.studio.id);
}

/** One piece of the actor's, by id. */
export function pieceWhere(actor: ActorRef, pieceId: string): SQL {
  return and(eq(pieces.id, pieceId), pieceVisibleTo(actor))!;
}
