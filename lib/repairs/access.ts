import { and, eq, type SQL } from "drizzle-orm";
import { repairJobs } from "@/db/schema";
import type { ActorRef } from "@/lib/auth/actor";
import { ownerJobWhere, type OwnerReach } from "./owner-reach";

/**
 * The repair jobs an actor sees, written once as a WHERE over repair_jobs: staff and technicians
 * their studio's, an owner those they reach (lib/repairs/owner-reach.ts; `reach` "history" adds a
 * former owner's paid jobs, read-only).
 */
export function jobVisibleTo(actor: ActorRef, reach: OwnerReach = "act"): SQL {
  return actor.role === "owner" || !actor.studio ? ownerJobWhere(actor.user.id, reach) : eq(repairJobs.studioId, actor.studio.id);
}

/** One job of the actor's, by id. */
export function jobWhere(actor: ActorRef, jobId: string, reach: OwnerReach = "act"): SQL {
  return and(eq(repairJobs.id, jobId), jobVisibleTo(actor, reach))!;
}
