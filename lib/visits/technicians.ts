import "server-only";
import { and, eq } from "drizzle-orm";
import type { z } from "zod";
import { getDb } from "@/db/client";
import { technicianHours, technicianTimeOff } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { assertRole, type StudioContext } from "@/lib/auth/guards";
import { notFound } from "@/lib/errors";
import type { technicianHoursSchema } from "@/lib/validation/visits";
import { isStudioTechnician, studioTechnicians, timeOffRows, weeklyHours } from "./availability";
import { hoursByTechnician, timeOffByTechnician } from "./visits-sql";

// Technicians' weekly hours and time off: read by staff and the technician themself, set by staff.

export type TechnicianHoursValues = z.output<typeof technicianHoursSchema>;

function technicianFor(ctx: StudioContext, technicianId: string, write: boolean) {
  if (ctx.role === "technician" && technicianId !== ctx.user.id) throw notFound("No such technician.");
  if (write) assertRole(ctx, ["admin", "staff"], "The studio office sets working hours.");
  if (!isStudioTechnician(getDb(), ctx.studio.id, technicianId)) throw notFound("No such technician.");
}

/** GET /api/technicians/[id]/hours */
export function getTechnicianHours(ctx: StudioContext, technicianId: string) {
  technicianFor(ctx, technicianId, false);
  const db = getDb();
  return {
    technicianId,
    timeZone: ctx.studio.timeZone,
    hours: weeklyHours(db, ctx.studio.id, technicianId),
    timeOff: timeOffRows(db, ctx.studio.id, technicianId).map((t) => ({ date: t.date, start: t.start, end: t.end, note: t.note })),
  };
}

/** PUT /api/technicians/[id]/hours: replaces the weekly hours and the time off (admin and staff). */
export function putTechnicianHours(ctx: StudioContext, technicianId: string, input: TechnicianHoursValues) {
  technicianFor(ctx, technicianId, true);
  getDb().transaction(
    (tx) => {
      tx.delete(technicianHours).where(and(eq(technicianHours.studioId, ctx.studio.id), eq(technicianHours.userId, technicianId))).run();
      tx.delete(technicianTimeOff).where(and(eq(technicianTimeOff.studioId, ctx.studio.id), eq(technicianTimeOff.userId, technicianId))).run();
      for (const h of input.hours) tx.insert(technicianHours).values({ studioId: ctx.studio.id, userId: technicianId, ...h }).run();
      for (const t of input.timeOff) tx.insert(technicianTimeOff).values({ studioId: ctx.studio.id, userId: technicianId, date: t.date, start: t.start ?? null, end: t.end ?? null, note: t.note }).run();
      recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "technician.hours_set", subjectType: "user", subjectId: technicianId, data: { ranges: input.hours.length, timeOff: input.timeOff.length } });
    },
    { behavior: "immediate" },
  );
  return getTechnicianHours(ctx, technicianId);
}

/** The studio's technicians with their weekly hours and time off, for the hours page and the calendar: three statements for the whole team. */
export function listTechnicians(ctx: StudioContext) {
  const db = getDb();
  const techs = studioTechnicians(db, ctx.studio.id).filter((t) => ctx.role !== "technician" || t.id === ctx.user.id);
  const hours = hoursByTechnician(db, ctx.studio.id, techs.map((t) => t.id));
  const timeOff = timeOffByTechnician(db, ctx.studio.id, techs.map((t) => t.id));
  return techs.map((t) => ({
    id: t.id,
    name: t.name,
    hours: hours.get(t.id) ?? [],
    timeOff: (timeOff.get(t.id) ?? []).map((o) => ({ date: o.date, start: o.start, end: o.end, note: o.note })),
  }));
}
