import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { repairJobs, users, visits } from "@/db/schema";
import { ownerVisitWhere } from "./access";
import { jobDurationMin, visitRulesFor } from "./availability";
import { formatVisitWhen } from "@/lib/format";
import { visitPhotosOf } from "./photos";
import { iso, jobForActor, liveVisitOfJob, visitJson, type VisitActor } from "./visit-row";

// A job's visit as its pages show it: the job page's visit card, and the booking page's context.

/**
 * The live (or last) visit of a job for its page: owners and staff. A former owner who still sees a
 * job they paid for (lib/repairs/owner-reach) gets no visit: it may be at the new owner's address.
 */
export function visitOfJob(actor: VisitActor, jobId: string) {
  if (actor.kind === "owner" && !getDb().select({ id: repairJobs.id }).from(repairJobs).where(and(eq(repairJobs.id, jobId), ownerVisitWhere(actor.user.id))).get()) {
    return { visit: null, job: null, studio: null };
  }
  const { job, studio } = jobForActor(actor, jobId);
  const db = getDb();
  const v = db.select().from(visits).where(eq(visits.jobId, job.id)).orderBy(sql`${visits.createdAt} desc`).get();
  if (!v) return { visit: null, job, studio };
  const tech = db.select({ name: users.name }).from(users).where(eq(users.id, v.technicianId)).get();
  const rules = visitRulesFor(db, studio.id);
  return {
    job,
    studio,
    visit: {
      ...visitJson(v),
      technicianName: tech?.name ?? "",
      when: formatVisitWhen(v.startAt.getTime(), v.endAt.getTime(), studio.timeZone),
      ownerCutoffHours: rules.ownerChangeCutoffHours,
      signedOffAt: v.signedOffAt ? iso(v.signedOffAt) : null,
      photos: visitPhotosOf(actor, { jobId: job.id }),
    },
  };
}

/** The booking page's data: the job, its duration, where the visit can be, the live visit if any. */
export function bookingContext(actor: VisitActor, jobId: string) {
  const { job, piece, studio } = jobForActor(actor, jobId);
  const live = liveVisitOfJob(job.id);
  const rules = visitRulesFor(getDb(), studio.id);
  return {
    job: { id: job.id, title: job.title, state: job.state },
    piece: { id: piece.id, title: piece.title, address: piece.deliveryAddress },
    studio: { name: studio.name, address: studio.address, timeZone: studio.timeZone },
    durationMin: jobDurationMin(job, piece),
    rules: { leadTimeHours: actor.kind === "owner" ? rules.leadTimeHours : 0, ownerChangeCutoffHours: rules.ownerChangeCutoffHours },
    visit: live ? { ...visitJson(live), when: formatVisitWhen(live.startAt.getTime(), live.endAt.getTime(), studio.timeZone) } : null,
    bookable: Boolean(live) || job.state === "paid" || job.state === "covered",
  };
}

