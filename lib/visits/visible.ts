import { eq, type SQL } from "drizzle-orm";
import { repairJobs } from "@/db/schema";
import type { ActorRef } from "@/lib/auth/actor";
import { ownerJobWhere } from "@/lib/repairs/owner-reach";

// No server-only import: the scheduler books and mails visits through lib/visits/visit-row.ts.

/**
 * The visits an actor reaches, written once as a WHERE over the visit's repair job (visit queries
 * join repair_jobs): studio members their studio's (a technician's writes are narrowed to their own
 * visits by lib/visits/visit-row.ts), an owner those of the jobs they act on — never a former
 * owner's, once the piece has been handed on (lib/repairs/owner-reach.ts "act").
 */
export function visitVisibleTo(actor: ActorRef): SQL {
  return actor.role === "owner" || !actor.studio ? ownerJobWhere(actor.user.id, "act") : eq(repairJobs.studioId, actor.studio.id);
}
