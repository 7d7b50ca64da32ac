import "server-only";
import { and, asc, eq, sql } from "drizzle-orm";
import { cookies } from "next/headers";
import type { User } from "lucia";
import { getDb, perConnection } from "@/db/client";
import { memberships, studios, type Studio } from "@/db/schema";
import type { StudioRole } from "@/lib/care/vocabulary";
import { forbidden, unauthorized } from "@/lib/errors";
import { getCurrentSession } from "./session";

// One helper per rule. Pages, route handlers and server actions call these; the
// queries in lib/ then filter by the studio or owner these return.

export async function requireUser(): Promise<User> {
  const { user } = await getCurrentSession();
  if (!user) throw unauthorized();
  return user;
}

export type StudioContext = { user: User; studio: Studio; role: StudioRole };

export const STUDIO_COOKIE = "gw_studio";

// Every studio request runs this.
const membershipsQuery = perConnection((db) =>
  db
    .select({ role: memberships.role, studio: studios })
    .from(memberships)
    .innerJoin(studios, eq(studios.id, memberships.studioId))
    .where(eq(memberships.userId, sql.placeholder("userId")))
    .orderBy(asc(memberships.createdAt))
    .prepare(),
);

export async function studioMemberships(userId: string) {
  return membershipsQuery(getDb()).all({ userId });
}

/** The signed-in user as a member of their current studio with one of `roles`. */
export async function requireStudioRole(roles: readonly StudioRole[]): Promise<StudioContext> {
  const user = await requireUser();
  const rows = await studioMemberships(user.id);
  const chosen = (await cookies()).get(STUDIO_COOKIE)?.value;
  const current = rows.find((r) => r.studio.id === chosen) ?? rows[0];
  if (!current) throw forbidden("This area is for studio members.");
  if (!roles.includes(current.role)) throw forbidden("Your role in this studio doesn't include this.");
  return { user, studio: current.studio, role: current.role };
}

export const STAFF_ROLES = ["admin", "staff"] as const satisfies readonly StudioRole[];
export const ALL_STUDIO_ROLES = ["admin", "staff", "technician"] as const satisfies readonly StudioRole[];

export function requireStaff() {
  return requireStudioRole(STAFF_ROLES);
}
export function requireAdmin() {
  return requireStudioRole(["admin"]);
}
export function requireStudioMember() {
  return requireStudioRole(ALL_STUDIO_ROLES);
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
