import "server-only";
import { eq, type SQL } from "drizzle-orm";
import { repairJobs } from "@/db/schema";
import type { Actor, ActorRef } from "@/lib/auth/actor";
import { ownerVisitWhere } from "./access";
import type { VisitActor } from "./visit-row";

/**
 * The visits an actor reaches, written once as a WHERE over the visit's repair job (visits join
 * repair_jobs): studio members their studio's (a technician's writes are narrowed to their own
 * visits by lib/visits), an owner those of the jobs they act on (lib/visits/access.ts).
 */
export function visitVisibleTo(actor: ActorRef): SQL {
  return actor.role === "owner" || !actor.studio ? ownerVisitWhere(actor.user.id) : eq(repairJobs.studioId, actor.studio.id);
}

/** The visit functions' view of the request's Actor (roles: every studio role and "owner"). */
export function visitActorOf(actor: Actor): VisitActor {
  if (actor.role === "owner") return { kind: "owner", user: actor.user };
  return actor.role === "technician" ? { kind: "technician", ctx: actor } : { kind: "staff", ctx: actor };
}
