import "server-only";
import { getDb } from "@/db/client";
import { files } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import { removeStoredFiles, storeImage } from "@/lib/storage";
import { loadPiece } from "./registry";

/**
 * POST /api/pieces/[id]/photos: one photo of the finished piece, checked and re-encoded by
 * lib/storage. `read` (the bounded upload reader) is called only once the piece is known to be the
 * studio's, so a stranger's upload is never read.
 */
export async function addPiecePhoto(ctx: StudioContext, pieceId: string, read: () => Promise<Uint8Array>) {
  loadPiece(ctx, pieceId);
  const stored = await storeImage(await read(), ctx.user.id);
  try {
    const row = getDb().transaction((tx) => {
      loadPiece(ctx, pieceId, tx);
      const file = tx
        .insert(files)
        .values({ studioId: ctx.studio.id, purpose: "piece_photo", pieceId, ...stored, uploadedById: ctx.user.id })
        .returning()
        .get();
      recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "photo.added", subjectType: "piece", subjectId: pieceId, data: { fileId: file.id } });
      return file;
    });
    return { id: row.id, width: row.width, height: row.height, url: `/api/files/${row.id}`, thumbUrl: `/api/files/${row.id}?thumb=1` };
  } catch (e) {
    await removeStoredFiles(stored.storageKey, stored.thumbKey);
    throw e;
  }
}
