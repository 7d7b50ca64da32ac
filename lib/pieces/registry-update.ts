// Editing a piece (PATCH /api/pieces/[id]): the change merged into the record, the whole record
// checked again, only changed columns audited, archiving and unarchiving recorded, the index rewritten.
import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { pieces } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import { pieceSchema, type PiecePatch } from "@/lib/validation/pieces";
import { loadPiece, publicPiece, type PublicPiece } from "./registry-common";
import { pieceColumns } from "./registry-create";
import { indexPiece } from "./search-index";
import { inWords } from "@/lib/validation/words";

/** PATCH /api/pieces/[id]: merges the change into the record and checks the whole record again. */
export function updatePiece(ctx: StudioContext, pieceId: string, patch: PiecePatch): PublicPiece {
  const db = getDb();
  return db.transaction((tx) => {
    const current = loadPiece(ctx, pieceId, tx);
    const { archived, ...fields } = patch;
    const merged = pieceSchema.parse({ ...current, ...Object.fromEntries(Object.entries(fields).filter(([, v]) => v !== undefined)) }, { error: inWords });
    const columns = pieceColumns(merged);
    const changed = Object.fromEntries(Object.entries(columns).filter(([k, v]) => (current as Record<string, unknown>)[k] !== v));
    const archivedAt = archived === undefined ? current.archivedAt : archived ? (current.archivedAt ?? new Date()) : null;
    if (Object.keys(changed).length === 0 && archivedAt === current.archivedAt) return publicPiece(current);
    const updated = tx
      .update(pieces)
      .set({ ...columns, archivedAt, updatedAt: new Date() })
      .where(and(eq(pieces.id, pieceId), eq(pieces.studioId, ctx.studio.id)))
      .returning()
      .get();
    const before = Object.fromEntries(Object.keys(changed).map((k) => [k, (current as Record<string, unknown>)[k]]));
    if (Object.keys(changed).length) recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "piece.updated", subjectType: "piece", subjectId: pieceId, data: { before, after: changed } });
    if (archivedAt !== current.archivedAt) recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: archivedAt ? "piece.archived" : "piece.unarchived", subjectType: "piece", subjectId: pieceId });
    indexPiece(tx, pieceId);
    return publicPiece(updated);
  });
}
