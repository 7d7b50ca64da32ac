import type { z } from "zod";
import { getDb } from "@/db/client";
import type { Piece, RepairJob, Studio, VisitRulesRow } from "@/db/schema";
import { conflict, isAppError } from "@/lib/errors";
import type { slotsQuerySchema } from "@/lib/validation/visits";
import { pricedPiece } from "@/lib/repairs/pricing";
import { jobDurationMin, studioTechnicians, teamSlots, visitRulesFor } from "./availability";
import { SLOT_UNAVAILABLE } from "./core";
import type { Actor } from "@/lib/auth/actor";
import { DAY, jobForActor, liveVisitOfJob } from "./visit-row";

// The free slots of a job's visit: every technician of the studio, from their hours, time off and
// booked visits (lib/visits/availability teamSlots: a fixed number of statements for the whole team).

export type SlotView = { technicianId: string; technicianName: string; start: string; end: string; localDate: string; localStart: string; localEnd: string };
export type SlotsQuery = z.output<typeof slotsQuerySchema>;
type Rules = Omit<VisitRulesRow, "studioId">;

/** Owners book at least the studio's lead time ahead; staff may book at shorter notice. */
export function leadFor(actor: Actor, rules: Rules): number {
  return actor.role === "owner" ? rules.leadTimeHours : 0;
}

function slotsFor(studio: Studio, job: RepairJob, piece: Piece, rules: Rules, opts: { fromMs: number; toMs: number; leadTimeHours: number; excludeVisitId?: string; now: number }): SlotView[] {
  const db = getDb();
  const techs = studioTechnicians(db, studio.id);
  const byTech = teamSlots(db, { studio, technicianIds: techs.map((t) => t.id), durationMin: jobDurationMin(job, pricedPiece(db, piece)), rules, ...opts });
  return techs
    .flatMap((t) =>
      (byTech.get(t.id) ?? []).map((s) => ({
        technicianId: t.id,
        technicianName: t.name,
        start: s.start,
        end: s.end,
        localDate: s.localDate,
        localStart: s.localStart,
        localEnd: s.localEnd,
      })),
    )
    .sort((a, b) => a.start.localeCompare(b.start) || a.technicianName.localeCompare(b.technicianName));
}

/** GET /api/jobs/[id]/slots?from&to: free slots of every technician for this job's visit. */
export function listJobSlots(actor: Actor, jobId: string, q: SlotsQuery, now = Date.now()) {
  const { job, piece, studio } = jobForActor(actor, jobId);
  const live = liveVisitOfJob(job.id);
  if (!live && job.state !== "paid" && job.state !== "covered") throw conflict("Visits can be booked once the job is paid or covered.");
  const fromMs = Math.max(q.from ? Date.parse(q.from) : now, now);
  const toMs = q.to ? Date.parse(q.to) : fromMs + 14 * DAY;
  const durationMin = jobDurationMin(job, pricedPiece(getDb(), piece));
  if (toMs <= fromMs) return { timeZone: studio.timeZone, durationMin, slots: [] as SlotView[], visitId: live?.id ?? null };
  const rules = visitRulesFor(getDb(), studio.id);
  const slots = slotsFor(studio, job, piece, rules, { fromMs, toMs, leadTimeHours: leadFor(actor, rules), excludeVisitId: live?.id, now });
  return { timeZone: studio.timeZone, durationMin, slots, visitId: live?.id ?? null };
}

/**
 * A refused time as the 409 the caller sees: the same words, with what is free now beside the error
 * (`slots`: the next two weeks from a day before the time asked for, at most 60).
 */
export function refusedWithSlots(e: unknown, actor: Actor, target: { job: RepairJob; piece: Piece; studio: Studio }, aroundMs: number, now: number, excludeVisitId?: string): unknown {
  if (!isAppError(e) || e.code !== SLOT_UNAVAILABLE) return e;
  const { job, piece, studio } = target;
  const rules = visitRulesFor(getDb(), studio.id);
  const fromMs = Math.max(now, aroundMs - DAY);
  const slots = slotsFor(studio, job, piece, rules, { fromMs, toMs: fromMs + 14 * DAY, leadTimeHours: leadFor(actor, rules), excludeVisitId, now }).slice(0, 60);
  return conflict(e.message, { code: SLOT_UNAVAILABLE, extra: { slots } });
}
