import "server-only";
import { and, asc, desc, eq, gt, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { invitations, memberships, users } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";

export function listMembers(ctx: StudioContext) {
  return getDb()
    .select({ id: memberships.id, role: memberships.role, name: users.name, email: users.email, since: memberships.createdAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.studioId, ctx.studio.id))
    .orderBy(asc(users.name))
    .all();
}

export function listOpenInvitations(ctx: StudioContext) {
  return getDb()
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, expiresAt: invitations.expiresAt })
    .from(invitations)
    .where(
      and(
        eq(invitations.studioId, ctx.studio.id),
        isNull(invitations.acceptedAt),
        isNull(invitations.revokedAt),
        gt(invitations.expiresAt, new Date()),
      ),
    )
    .orderBy(desc(invitations.createdAt))
    .all();
}
