import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { files, pieces, repairJobs, studios, visitPhotos, visits } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { Actor } from "@/lib/auth/actor";
import type { StudioContext } from "@/lib/auth/guards";
import { localDate } from "@/lib/care/dates";
import { fileUrl } from "@/lib/claims/claim-row";
import { conflict } from "@/lib/errors";
import { formatDate } from "@/lib/format";
import { removeStoredFiles, storeImage } from "@/lib/storage";
import { visitPhotoKindSchema } from "@/lib/validation/visits";
import { visitForActor } from "./visit-row";
import { visitVisibleTo } from "./visible";
import { inWords } from "@/lib/validation/words";

// Before and after photos of visits: taken by the technician (or staff), shown on the job's and the piece's pages.

/**
 * POST /api/visits/[id]/photos (multipart: file, kind): a before or after photo, through lib/storage.
 * `read` (the bounded upload reader) is called only once the visit is known to be the actor's.
 */
export async function addVisitPhoto(ctx: StudioContext, visitId: string, read: () => Promise<{ data: Uint8Array; fields: Record<string, string> }>) {
  const { visit } = visitForActor(ctx, visitId);
  if (visit.state === "cancelled") throw conflict("This visit was cancelled.");
  const upload = await read();
  const kind = visitPhotoKindSchema.parse(upload.fields.kind, { error: inWords });
  const stored = await storeImage(upload.data, ctx.user.id);
  try {
    const file = getDb().transaction((tx) => {
      const f = tx.insert(files).values({ studioId: visit.studioId, purpose: "visit_photo", pieceId: visit.pieceId, ...stored, uploadedById: ctx.user.id }).returning().get();
      tx.insert(visitPhotos).values({ studioId: visit.studioId, visitId: visit.id, fileId: f.id, kind }).run();
      recordAudit(tx, { studioId: visit.studioId, actorId: ctx.user.id, action: "visit.photo_added", subjectType: "visit", subjectId: visit.id, data: { fileId: f.id, kind } });
      return f;
    });
    return { id: file.id, kind, url: fileUrl(file.id), thumbUrl: fileUrl(file.id, true) };
  } catch (e) {
    await removeStoredFiles(stored.storageKey, stored.thumbKey);
    throw e;
  }
}

export type VisitPhotoView = { id: string; url: string; thumbUrl: string; kind: "before" | "after"; visitId: string; label: string };

/**
 * The photos taken at the visits of one job or one piece, oldest first. Staff and technicians see their
 * studio's; an owner sees those of a piece they hold now (a former owner none: the photos may show
 * the new owner's home), the same rule as the file route (lib/files/access).
 */
export function visitPhotosOf(actor: Actor, of: { jobId: string } | { pieceId: string }): VisitPhotoView[] {
  const rows = getDb()
    .select({ id: visitPhotos.fileId, kind: visitPhotos.kind, visitId: visits.id, startAt: visits.startAt, timeZone: studios.timeZone })
    .from(visitPhotos)
    .innerJoin(visits, eq(visits.id, visitPhotos.visitId))
    .innerJoin(repairJobs, eq(repairJobs.id, visits.jobId))
    .innerJoin(pieces, eq(pieces.id, visits.pieceId))
    .innerJoin(studios, eq(studios.id, visits.studioId))
    .where(
      and(
        "jobId" in of ? eq(visits.jobId, of.jobId) : eq(visits.pieceId, of.pieceId),
        eq(visitPhotos.studioId, visits.studioId),
        // Photos follow the piece (the file route's rule): an owner sees those of a piece they hold now,
        // whoever's job the visit was; studio members through the visit rule (lib/visits/visible.ts).
        actor.role === "owner" ? eq(pieces.ownerId, actor.user.id) : visitVisibleTo(actor),
      ),
    )
    .orderBy(asc(visits.startAt), asc(visitPhotos.createdAt))
    .all();
  return rows.map((r) => ({
    id: r.id,
    url: fileUrl(r.id),
    thumbUrl: fileUrl(r.id, true),
    kind: r.kind,
    visitId: r.visitId,
    label: `${r.kind === "before" ? "Before" : "After"}, ${formatDate(localDate(r.startAt.getTime(), r.timeZone), { short: true })}`,
  }));
}

