import "server-only";
import { and, asc, eq, gte, inArray, lt } from "drizzle-orm";
import type { z } from "zod";
import { getDb } from "@/db/client";
import { pieces, repairJobs, studios, users, visits } from "@/db/schema";
import { isStaff, type Actor } from "@/lib/auth/actor";
import type { StudioContext } from "@/lib/auth/guards";
import { addDays, isoWeekday, localDate } from "@/lib/care/dates";
import { notFound } from "@/lib/errors";
import { visitDay } from "@/lib/validation/dates";
import type { listVisitsQuerySchema } from "@/lib/validation/visits";
import { isStudioTechnician, studioTechnicians } from "./availability";
import { visitJson } from "./visit-row";
import { visitVisibleTo } from "./visible";

// The calendar's lists: the visits of a range (the week view), the jobs waiting for a visit, the week to open on.

export type ListVisitsQuery = z.output<typeof listVisitsQuerySchema>;

/** GET /api/visits?technician&from&to: staff see the team (or one technician), a technician their own, an owner theirs. */
export function listVisits(actor: Actor, q: ListVisitsQuery) {
  const db = getDb();
  const from = new Date(q.from);
  const to = new Date(q.to);
  if (actor.role === "technician" && q.technician && q.technician !== actor.user.id) throw notFound("No such technician.");
  const technician = actor.role === "technician" ? actor.user.id : q.technician;
  if (isStaff(actor) && technician && !isStudioTechnician(db, actor.studio.id, technician)) throw notFound("No such technician.");
  const rows = db
    .select({ visit: visits, jobTitle: repairJobs.title, jobState: repairJobs.state, claimId: repairJobs.claimId, pieceTitle: pieces.title, ownerName: users.name, studioTz: studios.timeZone })
    .from(visits)
    .innerJoin(repairJobs, eq(repairJobs.id, visits.jobId))
    .innerJoin(pieces, eq(pieces.id, visits.pieceId))
    .innerJoin(studios, eq(studios.id, visits.studioId))
    .leftJoin(users, eq(users.id, repairJobs.ownerId))
    .where(
      and(
        visitVisibleTo(actor),
        technician ? eq(visits.technicianId, technician) : undefined,
        lt(visits.startAt, to),
        gte(visits.endAt, from),
        q.includeCancelled === "1" ? undefined : inArray(visits.state, ["booked", "done"]),
      ),
    )
    .orderBy(asc(visits.startAt))
    .limit(1000)
    .all();
  const techs = actor.studio ? studioTechnicians(db, actor.studio.id) : [];
  const names = new Map(db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, [...new Set(rows.map((r) => r.visit.technicianId)), "-"])).all().map((u) => [u.id, u.name]));
  return {
    timeZone: actor.studio?.timeZone ?? rows[0]?.studioTz ?? "UTC",
    technicians: actor.role === "technician" ? techs.filter((t) => t.id === actor.user.id).map(({ id, name }) => ({ id, name })) : techs.map(({ id, name }) => ({ id, name })),
    visits: rows.map((r) =>
      visitJson(r.visit, {
        jobTitle: r.jobTitle,
        jobState: r.jobState,
        pieceTitle: r.pieceTitle,
        ownerName: actor.role === "owner" ? undefined : (r.ownerName ?? null),
        claimId: isStaff(actor) ? r.claimId : undefined,
        technicianName: names.get(r.visit.technicianId) ?? "",
      }),
    ),
  };
}

/** Jobs waiting for a visit (paid or covered, none booked), for staff booking from the calendar. */
export function jobsAwaitingVisit(ctx: StudioContext) {
  return getDb()
    .select({ id: repairJobs.id, title: repairJobs.title, state: repairJobs.state, origin: repairJobs.origin, coveredPct: repairJobs.coveredPct, pieceTitle: pieces.title, ownerName: users.name })
    .from(repairJobs)
    .innerJoin(pieces, eq(pieces.id, repairJobs.pieceId))
    .leftJoin(users, eq(users.id, repairJobs.ownerId))
    .where(and(eq(repairJobs.studioId, ctx.studio.id), inArray(repairJobs.state, ["paid", "covered"])))
    .orderBy(asc(repairJobs.updatedAt))
    .all();
}

/** Today and this week's Monday in the studio's time zone, for the calendar's first view. */
export function calendarWeek(ctx: StudioContext, week?: string, now = Date.now()) {
  const today = localDate(now, ctx.studio.timeZone);
  const base = visitDay().safeParse(week).data ?? today;
  return { today, monday: addDays(base, 1 - isoWeekday(base)) };
}
