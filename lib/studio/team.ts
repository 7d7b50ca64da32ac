import "server-only";
import { and, asc, count, desc, eq, gt, isNull } from "drizzle-orm";
import { getDb, type Db } from "@/db/client";
import { invitations, memberships, users } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { assertRole, type StudioContext } from "@/lib/auth/guards";
import { endAllSessions } from "@/lib/auth/session";
import { conflict, notFound } from "@/lib/errors";
import type { RevokeInvitationValues } from "@/lib/validation/auth";
import type { ChangeRoleValues, RemoveMemberValues } from "@/lib/validation/settings";

export function listMembers(ctx: StudioContext) {
  return getDb()
    .select({ id: memberships.id, userId: memberships.userId, role: memberships.role, name: users.name, email: users.email, since: memberships.createdAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.studioId, ctx.studio.id))
    .orderBy(asc(users.name))
    .all();
}

/** Invitations of the studio that can still be accepted. */
const pending = (studioId: string) =>
  and(eq(invitations.studioId, studioId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date()));

export function listOpenInvitations(ctx: StudioContext) {
  return getDb()
    .select({ id: invitations.id, email: invitations.email, role: invitations.role, expiresAt: invitations.expiresAt, createdAt: invitations.createdAt })
    .from(invitations)
    .where(pending(ctx.studio.id))
    .orderBy(desc(invitations.createdAt))
    .all();
}

// ---- role changes and removal ----
// The rule: a studio always keeps at least one admin. The count and the change happen in one
// transaction (SQLite serializes writers), so two admins demoting each other at once cannot both win.

function assertAdminRole(ctx: StudioContext) {
  assertRole(ctx, ["admin"], "Only the studio's admins can change the team.");
}

function memberOf(tx: Pick<Db, "select">, ctx: StudioContext, membershipId: string) {
  const m = tx
    .select({ id: memberships.id, userId: memberships.userId, role: memberships.role, name: users.name, email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.id, membershipId), eq(memberships.studioId, ctx.studio.id)))
    .get();
  if (!m) throw notFound("No such member in this studio.");
  return m;
}

function adminCount(tx: Pick<Db, "select">, studioId: string): number {
  return tx.select({ n: count() }).from(memberships).where(and(eq(memberships.studioId, studioId), eq(memberships.role, "admin"))).get()?.n ?? 0;
}

export function changeMemberRole(ctx: StudioContext, { membershipId, role }: ChangeRoleValues) {
  assertAdminRole(ctx);
  return getDb().transaction((tx) => {
    const m = memberOf(tx, ctx, membershipId);
    if (m.role === role) return { ...m, changed: false };
    if (m.role === "admin" && adminCount(tx, ctx.studio.id) <= 1) {
      throw conflict(`${m.name} is the studio's only admin. Make someone else an admin first.`);
    }
    tx.update(memberships).set({ role }).where(eq(memberships.id, m.id)).run();
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "member.role_changed", subjectType: "user", subjectId: m.userId, data: { name: m.name, from: m.role, to: role } });
    return { ...m, role, changed: true };
  });
}

/** Removes a member from the studio and ends every session of theirs at once. */
export async function removeMember(ctx: StudioContext, { membershipId }: RemoveMemberValues) {
  assertAdminRole(ctx);
  const removed = getDb().transaction((tx) => {
    const m = memberOf(tx, ctx, membershipId);
    if (m.userId === ctx.user.id) throw conflict("You can't remove yourself; another admin can.");
    if (m.role === "admin" && adminCount(tx, ctx.studio.id) <= 1) throw conflict(`${m.name} is the studio's only admin and can't be removed.`);
    tx.delete(memberships).where(eq(memberships.id, m.id)).run();
    // Any invitation still waiting for the address would let them straight back in.
    const revoked = tx
      .update(invitations)
      .set({ revokedAt: new Date() })
      .where(and(pending(ctx.studio.id), eq(invitations.email, m.email)))
      .returning({ id: invitations.id })
      .all();
    recordAudit(tx, {
      studioId: ctx.studio.id,
      actorId: ctx.user.id,
      action: "member.removed",
      subjectType: "user",
      subjectId: m.userId,
      data: { name: m.name, email: m.email, role: m.role, invitationsWithdrawn: revoked.length },
    });
    return m;
  });
  // Sessions are not per studio: ending them all signs the person out everywhere, which is what a
  // removal must do for this studio (they can sign in again as an owner, or for another studio).
  await endAllSessions(removed.userId);
  return removed;
}

/** Withdraws a pending invitation: its link stops working at once. Another studio's invitation is a 404. */
export function revokeInvitation(ctx: StudioContext, { invitationId }: RevokeInvitationValues) {
  assertAdminRole(ctx);
  return getDb().transaction((tx) => {
    const row = tx
      .update(invitations)
      .set({ revokedAt: new Date() })
      .where(and(eq(invitations.id, invitationId), pending(ctx.studio.id)))
      .returning({ id: invitations.id, email: invitations.email, role: invitations.role })
      .get();
    if (!row) throw notFound("No such invitation waiting in this studio; it may have been used or withdrawn already.");
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "member.invitation_withdrawn", subjectType: "invitation", subjectId: row.id, data: { email: row.email, role: row.role } });
    return row;
  });
}
