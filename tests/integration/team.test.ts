// Team rules: the last admin can't be removed or demoted; a removed member's sessions end at once;
// only admins change the team; another studio's member is a 404. All data invented.
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { auditLog, memberships, sessions, type Studio } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { getLucia } from "@/lib/auth/lucia";
import { sha256Hex } from "@/lib/crypto";
import { AppError } from "@/lib/errors";
import { changeMemberRole, listMembers, removeMember } from "@/lib/studio/team";
import { createStudio, memberContext } from "../support/fixtures";

function membershipOf(studio: Studio, ctx: StudioContext) {
  return getDb().select().from(memberships).where(and(eq(memberships.studioId, studio.id), eq(memberships.userId, ctx.user.id))).get()!;
}

async function expectStatus(p: unknown, status: number) {
  try {
    await (typeof p === "function" ? (p as () => unknown)() : p);
  } catch (e) {
    expect(e).toBeInstanceOf(AppError);
    expect((e as AppError).status).toBe(status);
    return e as AppError;
  }
  throw new Error(`expected a ${status}`);
}

describe("team changes", () => {
  it("the only admin can't be demoted", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    await memberContext(studio, "staff");
    const e = await expectStatus(() => changeMemberRole(admin, { membershipId: membershipOf(studio, admin).id, role: "staff" }), 409);
    expect(e.message).toMatch(/only admin/);
    expect(membershipOf(studio, admin).role).toBe("admin");
  });

  it("the last admin can't be removed, even by someone whose admin role is stale", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const formerAdmin = await memberContext(studio, "admin");
    // formerAdmin was demoted in another tab; their context still says admin.
    getDb().update(memberships).set({ role: "staff" }).where(eq(memberships.id, membershipOf(studio, formerAdmin).id)).run();
    await expectStatus(() => removeMember(formerAdmin, { membershipId: membershipOf(studio, admin).id }), 409);
    expect(listMembers(admin).filter((m) => m.role === "admin")).toHaveLength(1);
  });

  it("two admins demoting each other: the first wins, the second is refused", async () => {
    const studio = createStudio();
    const a = await memberContext(studio, "admin");
    const b = await memberContext(studio, "admin");
    const first = changeMemberRole(a, { membershipId: membershipOf(studio, b).id, role: "staff" });
    expect(first.changed).toBe(true);
    await expectStatus(() => changeMemberRole(b, { membershipId: membershipOf(studio, a).id, role: "staff" }), 409);
    expect(membershipOf(studio, a).role).toBe("admin");
    const audit = getDb().select().from(auditLog).where(and(eq(auditLog.studioId, studio.id), eq(auditLog.action, "member.role_changed"))).all();
    expect(audit).toHaveLength(1);
    expect(audit[0]!.data).toMatchObject({ from: "admin", to: "staff" });
  });

  it("a removed member's sessions end at once", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const staff = await memberContext(studio, "staff");
    const lucia = getLucia();
    await lucia.createSession(staff.user.id, {}, { sessionId: sha256Hex(`phone-${staff.user.id}`) });
    await lucia.createSession(staff.user.id, {}, { sessionId: sha256Hex(`laptop-${staff.user.id}`) });
    await lucia.createSession(admin.user.id, {}, { sessionId: sha256Hex(`admin-${admin.user.id}`) });
    expect((await lucia.validateSession(sha256Hex(`phone-${staff.user.id}`))).session).not.toBeNull();

    const removed = await removeMember(admin, { membershipId: membershipOf(studio, staff).id });
    expect(removed.userId).toBe(staff.user.id);
    expect(getDb().select().from(sessions).where(eq(sessions.userId, staff.user.id)).all()).toHaveLength(0);
    expect((await lucia.validateSession(sha256Hex(`phone-${staff.user.id}`))).session).toBeNull();
    expect((await lucia.validateSession(sha256Hex(`admin-${admin.user.id}`))).session).not.toBeNull();
    expect(listMembers(admin).map((m) => m.userId)).not.toContain(staff.user.id);
    const audit = getDb().select().from(auditLog).where(and(eq(auditLog.studioId, studio.id), eq(auditLog.action, "member.removed"))).get();
    expect(audit?.subjectId).toBe(staff.user.id);
  });

  it("an admin can't remove themselves, staff can't change the team, another studio's member is a 404", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    await memberContext(studio, "admin");
    const staff = await memberContext(studio, "staff");
    await expectStatus(() => removeMember(admin, { membershipId: membershipOf(studio, admin).id }), 409);
    await expectStatus(() => changeMemberRole(staff, { membershipId: membershipOf(studio, staff).id, role: "admin" }), 403);
    await expectStatus(() => removeMember(staff, { membershipId: membershipOf(studio, admin).id }), 403);
    const other = createStudio();
    const otherAdmin = await memberContext(other, "admin");
    await expectStatus(() => changeMemberRole(otherAdmin, { membershipId: membershipOf(studio, staff).id, role: "technician" }), 404);
    await expectStatus(() => removeMember(otherAdmin, { membershipId: membershipOf(studio, staff).id }), 404);
    expect(membershipOf(studio, staff).role).toBe("staff");
    // Promoting is fine, and so is demoting an admin while another remains.
    expect(changeMemberRole(admin, { membershipId: membershipOf(studio, staff).id, role: "admin" }).role).toBe("admin");
    expect(changeMemberRole(admin, { membershipId: membershipOf(studio, admin).id, role: "technician" }).role).toBe("technician");
  });
});
