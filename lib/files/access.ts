import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { claims, files, memberships, pieces, repairJobs, visits, type StoredFile } from "@/db/schema";
import type { StudioRole } from "@/lib/care/vocabulary";
import { notFound } from "@/lib/errors";
import { readStoredFile } from "@/lib/storage";

// Authorized delivery of stored images. Who may see a file depends on what it is for; everyone else
// gets the same 404 as for a file that does not exist.

const STUDIO_ROLES_BY_PURPOSE: Record<StoredFile["purpose"], readonly StudioRole[]> = {
  claim_photo: ["admin", "staff"],
  piece_photo: ["admin", "staff", "technician"],
  care_log_photo: ["admin", "staff"],
  visit_photo: ["admin", "staff", "technician"],
};

function isStudioMember(userId: string, studioId: string, roles: readonly StudioRole[]): boolean {
  return !!getDb()
    .select({ id: memberships.id })
    .from(memberships)
    .where(and(eq(memberships.userId, userId), eq(memberships.studioId, studioId), inArray(memberships.role, [...roles])))
    .get();
}

/** Whether `userId` may see `file`: the studio's staff, the claim's owner and the repair visit's technician (claim photos), or the piece's current owner. */
export function canViewFile(userId: string, file: Pick<StoredFile, "purpose" | "studioId" | "pieceId" | "claimId">): boolean {
  if (isStudioMember(userId, file.studioId, STUDIO_ROLES_BY_PURPOSE[file.purpose])) return true;
  const db = getDb();
  if (file.purpose === "claim_photo") {
    if (!file.claimId) return false;
    const claim = db.select({ ownerId: claims.ownerId }).from(claims).where(and(eq(claims.id, file.claimId), eq(claims.studioId, file.studioId))).get();
    if (claim?.ownerId === userId) return true;
    // A technician of the studio with a visit for the claim's repair job sees what the owner reported.
    return isStudioMember(userId, file.studioId, ["technician"]) && !!db
      .select({ id: visits.id })
      .from(visits)
      .innerJoin(repairJobs, eq(repairJobs.id, visits.jobId))
      .where(and(eq(repairJobs.claimId, file.claimId), eq(visits.studioId, file.studioId), eq(visits.technicianId, userId), inArray(visits.state, ["booked", "done"])))
      .get();
  }
  if (!file.pieceId) return false;
  const piece = db.select({ ownerId: pieces.ownerId }).from(pieces).where(and(eq(pieces.id, file.pieceId), eq(pieces.studioId, file.studioId))).get();
  return !!piece?.ownerId && piece.ownerId === userId;
}

/** The image (or its thumbnail) for a viewer allowed to see it; 404 otherwise. */
export async function getFileForViewer(userId: string, fileId: string, { thumb = false } = {}): Promise<{ data: Buffer; contentType: string; etag: string }> {
  const file = getDb().select().from(files).where(eq(files.id, fileId)).get();
  if (!file || !canViewFile(userId, file)) throw notFound("No such file.");
  const data = await readStoredFile(thumb ? file.thumbKey : file.storageKey).catch((e: unknown) => {
    // The row outlived its bytes (a restore without the data folder, or an erasure between the read of
    // the row and the file): the viewer gets a 404 that says so, the operator the error in the log.
    if ((e as NodeJS.ErrnoException).code !== "ENOENT") throw e;
    console.error(`stored file ${file.id} is missing from DATA_DIR`, e);
    throw notFound("This photo is no longer stored.");
  });
  return { data, contentType: file.contentType, etag: `"${file.id}${thumb ? "-t" : ""}"` };
}
