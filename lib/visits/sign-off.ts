// The owner's sign-off of a finished visit: the visit-done mail carries a single-use link (only its
// SHA-256 is stored on the visit). Opening the link changes nothing — mail scanners open links too;
// the page it opens confirms with a POST, the way the e-mail verification page does.
import "server-only";
import { and, eq, gt, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { pieces, repairJobs, studios, visits } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { sha256Hex } from "@/lib/crypto";
import { env } from "@/lib/env";
import { formatVisitWhen } from "@/lib/format";

export const SIGN_OFF_TTL_MS = 30 * 86_400_000;

export const signOffUrl = (token: string) => new URL(`/visit-sign-off?${new URLSearchParams({ token })}`, env.APP_URL).href;

const usable = (token: string, now: Date) => and(eq(visits.signOffTokenHash, sha256Hex(token)), isNull(visits.signedOffAt), eq(visits.state, "done"), gt(visits.signOffExpiresAt, now));

/** What the sign-off page shows for a usable link (the work, the piece, when), or null for an unknown, used or expired one. */
export function signOffPreview(token: string, now = new Date()) {
  if (token.length < 10 || token.length > 200) return null;
  const row = getDb()
    .select({ startAt: visits.startAt, endAt: visits.endAt, work: visits.reportWork, jobTitle: repairJobs.title, pieceTitle: pieces.title, studioName: studios.name, timeZone: studios.timeZone })
    .from(visits)
    .innerJoin(repairJobs, eq(repairJobs.id, visits.jobId))
    .innerJoin(pieces, eq(pieces.id, visits.pieceId))
    .innerJoin(studios, eq(studios.id, visits.studioId))
    .where(usable(token, now))
    .get();
  if (!row) return null;
  return { jobTitle: row.jobTitle, pieceTitle: row.pieceTitle, studioName: row.studioName, work: row.work ?? "", when: formatVisitWhen(row.startAt.getTime(), row.endAt.getTime(), row.timeZone) };
}

/** Takes the link (once): the visit is signed off by the job's owner. Null when the link is unknown, used or expired. */
export function confirmSignOff(token: string, now = new Date()): { visitId: string } | null {
  if (token.length < 10 || token.length > 200) return null;
  const db = getDb();
  return db.transaction((tx) => {
    const visit = tx.select({ id: visits.id, studioId: visits.studioId, jobId: visits.jobId }).from(visits).where(usable(token, now)).get();
    if (!visit) return null;
    const job = tx.select({ ownerId: repairJobs.ownerId }).from(repairJobs).where(eq(repairJobs.id, visit.jobId)).get();
    const taken = tx
      .update(visits)
      .set({ signedOffAt: now, signedOffById: job?.ownerId ?? null, signOffTokenHash: null, updatedAt: now })
      .where(and(eq(visits.id, visit.id), usable(token, now)))
      .run();
    if (taken.changes !== 1) return null;
    recordAudit(tx, { studioId: visit.studioId, actorId: job?.ownerId ?? null, action: "visit.signed_off", subjectType: "visit", subjectId: visit.id, data: { by: "owner_link" } });
    return { visitId: visit.id };
  });
}
