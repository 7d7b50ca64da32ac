import "server-only";
import { and, asc, count, desc, eq, isNotNull, isNull } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { finishLayers, pieces, studios, users } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { notFound } from "@/lib/errors";

/** A piece of the caller's studio, or 404 (also for another studio's piece). */
export function getStudioPiece(ctx: StudioContext, pieceId: string) {
  const piece = getDb()
    .query.pieces.findFirst({
    where: and(eq(pieces.id, pieceId), eq(pieces.studioId, ctx.studio.id)),
    with: {
      owner: { columns: { id: true, name: true, email: true } },
      layers: { orderBy: [asc(finishLayers.surface), asc(finishLayers.position)] },
    },
    columns: { registrationCodeHash: false, registrationCodeEnc: false },
    })
    .sync();
  if (!piece) throw notFound("No piece with that id in this studio.");
  return piece;
}

export function listStudioPieces(ctx: StudioContext, { limit = 50 } = {}) {
  return getDb()
    .select({
      id: pieces.id,
      title: pieces.title,
      kind: pieces.kind,
      primarySpeciesId: pieces.primarySpeciesId,
      deliveredOn: pieces.deliveredOn,
      ownerName: users.name,
    })
    .from(pieces)
    .leftJoin(users, eq(users.id, pieces.ownerId))
    .where(and(eq(pieces.studioId, ctx.studio.id), isNull(pieces.archivedAt)))
    .orderBy(desc(pieces.deliveredOn))
    .limit(limit)
    .all();
}

export function studioCounts(ctx: StudioContext) {
  const db = getDb();
  const scope = and(eq(pieces.studioId, ctx.studio.id), isNull(pieces.archivedAt));
  const delivered = db.select({ n: count() }).from(pieces).where(scope).get()?.n ?? 0;
  const registered = db.select({ n: count() }).from(pieces).where(and(scope, isNotNull(pieces.ownerId))).get()?.n ?? 0;
  const layers = db.select({ n: count() }).from(finishLayers).where(eq(finishLayers.studioId, ctx.studio.id)).get()?.n ?? 0;
  return { delivered, registered, layers };
}

/** The signed-in owner's pieces, from every studio. */
export function listOwnerPieces(user: User) {
  return getDb()
    .select({
      id: pieces.id,
      title: pieces.title,
      kind: pieces.kind,
      deliveredOn: pieces.deliveredOn,
      studioName: studios.name,
    })
    .from(pieces)
    .innerJoin(studios, eq(studios.id, pieces.studioId))
    .where(and(eq(pieces.ownerId, user.id), isNull(pieces.archivedAt)))
    .orderBy(desc(pieces.deliveredOn))
    .all();
}
