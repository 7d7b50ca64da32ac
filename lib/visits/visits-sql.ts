// The batched reads of lib/visits, kept in one place: each loads one table for a whole team or a whole
// day in one statement (an IN list over the studio's index) and groups the rows in memory, so the slot
// search, the technician list and the technician's day cost a fixed number of statements however many
// technicians or visits there are. No server-only import: the booking core runs in the scheduler and
// in the concurrency test's processes too.
import { and, asc, eq, gt, inArray, lt, ne } from "drizzle-orm";
import { files, finishLayers, technicianHours, technicianTimeOff, visitPhotos, visits, type FinishLayer, type TechnicianTimeOffRow } from "@/db/schema";
import type { DbOrTx } from "@/lib/pieces/search-index";

export type WeeklyRange = { weekday: number; start: string; end: string };

/** Rows grouped by a key (rows without one are dropped). */
export function groupBy<T, K extends string>(rows: T[], key: (r: T) => K | null): Map<K, T[]> {
  const out = new Map<K, T[]>();
  for (const r of rows) {
    const k = key(r);
    if (k === null) continue;
    const list = out.get(k);
    if (list) list.push(r);
    else out.set(k, [r]);
  }
  return out;
}

/** Distinct ids for an IN list; "-" keeps the list non-empty (no id is "-"). */
const ids = (xs: (string | null | undefined)[]) => [...new Set(xs.filter((x): x is string => !!x)), "-"];

/** Weekly hours of these technicians of the studio, by technician, ordered by weekday and start. */
export function hoursByTechnician(db: DbOrTx, studioId: string, technicianIds: string[]): Map<string, WeeklyRange[]> {
  const rows = db
    .select({ userId: technicianHours.userId, weekday: technicianHours.weekday, start: technicianHours.start, end: technicianHours.end })
    .from(technicianHours)
    .where(and(eq(technicianHours.studioId, studioId), inArray(technicianHours.userId, ids(technicianIds))))
    .orderBy(asc(technicianHours.weekday), asc(technicianHours.start))
    .all();
  const grouped = groupBy(rows, (r) => r.userId);
  return new Map([...grouped].map(([k, rs]) => [k, rs.map(({ weekday, start, end }) => ({ weekday, start, end }))]));
}

/** Time off of these technicians of the studio, by technician, by date. */
export function timeOffByTechnician(db: DbOrTx, studioId: string, technicianIds: string[]): Map<string, TechnicianTimeOffRow[]> {
  const rows = db
    .select()
    .from(technicianTimeOff)
    .where(and(eq(technicianTimeOff.studioId, studioId), inArray(technicianTimeOff.userId, ids(technicianIds))))
    .orderBy(asc(technicianTimeOff.date))
    .all();
  return groupBy(rows, (r) => r.userId);
}

/** Booked visits of these technicians touching [fromMs, toMs), by technician. */
export function bookedByTechnician(db: DbOrTx, studioId: string, technicianIds: string[], fromMs: number, toMs: number, excludeVisitId?: string): Map<string, { start: number; end: number }[]> {
  const rows = db
    .select({ technicianId: visits.technicianId, start: visits.startAt, end: visits.endAt })
    .from(visits)
    .where(
      and(
        eq(visits.studioId, studioId),
        inArray(visits.technicianId, ids(technicianIds)),
        eq(visits.state, "booked"),
        lt(visits.startAt, new Date(toMs)),
        gt(visits.endAt, new Date(fromMs)),
        excludeVisitId ? ne(visits.id, excludeVisitId) : undefined,
      ),
    )
    .all();
  const grouped = groupBy(rows, (r) => r.technicianId);
  return new Map([...grouped].map(([k, rs]) => [k, rs.map((r) => ({ start: r.start.getTime(), end: r.end.getTime() }))]));
}

/** The finish stacks of a day's pieces, by piece (surface, then position). */
export function layersByPiece(db: DbOrTx, pieceIds: string[]): Map<string, FinishLayer[]> {
  return groupBy(db.select().from(finishLayers).where(inArray(finishLayers.pieceId, ids(pieceIds))).orderBy(asc(finishLayers.surface), asc(finishLayers.position)).all(), (l) => l.pieceId);
}

/** The before and after photos of a day's visits, by visit, oldest first. */
export function photosByVisit(db: DbOrTx, visitIds: string[]) {
  return groupBy(
    db.select({ id: visitPhotos.fileId, kind: visitPhotos.kind, visitId: visitPhotos.visitId }).from(visitPhotos).where(inArray(visitPhotos.visitId, ids(visitIds))).orderBy(asc(visitPhotos.createdAt)).all(),
    (p) => p.visitId,
  );
}

/** The owners' photos of the claims a day's visits repair, by claim, oldest first (the studio's files only). */
export function claimPhotosByClaim(db: DbOrTx, studioId: string, claimIds: (string | null | undefined)[]) {
  return groupBy(
    db.select({ id: files.id, claimId: files.claimId }).from(files).where(and(inArray(files.claimId, ids(claimIds)), eq(files.purpose, "claim_photo"), eq(files.studioId, studioId))).orderBy(asc(files.createdAt)).all(),
    (f) => f.claimId,
  );
}
