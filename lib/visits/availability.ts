// Free visit time, from the studio's rules, a technician's weekly hours and time off, and the visits
// already booked. The slot arithmetic itself is lib/care's availableSlots (DST-correct); this module
// only loads its inputs. No server-only import: the booking core runs in the scheduler and in the
// concurrency test's processes too.
import { and, asc, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { memberships, users, visitRules, type RepairJob, type Studio, type TechnicianTimeOffRow, type VisitRulesRow } from "@/db/schema";
import { addDays, parseHhMm, zonedTimeToEpochMs } from "@/lib/care/dates";
import { taskDurationMinutes } from "@/lib/care/quote";
import { availableSlots, type BusyInterval, type Slot } from "@/lib/care/slots";
import { readLines } from "@/lib/repairs/lines";
import { quoteAreaM2, taskLineRef, taskSurfaces, type PricedPiece } from "@/lib/repairs/pricing";
import type { DbOrTx } from "@/lib/pieces/search-index";
import { bookedByTechnician, hoursByTechnician, timeOffByTechnician, type WeeklyRange } from "./visits-sql";

export type { Db };

/** Defaults when a studio has not set its own (48 h lead time and the rest: our choice). */
export const DEFAULT_VISIT_RULES: Omit<VisitRulesRow, "studioId"> = {
  travelBufferMin: 30,
  leadTimeHours: 48,
  slotStepMin: 30,
  ownerChangeCutoffHours: 24,
};

export function visitRulesFor(db: DbOrTx, studioId: string): Omit<VisitRulesRow, "studioId"> {
  const row = db.select().from(visitRules).where(eq(visitRules.studioId, studioId)).get();
  return row ?? DEFAULT_VISIT_RULES;
}

/** The studio's technicians (membership role "technician"), by name. */
export function studioTechnicians(db: DbOrTx, studioId: string): { id: string; name: string; email: string }[] {
  return db
    .select({ id: users.id, name: users.name, email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.studioId, studioId), eq(memberships.role, "technician")))
    .orderBy(asc(users.name))
    .all();
}

export function isStudioTechnician(db: DbOrTx, studioId: string, userId: string): boolean {
  return !!db
    .select({ id: memberships.id })
    .from(memberships)
    .where(and(eq(memberships.studioId, studioId), eq(memberships.userId, userId), eq(memberships.role, "technician")))
    .get();
}

export function weeklyHours(db: DbOrTx, studioId: string, technicianId: string): WeeklyRange[] {
  return hoursByTechnician(db, studioId, [technicianId]).get(technicianId) ?? [];
}

export function timeOffRows(db: DbOrTx, studioId: string, technicianId: string): TechnicianTimeOffRow[] {
  return timeOffByTechnician(db, studioId, [technicianId]).get(technicianId) ?? [];
}

/** A day off (or part of one) as an interval of instants in the studio's time zone. */
export function timeOffInterval(t: { date: string; start: string | null; end: string | null }, timeZone: string): { start: number; end: number } {
  if (t.start == null || t.end == null) {
    return { start: zonedTimeToEpochMs(t.date, 0, timeZone), end: zonedTimeToEpochMs(addDays(t.date, 1), 0, timeZone) };
  }
  return { start: zonedTimeToEpochMs(t.date, parseHhMm(t.start), timeZone), end: zonedTimeToEpochMs(t.date, parseHhMm(t.end), timeZone) };
}

/**
 * The area a visit is booked for when the surface a task works on has no size, on the record or typed
 * on the quote: 1 m², about one face of a dining top or of a table's base (legs and apron) — common
 * practice, no published source. Only the booking uses it: the quote prices no line from a size nobody
 * gave (lib/repairs/pricing.ts proposeLines), but a visit must be booked for some length, and one that
 * runs a little long costs the technician less than one cut short.
 */
export const UNSIZED_BOOKING_AREA_M2 = 1;

/**
 * Minutes on site for a job: the quote's hours as sent (edited hours and repair lines included), else
 * the quote's tasks, each on the surfaces it is priced on and at their sizes, as the quote prices it
 * (lib/repairs/pricing.ts taskSurfaces, quoteAreaM2), or UNSIZED_BOOKING_AREA_M2 where none is known
 * (lib/care taskDurationMinutes).
 */
export function jobDurationMin(job: Pick<RepairJob, "quoteInput" | "lines">, piece: PricedPiece): number {
  const lines = readLines(job.lines);
  const quotedHours = lines.reduce((h, l) => h + (l.unit === "h" ? l.quantity : 0), 0);
  const tasks = job.quoteInput.tasks ?? [];
  // Each task on each surface it is priced on (the base too, where staff priced it beside the top).
  const work = tasks.flatMap((task) => {
    const surfaces = taskSurfaces(piece.layers, task, job.quoteInput);
    return surfaces.map((surface) => ({ task, ref: taskLineRef(task, surface, surfaces[0]!), areaM2: quoteAreaM2(piece, job.quoteInput, surface) }));
  });
  const minutesOf = (some: typeof work) => some.reduce((m, w) => m + taskDurationMinutes([w.task], w.areaM2 ?? UNSIZED_BOOKING_AREA_M2), 0);
  if (quotedHours <= 0) return Math.max(30, tasks.length ? minutesOf(work) : 60);
  // Work the quote has no hours for because its surface has no size (no line was proposed for it)
  // still takes its time on site, beside the hours quoted for the rest.
  const hourRefs = new Set(lines.filter((l) => l.unit === "h").map((l) => l.ref));
  const unpriced = work.filter((w) => w.areaM2 === null && !hourRefs.has(w.ref));
  return Math.max(30, Math.round(quotedHours * 60) + minutesOf(unpriced));
}

export type TechnicianSlot = Slot & { technicianId: string };

type SlotArgs = {
  studio: Pick<Studio, "id" | "timeZone">;
  durationMin: number;
  fromMs: number;
  toMs: number;
  leadTimeHours: number;
  rules: Omit<VisitRulesRow, "studioId">;
  excludeVisitId?: string;
  now: number;
};

/**
 * Free slots of each of these technicians for a visit of `durationMin`, by technician. Three statements
 * for the whole team (weekly hours, then booked visits and time off of those who have hours), a day
 * either side of the window so a visit or day off across its edges still blocks.
 */
export function teamSlots(db: DbOrTx, args: SlotArgs & { technicianIds: string[] }): Map<string, TechnicianSlot[]> {
  const day = 86_400_000;
  const out = new Map<string, TechnicianSlot[]>();
  const hours = hoursByTechnician(db, args.studio.id, args.technicianIds);
  const working = args.technicianIds.filter((t) => hours.has(t));
  if (working.length === 0) return out;
  const booked = bookedByTechnician(db, args.studio.id, working, args.fromMs - day, args.toMs + day, args.excludeVisitId);
  const off = timeOffByTechnician(db, args.studio.id, working);
  for (const technicianId of working) {
    const busy: BusyInterval[] = [
      ...(booked.get(technicianId) ?? []),
      ...(off.get(technicianId) ?? []).map((t) => timeOffInterval(t, args.studio.timeZone)).filter((o) => o.end > args.fromMs - day && o.start < args.toMs + day),
    ];
    const slots = availableSlots({
      workingHours: hours.get(technicianId)!,
      timeZone: args.studio.timeZone,
      existing: busy,
      durationMin: args.durationMin,
      bufferMin: args.rules.travelBufferMin,
      leadTimeHours: args.leadTimeHours,
      from: args.fromMs,
      to: args.toMs,
      stepMin: args.rules.slotStepMin,
      now: args.now,
    });
    out.set(technicianId, slots.map((s) => ({ ...s, technicianId })));
  }
  return out;
}

/** Free slots of one technician for a visit of `durationMin` (the booking core's check). */
export function technicianSlots(db: DbOrTx, args: SlotArgs & { technicianId: string }): TechnicianSlot[] {
  return teamSlots(db, { ...args, technicianIds: [args.technicianId] }).get(args.technicianId) ?? [];
}
