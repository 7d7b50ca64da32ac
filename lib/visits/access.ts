import type { SQL } from "drizzle-orm";
import { requireStudioRole, requireUser, studioMemberships } from "@/lib/auth/guards";
import { ownerJobWhere } from "@/lib/repairs/owner-reach";
import type { VisitActor } from "./visit-row";

/**
 * Staff (admin/staff) act on the studio's visits, technicians on their own, everyone else on the
 * visits of their own jobs. A person with a studio membership acts in that role.
 */
export async function requireVisitActor(): Promise<VisitActor> {
  const user = await requireUser();
  const rows = await studioMemberships(user.id);
  if (rows.length === 0) return { kind: "owner", user };
  const ctx = await requireStudioRole(["admin", "staff", "technician"]);
  return ctx.role === "technician" ? { kind: "technician", ctx } : { kind: "staff", ctx };
}

/**
 * The visits an owner sees, books, moves and cancels: those of the jobs they act on (a WHERE over
 * repair_jobs, lib/repairs/owner-reach) — never a former owner's, once the piece has been handed on.
 */
export function ownerVisitWhere(userId: string): SQL {
  return ownerJobWhere(userId, "act");
}
