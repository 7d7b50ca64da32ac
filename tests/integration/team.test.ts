// Team rules: the last admin can't be removed or demoted; a removed member's sessions end at once;
// only admins change the team; another studio's member is a 404. All data invented.
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { auditLog, invitations, memberships, sessions, users, type Studio } from "@/db/schema";
import { acceptInvitation, inviteMember } from "@/lib/auth/accounts";
import type { StudioContext } from "@/lib/auth/guards";
import { getLucia } from "@/lib/auth/lucia";
import { sha256Hex } from "@/lib/crypto";
import { AppError } from "@/lib/errors";
import { changeMemberRole, listMembers, listOpenInvitations, removeMember, revokeInvitation } from "@/lib/studio/team";
import { extractLinks, waitForMail } from "../support/mail";
import { createStudio, memberContext, unique } from "../support/fixtures";

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

/** Sends an invitation and returns it with the token from the link in its e-mail (read at the sink). */
async function invite(admin: StudioContext, email: string, role: "admin" | "staff" | "technician") {
  const since = new Date();
  const invitation = await inviteMember(admin, { email, role });
  const mail = await waitForMail({ to: email, subject: /invited you/i, since });
  const link = extractLinks(mail.text).find((l) => l.includes("/invite/"))!;
  return { invitation, token: decodeURIComponent(new URL(link).pathname.split("/").pop()!) };
}

const membershipsOf = (studio: Studio, email: string) =>
  getDb()
    .select({ role: memberships.role })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.studioId, studio.id), eq(users.email, email)))
    .all();

describe("invitations", () => {
  it("an admin sees a pending invitation and withdraws it; its link stops working", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const email = `${unique("invitee")}@test.example`;
    const { invitation, token } = await invite(admin, email, "staff");
    expect(listOpenInvitations(admin).map((i) => i.id)).toEqual([invitation.id]);

    const withdrawn = revokeInvitation(admin, { invitationId: invitation.id });
    expect(withdrawn.email).toBe(email);
    expect(listOpenInvitations(admin)).toHaveLength(0);
    await expectStatus(() => acceptInvitation({ token, name: "Too Late (invented)", password: "a long enough password" }, null), 404);
    expect(membershipsOf(studio, email)).toHaveLength(0);
    // Withdrawing it again: it is no longer waiting.
    await expectStatus(() => revokeInvitation(admin, { invitationId: invitation.id }), 404);
    const audit = getDb().select().from(auditLog).where(and(eq(auditLog.studioId, studio.id), eq(auditLog.action, "member.invitation_withdrawn"))).all();
    expect(audit.map((a) => a.subjectId)).toEqual([invitation.id]);
  });

  it("a second invitation to the same address replaces the one waiting: one link works, with the new role", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const email = `${unique("twice")}@test.example`;
    const first = await invite(admin, email, "technician");
    const second = await invite(admin, email, "staff");
    expect(second.invitation.replaced).toEqual(["technician"]);
    expect(listOpenInvitations(admin).map((i) => [i.id, i.role])).toEqual([[second.invitation.id, "staff"]]);
    await expectStatus(() => acceptInvitation({ token: first.token, name: "Old Link (invented)", password: "a long enough password" }, null), 404);
    await acceptInvitation({ token: second.token, name: "New Link (invented)", password: "a long enough password" }, null);
    expect(membershipsOf(studio, email)).toEqual([{ role: "staff" }]);
    // Another studio's invitation to the same address is left alone.
    const otherAdmin = await memberContext(createStudio(), "admin");
    const elsewhere = await invite(otherAdmin, `${unique("kept")}@test.example`, "staff");
    await invite(admin, elsewhere.invitation.email, "staff");
    expect(listOpenInvitations(otherAdmin).map((i) => i.id)).toEqual([elsewhere.invitation.id]);
  });

  it("only the studio's admins withdraw its invitations; another studio's admin gets a 404", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const staff = await memberContext(studio, "staff");
    const otherAdmin = await memberContext(createStudio(), "admin");
    const { invitation } = await invite(admin, `${unique("invitee")}@test.example`, "technician");
    await expectStatus(() => revokeInvitation(staff, { invitationId: invitation.id }), 403);
    await expectStatus(() => revokeInvitation(otherAdmin, { invitationId: invitation.id }), 404);
    expect(listOpenInvitations(otherAdmin)).toHaveLength(0);
    expect(listOpenInvitations(admin).map((i) => i.id)).toEqual([invitation.id]);
  });

  it("removing a member withdraws every invitation still waiting for their address, so they can't come back in with one", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const email = `${unique("former")}@test.example`;
    // They joined as staff, and an admin invitation they never used is still waiting for their address
    // (written here as a row: a new invitation now replaces a waiting one, but rows from before stay).
    const joined = await invite(admin, email, "staff");
    const { userId } = await acceptInvitation({ token: joined.token, name: "Former Staff (invented)", password: "a long enough password" }, null);
    const spare = {
      token: "spare-invitation-token-invented",
      invitation: getDb()
        .insert(invitations)
        .values({ studioId: studio.id, email, role: "admin", tokenHash: sha256Hex("spare-invitation-token-invented"), invitedById: admin.user.id, expiresAt: new Date(Date.now() + 86_400_000) })
        .returning()
        .get(),
    };
    const other = createStudio();
    const otherAdmin = await memberContext(other, "admin");
    const elsewhere = await invite(otherAdmin, email, "technician");

    const membershipId = getDb().select().from(memberships).where(and(eq(memberships.studioId, studio.id), eq(memberships.userId, userId))).get()!.id;
    await removeMember(admin, { membershipId });
    expect(getDb().select().from(invitations).where(eq(invitations.id, spare.invitation.id)).get()!.revokedAt).toBeInstanceOf(Date);
    await expectStatus(() => acceptInvitation({ token: spare.token, name: "x", password: "a long enough password" }, userId), 404);
    expect(membershipsOf(studio, email)).toHaveLength(0);
    // Another studio's invitation to the same address is that studio's business.
    expect(listOpenInvitations(otherAdmin).map((i) => i.id)).toEqual([elsewhere.invitation.id]);
  });

  it("an invitation accepted twice at once makes one account and one membership; the other accept is told it was used", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const email = `${unique("double")}@test.example`;
    const { token } = await invite(admin, email, "technician");
    const accept = () => acceptInvitation({ token, name: "Double Click (invented)", password: "a long enough password" }, null);
    const results = await Promise.allSettled([accept(), accept()]);
    const fulfilled = results.filter((r) => r.status === "fulfilled");
    const rejected = results.filter((r): r is PromiseRejectedResult => r.status === "rejected");
    expect(fulfilled).toHaveLength(1);
    expect(rejected).toHaveLength(1);
    expect(rejected[0]!.reason).toBeInstanceOf(AppError);
    expect((rejected[0]!.reason as AppError).status).toBe(404);
    expect(getDb().select().from(users).where(eq(users.email, email)).all()).toHaveLength(1);
    expect(membershipsOf(studio, email)).toEqual([{ role: "technician" }]);
  });
});
