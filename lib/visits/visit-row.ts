import { and, eq } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { pieces, repairJobs, studios, visits, type Piece, type RepairJob, type Studio, type Visit } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { conflict, forbidden, notFound } from "@/lib/errors";
import { ownerVisitWhere } from "./access";
import { visitRulesFor } from "./availability";

// Who acts on visits, loading the job or visit they may act on, and a visit's public shape. Every
// operation in lib/visits starts here: anyone else's job or visit is a 404.

/** Who is acting on visits: studio staff (admin/staff), a technician, or an owner of their own jobs. */
export type VisitActor = { kind: "staff"; ctx: StudioContext } | { kind: "technician"; ctx: StudioContext } | { kind: "owner"; user: User };

export const HOUR = 3_600_000;
export const DAY = 24 * HOUR;

export function iso(d: Date | number) {
  return new Date(d).toISOString();
}

/** A studio member as a visit actor: a technician, or staff (admin and staff). */
export function memberActor(ctx: StudioContext): VisitActor {
  return ctx.role === "technician" ? { kind: "technician", ctx } : { kind: "staff", ctx };
}

export const actorId = (a: VisitActor) => (a.kind === "owner" ? a.user.id : a.ctx.user.id);

export function jobForActor(actor: VisitActor, jobId: string): { job: RepairJob; piece: Piece; studio: Studio } {
  const row = getDb()
    .select({ job: repairJobs, piece: pieces, studio: studios })
    .from(repairJobs)
    .innerJoin(pieces, eq(pieces.id, repairJobs.pieceId))
    .innerJoin(studios, eq(studios.id, repairJobs.studioId))
    .where(and(eq(repairJobs.id, jobId), actor.kind === "owner" ? ownerVisitWhere(actor.user.id) : eq(repairJobs.studioId, actor.ctx.studio.id)))
    .get();
  if (!row || actor.kind === "technician") throw notFound("No such repair job.");
  if (actor.kind === "owner" && row.job.state === "draft" && row.job.quoteVersion === 0) throw notFound("No such repair job.");
  return row;
}

export function visitForActor(actor: VisitActor, visitId: string): { visit: Visit; job: RepairJob; studio: Studio } {
  const row = getDb()
    .select({ visit: visits, job: repairJobs, studio: studios })
    .from(visits)
    .innerJoin(repairJobs, eq(repairJobs.id, visits.jobId))
    .innerJoin(studios, eq(studios.id, visits.studioId))
    .where(and(eq(visits.id, visitId), actor.kind === "owner" ? ownerVisitWhere(actor.user.id) : undefined))
    .get();
  if (!row) throw notFound("No such visit.");
  const allowed =
    actor.kind === "owner"
      ? true
      : actor.kind === "staff"
        ? row.visit.studioId === actor.ctx.studio.id
        : row.visit.studioId === actor.ctx.studio.id && row.visit.technicianId === actor.ctx.user.id;
  if (!allowed) throw notFound("No such visit.");
  return row;
}

export function liveVisitOfJob(jobId: string): Visit | undefined {
  return getDb().select().from(visits).where(and(eq(visits.jobId, jobId), eq(visits.state, "booked"))).get();
}

/** Moving and cancelling: a booked visit that has not started; owners until the studio's cut-off; never a technician. */
export function ownerMayChange(actor: VisitActor, visit: Visit, studioId: string, now: number, verb: string) {
  if (visit.state !== "booked") throw conflict(visit.state === "done" ? `This visit is done and can't be ${verb}.` : "This visit was cancelled.");
  if (actor.kind === "technician") throw forbidden(`Ask the studio office to ${verb === "moved" ? "move" : "cancel"} a visit.`);
  if (visit.startAt.getTime() <= now) throw conflict(`This visit has started and can't be ${verb}.`);
  if (actor.kind === "owner") {
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
