import "server-only";
import { eq } from "drizzle-orm";
import type { z } from "zod";
import { getDb } from "@/db/client";
import type { Actor } from "@/lib/auth/actor";
import { pieces } from "@/db/schema";
import { badRequest } from "@/lib/errors";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import type { moveVisitSchema } from "@/lib/validation/visits";
import { isStudioTechnician, visitRulesFor } from "./availability";
import { reserveVisit } from "./core";
import { sendVisitInvite } from "./mail";
import { leadFor, refusedWithSlots } from "./slots";
import { ownerMayChange, visitForActor, visitJson } from "./visit-row";

export type MoveVisitValues = z.output<typeof moveVisitSchema>;

/** PATCH /api/visits/[id]: a new time (and maybe technician), with the same checks as booking; a taken time is a 409 with fresh slots. */
export async function moveVisit(actor: Actor, visitId: string, input: MoveVisitValues, now = Date.now()) {
  const { visit, job, studio } = visitForActor(actor, visitId);
  ownerMayChange(actor, visit, studio.id, now, "moved");
  if (actor.role === "owner" && input.technicianId && input.technicianId !== visit.technicianId && !isStudioTechnician(getDb(), studio.id, input.technicianId)) {
    throw badRequest("Pick one of the studio's technicians.", { technicianId: ["Pick one of the studio's technicians."] });
  }
  const piece = getDb().select().from(pieces).where(eq(pieces.id, visit.pieceId)).get()!;
  const startMs = Date.parse(input.start);
  let reserved;
  try {
    reserved = reserveVisit(getDb(), {
      studioId: studio.id,
      jobId: job.id,
      technicianId: input.technicianId ?? visit.technicianId,
      startMs,
      location: input.location,
      leadTimeHours: leadFor(actor, visitRulesFor(getDb(), studio.id)),
      actorId: actor.user.id,
      now,
      visitId: visit.id,
      visitVersion: visit.version,
    });
  } catch (e) {
    throw refusedWithSlots(e, actor, { job, piece, studio }, startMs, now, visit.id);
  }
  const changed = reserved.visit.startAt.getTime() !== visit.startAt.getTime() || reserved.visit.technicianId !== visit.technicianId || reserved.visit.location !== visit.location;
  if (changed) await mailAfterCommit("visit moved", () => sendVisitInvite(reserved.visit.id, "moved", { previous: visit }, now));
  return visitJson(reserved.visit);
}
