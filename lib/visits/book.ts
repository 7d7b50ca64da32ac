import "server-only";
import type { z } from "zod";
import { getDb } from "@/db/client";
import type { Actor } from "@/lib/auth/actor";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import type { bookVisitSchema } from "@/lib/validation/visits";
import { visitRulesFor } from "./availability";
import { reserveVisit } from "./core";
import { sendVisitInvite } from "./mail";
import { leadFor, refusedWithSlots } from "./slots";
import { jobForActor, visitJson } from "./visit-row";

export type BookVisitValues = z.output<typeof bookVisitSchema>;

/** POST /api/visits: books a free slot for a paid or covered job (its owner, or staff for them); a taken time is a 409 with fresh slots. */
export async function bookVisit(actor: Actor, input: BookVisitValues, now = Date.now()) {
  const target = jobForActor(actor, input.jobId);
  const { job, studio } = target;
  const startMs = Date.parse(input.start);
  let reserved;
  try {
    reserved = reserveVisit(getDb(), {
      studioId: studio.id,
      jobId: job.id,
      technicianId: input.technicianId,
      startMs,
      location: input.location,
      leadTimeHours: leadFor(actor, visitRulesFor(getDb(), studio.id)),
      actorId: actor.user.id,
      now,
    });
  } catch (e) {
    throw refusedWithSlots(e, actor, target, startMs, now);
  }
  await mailAfterCommit("visit booked", () => sendVisitInvite(reserved.visit.id, "booked", {}, now));
  return visitJson(reserved.visit);
}
