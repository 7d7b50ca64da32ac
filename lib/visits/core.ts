// The booking core: the availability check and the write in one SQLite transaction started with
// BEGIN IMMEDIATE, so two bookings of the same technician's time — in this process or in another one
// on the same database file — are serialized and exactly one of them wins. Synchronous on purpose
// (better-sqlite3): nothing else runs between the check and the insert.
import { and, eq, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { pieces, repairJobs, studios, visits, type Visit, type VisitRulesRow } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { followJob } from "@/lib/claims/follow-job";
import type { VisitLocation } from "@/lib/care/vocabulary";
import { badRequest, conflict, notFound } from "@/lib/errors";
import { moveJob } from "@/lib/repairs/jobs";
import { pricedPiece } from "@/lib/repairs/pricing";
import { isStudioTechnician, jobDurationMin, technicianSlots, visitRulesFor } from "./availability";
import { visitUid } from "./ics";

/** The code of a 409 for a time that is taken or not offered; lib/visits/slots.ts refusedWithSlots adds fresh slots to it. */
export const SLOT_UNAVAILABLE = "slot_unavailable";
const slotUnavailable = (message: string) => conflict(message, { code: SLOT_UNAVAILABLE });

export type ReserveInput = {
  studioId: string;
  jobId: string;
  technicianId: string;
  startMs: number;
  location?: VisitLocation;
  /** Owners book at least the studio's lead time ahead; staff may book at shorter notice. */
  leadTimeHours: number;
  actorId: string | null;
  now: number;
  /** Set when moving an existing visit. */
  visitId?: string;
  visitVersion?: number;
};

export type Reserved = { visit: Visit; previous?: Visit; rules: Omit<VisitRulesRow, "studioId"> };

function addressFor(kind: VisitLocation, piece: { deliveryAddress: string }, studio: { address: string; name: string }): string {
  if (kind === "owner") return piece.deliveryAddress.trim();
  return studio.address.trim() ? `${studio.name}, ${studio.address}` : studio.name;
}

/** Books (or, with visitId, moves) a visit if and only if the time is a free slot of the technician. */
export function reserveVisit(db: Db, input: ReserveInput): Reserved {
  return db.transaction(
    (tx) => {
      const studio = tx.select().from(studios).where(eq(studios.id, input.studioId)).get();
      const job = tx.select().from(repairJobs).where(and(eq(repairJobs.id, input.jobId), eq(repairJobs.studioId, input.studioId))).get();
      if (!studio || !job) throw notFound("No such repair job.");
      const piece = tx.select().from(pieces).where(eq(pieces.id, job.pieceId)).get()!;
      let previous: Visit | undefined;
      if (input.visitId) {
        previous = tx.select().from(visits).where(and(eq(visits.id, input.visitId), eq(visits.studioId, studio.id))).get();
        if (!previous) throw notFound("No such visit.");
        if (previous.state !== "booked") throw conflict(previous.state === "done" ? "This visit is done and can't be moved." : "This visit was cancelled.");
        if (input.visitVersion !== undefined && previous.version !== input.visitVersion) throw conflict("The visit changed while you were working on it. Reload and try again.");
      } else if (job.state === "scheduled") {
        throw slotUnavailable("This job already has a visit booked. Move that visit instead.");
      } else if (job.state !== "paid" && job.state !== "covered") {
        throw conflict(job.state === "done" ? "This job is done." : "A visit can be booked once the job is paid or covered.");
      }
      if (!isStudioTechnician(tx, studio.id, input.technicianId)) {
        throw badRequest("Pick one of the studio's technicians.", { technicianId: ["Pick one of the studio's technicians."] });
      }
      const locationKind: VisitLocation = input.location ?? previous?.locationKind ?? (piece.deliveryAddress.trim() ? "owner" : "studio");
      const location = addressFor(locationKind, piece, studio);
      if (!location) throw badRequest("The piece has no address on record; book the visit at the studio, or ask the studio to add the address.", { location: ["No address on record for the piece."] });

      const rules = visitRulesFor(tx, studio.id);
      const durationMin = jobDurationMin(job, pricedPiece(tx, piece));
      const endMs = input.startMs + durationMin * 60_000;
      if (input.startMs <= input.now) throw slotUnavailable("That time has passed. Pick one of the free slots.");
      const args = { studio, technicianId: input.technicianId, durationMin, fromMs: input.startMs, toMs: endMs, leadTimeHours: input.leadTimeHours, rules, excludeVisitId: previous?.id, now: input.now };
      const free = technicianSlots(tx, args).some((s) => s.startMs === input.startMs);
      if (!free) {
        throw slotUnavailable("That time is no longer free. Pick one of the slots below.");
      }

      let visit: Visit;
      if (previous) {
        const updated = tx
          .update(visits)
          .set({
            technicianId: input.technicianId,
            startAt: new Date(input.startMs),
            endAt: new Date(endMs),
            locationKind,
            location,
            sequence: sql`${visits.sequence} + 1`,
            version: sql`${visits.version} + 1`,
            updatedAt: new Date(input.now),
          })
          .where(and(eq(visits.id, previous.id), eq(visits.version, previous.version), eq(visits.state, "booked")))
          .returning()
          .get();
        if (!updated) throw conflict("The visit changed while you were working on it. Reload and try again.");
        visit = updated;
        recordAudit(tx, { studioId: studio.id, actorId: input.actorId, action: "visit.moved", subjectType: "visit", subjectId: visit.id, data: { from: previous.startAt.toISOString(), to: visit.startAt.toISOString(), technicianId: visit.technicianId, sequence: visit.sequence } });
      } else {
        const visitId = crypto.randomUUID();
        visit = tx
          .insert(visits)
          .values({
            id: visitId,
            studioId: studio.id,
            jobId: job.id,
            pieceId: piece.id,
            technicianId: input.technicianId,
            startAt: new Date(input.startMs),
            endAt: new Date(endMs),
            locationKind,
            location,
            icsUid: visitUid(visitId),
            sequence: 0,
            state: "booked",
            jobStateBefore: job.state,
            bookedById: input.actorId,
            createdAt: new Date(input.now),
            updatedAt: new Date(input.now),
          })
          .returning()
          .get();
        moveJob(tx, job, "scheduled");
        followJob(tx, job.id, "visit_booked", input.actorId);
        recordAudit(tx, { studioId: studio.id, actorId: input.actorId, action: "visit.booked", subjectType: "visit", subjectId: visit.id, data: { jobId: job.id, start: visit.startAt.toISOString(), technicianId: visit.technicianId } });
      }
      return { visit, previous, rules };
    },
    { behavior: "immediate" },
  );
}
