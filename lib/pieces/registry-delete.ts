// Deleting a piece (DELETE /api/pieces/[id]): a registered piece is archived instead, one with claims
// on record is refused; its stored photos go once the transaction has committed.
import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { claims, files, pieces } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import { conflict } from "@/lib/errors";
import { removeStoredFiles } from "@/lib/storage";
import { loadPiece } from "./registry-common";

/** DELETE /api/pieces/[id]: removes a piece nobody has registered; a registered piece is archived instead. */
export async function deletePiece(ctx: StudioContext, pieceId: string): Promise<{ deleted: boolean; archived: boolean }> {
  const db = getDb();
  const outcome = db.transaction((tx) => {
    const piece = loadPiece(ctx, pieceId, tx);
    if (piece.ownerId !== null || piece.registeredAt !== null) {
      if (!piece.archivedAt) {
        tx.update(pieces).set({ archivedAt: new Date(), updatedAt: new Date() }).where(eq(pieces.id, pieceId)).run();
        recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "piece.archived", subjectType: "piece", subjectId: pieceId, data: { reason: "delete requested; the piece is registered" } });
      }
      return { deleted: false, archived: true, keys: [] as string[] };
    }
    const claimCount = tx.select({ id: claims.id }).from(claims).where(eq(claims.pieceId, pieceId)).all().length;
    if (claimCount > 0) throw conflict("This piece has claims on record; archive it instead.");
    const keys = tx.select({ a: files.storageKey, b: files.thumbKey }).from(files).where(eq(files.pieceId, pieceId)).all().flatMap((f) => [f.a, f.b]);
    // Its search index row goes with it (the pieces_fts_ad trigger, db/migrations/0031).
    tx.delete(pieces).where(and(eq(pieces.id, pieceId), eq(pieces.studioId, ctx.studio.id))).run();
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "piece.deleted", subjectType: "piece", subjectId: pieceId, data: { title: piece.title } });
    return { deleted: true, archived: false, keys };
  });
  if (outcome.keys.length) await removeStoredFiles(...outcome.keys);
  return { deleted: outcome.deleted, archived: outcome.archived };
}
