import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { clients, repairJobs, users, visits } from "@/db/schema";
import type { Actor } from "@/lib/auth/actor";
import { pricedPiece } from "@/lib/repairs/pricing";
import { jobDurationMin, visitRulesFor } from "./availability";
import { formatVisitWhen, ownerTimeZone } from "@/lib/format";
import { visitPhotosOf } from "./photos";
import { iso, jobForActor, liveVisitOfJob, visitJson } from "./visit-row";
import { visitVisibleTo } from "./visible";

// A job's visit as its pages show it: the job page's visit card, and the booking page's context.

/**
 * The live (or last) visit of a job for its page: owners and staff. A former owner who still sees a
 * job they paid for (lib/repairs/owner-reach) gets no visit: it may be at the new owner's address.
 */
export function visitOfJob(actor: Actor, jobId: string) {
  if (actor.role === "owner" && !getDb().select({ id: repairJobs.id }).from(repairJobs).where(and(eq(repairJobs.id, jobId), visitVisibleTo(actor))).get()) {
    return { visit: null, job: null, studio: null };
  }
  const { job, studio } = jobForActor(actor, jobId);
  const db = getDb();
  const v = db.select({ visit: visits }).from(visits).innerJoin(repairJobs, eq(repairJobs.id, visits.jobId)).where(and(eq(visits.jobId, job.id), visitVisibleTo(actor))).orderBy(sql`${visits.createdAt} desc`).get()?.visit;
  if (!v) return { visit: null, job, studio };
  const tech = db.select({ name: users.name }).from(users).where(eq(users.id, v.technicianId)).get();
  const rules = visitRulesFor(db, studio.id);
  return {
    job,
    studio,
    visit: {
      ...visitJson(v),
      technicianName: tech?.name ?? "",
      when: formatVisitWhen(v.startAt.getTime(), v.endAt.getTime(), shownZone(actor, studio)),
      ownerCutoffHours: rules.ownerChangeCutoffHours,
      signedOffAt: v.signedOffAt ? iso(v.signedOffAt) : null,
      photos: visitPhotosOf(actor, { jobId: job.id }),
    },
  };
}

/**
 * The zone a visit's time is shown in: the owner's own (their account's, else the studio's client record
 * of them, else the studio's, as their visit mails and claim page say it: lib/format ownerTimeZone);
 * the studio's for its members.
 */
function shownZone(actor: Actor, studio: { id: string; timeZone: string }): string {
  if (actor.role !== "owner") return studio.timeZone;
  const client = getDb()
    .select({ timeZone: clients.timeZone })
    .from(clients)
    .where(and(eq(clients.userId, actor.user.id), eq(clients.studioId, studio.id)))
    .get();
  return ownerTimeZone(actor.user.timeZone, client?.timeZone, studio.timeZone);
}

/** The booking page's data: the job, its duration, where the visit can be, the live visit if any. */
export function bookingContext(actor: Actor, jobId: string) {
  const { job, piece, studio } = jobForActor(actor, jobId);
  const live = liveVisitOfJob(job.id);
  const rules = visitRulesFor(getDb(), studio.id);
  return {
    job: { id: job.id, title: job.title, state: job.state },
    piece: { id: piece.id, title: piece.title, address: piece.deliveryAddress },
    studio: { name: studio.name, address: studio.address, timeZone: studio.timeZone },
    durationMin: jobDurationMin(job, pricedPiece(getDb(), piece)),
    rules: { leadTimeHours: actor.role === "owner" ? rules.leadTimeHours : 0, ownerChangeCutoffHours: rules.ownerChangeCutoffHours },
    visit: live ? { ...visitJson(live), when: formatVisitWhen(live.startAt.getTime(), live.endAt.getTime(), shownZone(actor, studio)) } : null,
    bookable: Boolean(live) || job.state === "paid" || job.state === "covered",
  };
}

