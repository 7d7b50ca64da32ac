import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { pieces, repairJobs, studios, visits, type Piece, type RepairJob, type Studio, type Visit } from "@/db/schema";
import { isStudioActor, type Actor } from "@/lib/auth/actor";
import { assertRole } from "@/lib/auth/guards";
import { conflict, notFound } from "@/lib/errors";
import { visitRulesFor } from "./availability";
import { visitVisibleTo } from "./visible";

// Loading the job or visit an actor (lib/auth/actor.ts) may act on, and a visit's public shape. Every
// operation in lib/visits starts here: staff (admin/staff) act on the studio's visits, a technician
// on their own, an owner on those of their own jobs; anyone else's job or visit is a 404.

export const HOUR = 3_600_000;
export const DAY = 24 * HOUR;

export function iso(d: Date | number) {
  return new Date(d).toISOString();
}

export function jobForActor(actor: Actor, jobId: string): { job: RepairJob; piece: Piece; studio: Studio } {
  const row = getDb()
    .select({ job: repairJobs, piece: pieces, studio: studios })
    .from(repairJobs)
    .innerJoin(pieces, eq(pieces.id, repairJobs.pieceId))
    .innerJoin(studios, eq(studios.id, repairJobs.studioId))
    .where(and(eq(repairJobs.id, jobId), visitVisibleTo(actor)))
    .get();
  if (!row || actor.role === "technician") throw notFound("No such repair job.");
  if (actor.role === "owner" && row.job.state === "draft" && row.job.quoteVersion === 0) throw notFound("No such repair job.");
  return row;
}

/** One visit the actor reaches (lib/visits/visible.ts); a technician only their own. */
export function visitForActor(actor: Actor, visitId: string): { visit: Visit; job: RepairJob; studio: Studio } {
  const row = getDb()
    .select({ visit: visits, job: repairJobs, studio: studios })
    .from(visits)
    .innerJoin(repairJobs, eq(repairJobs.id, visits.jobId))
    .innerJoin(studios, eq(studios.id, visits.studioId))
    .where(and(eq(visits.id, visitId), visitVisibleTo(actor), actor.role === "technician" ? eq(visits.technicianId, actor.user.id) : undefined))
    .get();
  if (!row) throw notFound("No such visit.");
  return row;
}

export function liveVisitOfJob(jobId: string): Visit | undefined {
  return getDb().select().from(visits).where(and(eq(visits.jobId, jobId), eq(visits.state, "booked"))).get();
}

/** Moving and cancelling: a booked visit that has not started; owners until the studio's cut-off; never a technician. */
export function ownerMayChange(actor: Actor, visit: Visit, studioId: string, now: number, verb: string) {
  if (visit.state !== "booked") throw conflict(visit.state === "done" ? `This visit is done and can't be ${verb}.` : "This visit was cancelled.");
  if (isStudioActor(actor)) assertRole(actor, ["admin", "staff"], `Ask the studio office to ${verb === "moved" ? "move" : "cancel"} a visit.`);
  if (visit.startAt.getTime() <= now) throw conflict(`This visit has started and can't be ${verb}.`);
  if (actor.role === "owner") {
    const cutoff = visitRulesFor(getDb(), studioId).ownerChangeCutoffHours;
    if (visit.startAt.getTime() - now < cutoff * HOUR) {
      throw conflict(`Visits can be ${verb} online until ${cutoff} hours before they start. Please call or write to the studio.`);
    }
  }
}

export function visitJson<E extends Record<string, unknown> = Record<never, never>>(v: Visit, extra: E = {} as E) {
  return {
    id: v.id,
    jobId: v.jobId,
    pieceId: v.pieceId,
    technicianId: v.technicianId,
    start: iso(v.startAt),
    end: iso(v.endAt),
    locationKind: v.locationKind,
    location: v.location,
    state: v.state,
    sequence: v.sequence,
    icsUid: v.icsUid,
    version: v.version,
    reportedAt: v.reportedAt ? iso(v.reportedAt) : null,
    ...extra,
  };
}
