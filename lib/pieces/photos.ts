import "server-only";
import { getDb } from "@/db/client";
import { files } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import { AppError, badRequest } from "@/lib/errors";
import { MAX_UPLOAD_BYTES, removeStoredFiles, storeImage } from "@/lib/storage";
import { loadPiece } from "./registry";

/** POST /api/pieces/[id]/photos: one photo of the finished piece, checked and re-encoded by lib/storage. */
export async function addPiecePhoto(ctx: StudioContext, pieceId: string, upload: unknown) {
  loadPiece(ctx, pieceId);
  if (!(upload instanceof Blob)) throw badRequest("Attach the photo in the form field \"file\".", { file: ["Choose a photo."] });
  if (upload.size > MAX_UPLOAD_BYTES) throw new AppError(413, "file_too_large", `That photo is ${(upload.size / 1024 / 1024).toFixed(1)} MB; the limit is 15 MB. Send a smaller one.`);
  const stored = await storeImage(new Uint8Array(await upload.arrayBuffer()));
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
