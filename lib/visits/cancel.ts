import "server-only";
import { and, eq, sql } from "drizzle-orm";
import type { z } from "zod";
import { getDb } from "@/db/client";
import { repairJobs, visits } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { isStaff, type Actor } from "@/lib/auth/actor";
import { followJob } from "@/lib/claims/follow-job";
import { conflict } from "@/lib/errors";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import { moveJob } from "@/lib/repairs/jobs";
import type { cancelVisitSchema } from "@/lib/validation/visits";
import { sendVisitInvite } from "./mail";
import { ownerMayChange, visitForActor, visitJson } from "./visit-row";

export type CancelVisitValues = z.output<typeof cancelVisitSchema>;

/** POST /api/visits/[id]/cancel: the visit is cancelled (SEQUENCE raised, METHOD:CANCEL sent) and the job is open for booking again. */
export async function cancelVisit(actor: Actor, visitId: string, { reason }: CancelVisitValues = { reason: "" }, now = Date.now()) {
  const { visit, job, studio } = visitForActor(actor, visitId);
  ownerMayChange(actor, visit, studio.id, now, "cancelled");
  const updated = getDb().transaction(
    (tx) => {
      const v = tx
        .update(visits)
        .set({ state: "cancelled", cancelledAt: new Date(now), cancelledById: actor.user.id, cancelReason: reason || null, sequence: sql`${visits.sequence} + 1`, version: sql`${visits.version} + 1`, updatedAt: new Date(now) })
        .where(and(eq(visits.id, visit.id), eq(visits.version, visit.version), eq(visits.state, "booked")))
        .returning()
        .get();
      if (!v) throw conflict("The visit changed while you were working on it. Reload and try again.");
      const freshJob = tx.select().from(repairJobs).where(eq(repairJobs.id, job.id)).get()!;
      if (freshJob.state === "scheduled") moveJob(tx, freshJob, visit.jobStateBefore);
      followJob(tx, job.id, "visit_cancelled", actor.user.id);
      recordAudit(tx, { studioId: studio.id, actorId: actor.user.id, action: "visit.cancelled", subjectType: "visit", subjectId: visit.id, data: { reason, by: isStaff(actor) ? "staff" : actor.role } });
      return v;
    },
    { behavior: "immediate" },
  );
  await mailAfterCommit("visit cancelled", () => sendVisitInvite(updated.id, "cancelled", { reason }, now));
  return visitJson(updated);
}
