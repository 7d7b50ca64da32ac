import { and, asc, eq } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { memberships } from "@/db/schema";
import type { StudioRole } from "@/lib/care/vocabulary";
import { forbidden } from "@/lib/errors";
import { requireActor, STAFF_ROLES, ALL_STUDIO_ROLES, type StudioActor } from "./actor";

// One helper per rule, all answered from the request's one Actor (lib/auth/actor.ts). Route handlers
// and server actions name their roles in lib/http's route()/action() wrappers; pages and lib/ call
// these; the queries in lib/ then filter by the studio or owner these return.

export { STUDIO_COOKIE, studioMemberships, STAFF_ROLES, ALL_STUDIO_ROLES } from "./actor";

/** The studio actor under its older name: the same shape (lib/auth/actor.ts), kept for lib/ signatures. */
export type StudioContext = StudioActor;

export async function requireUser(): Promise<User> {
  return (await requireActor(["owner"])).user;
}

/** The signed-in user as a member of their current studio with one of `roles`. */
export function requireStudioRole(roles: readonly StudioRole[]): Promise<StudioContext> {
  return requireActor(roles);
}

export function requireStaff() {
  return requireActor(STAFF_ROLES);
}
export function requireAdmin() {
  return requireActor(["admin"]);
}
export function requireStudioMember() {
  return requireActor(ALL_STUDIO_ROLES);
}

/**
 * The role rule of a lib/ function that takes an actor, for rules that hold wherever it is called
 * from (a page, a route, an action, a job): the actor's role is one of `roles`, else a 403 saying who may.
 */
export function assertRole<R extends StudioRole>(actor: StudioActor, roles: readonly R[], message: string): asserts actor is StudioActor & { role: R } {
  if (!(roles as readonly StudioRole[]).includes(actor.role)) throw forbidden(message);
}

/** Where a signed-in person starts: studio members in the studio area, owners with their pieces. */
export async function homePathFor(userId: string): Promise<string> {
  const row = getDb()
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.userId, userId)))
    .orderBy(asc(memberships.createdAt))
    .get();
  if (!row) return "/pieces";
  return row.role === "technician" ? "/studio/today" : "/studio";
}
