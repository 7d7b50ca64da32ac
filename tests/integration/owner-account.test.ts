// The owner's own account: moving it to another e-mail address (a link to the new address, a notice to
// the old, the change made only when the link is opened by the same account) and deleting it (pieces
// released, open claims withdrawn with a note, quotes declined, name/e-mail/password gone, the books
// kept). Real SQLite file, real SMTP sink; actions called as Next.js calls them, with a session in the
// test database. All data invented.
import { and, eq, inArray, isNull } from "drizzle-orm";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { getDb } from "@/db/client";
import { auditLog, claims, clients, memberships, ownerships, pieces, refreshOffers, repairJobs, sessions, threadMessages, threads, userTokens, users } from "@/db/schema";
import { ownerActor } from "@/lib/auth/actor";
import { SESSION_COOKIE } from "@/lib/auth/lucia";
import { settleAfterAnswer } from "@/lib/auth/after-answer";
import { signIn as signInWithPassword } from "@/lib/auth/accounts";
import { randomToken, sha256Hex } from "@/lib/crypto";
import { receiveInboundMail } from "@/lib/mail/inbound";
import { threadFor } from "@/lib/messages/store";
import { confirmEmailChange, emailChangeLink, pendingEmailChange, requestEmailChange } from "@/lib/owner/account-email";
import { DELETED_NAME, deleteAccount, deletionPreview } from "@/lib/owner/account-delete";
import { changeEmailSchema } from "@/lib/validation/account";
import { createPiece, createStudio, createUser, unique } from "../support/fixtures";
import { extractLinks, listMail, waitForMail } from "../support/mail";
import { form, jar, redirectOf, signInToJar } from "../support/session-jar";
import { claimWorld, fileClaim, offerFor } from "./claims-helpers";

// next/headers outside a Next.js request: the cookie jar holds the session token of whoever signed in (tests/support/session-jar.ts).
vi.mock("next/headers", () => import("../support/session-jar").then((m) => m.nextHeaders));
beforeEach(() => jar.clear());

const CLAIM_NOTE = "I deleted my Grainward account, so this claim is withdrawn. (Written by Grainward when the account was deleted.)";
const PASSWORD = "correct horse battery"; // tests/support/fixtures.ts createUser
let ipCounter = 0;
const ip = () => `198.51.100.${++ipCounter % 250}`;

const session = (userId: string, inJar = true) => signInToJar(userId, { inJar });

const ask = (userId: string, email: string, current = PASSWORD) => requestEmailChange({ id: userId }, changeEmailSchema.parse({ email, current }), ip());

/** The link in the newest confirmation mail to `to`, as the owner would open it. */
async function linkSentTo(to: string, since: Date): Promise<string> {
  const mail = await waitForMail({ to, subject: /Confirm your new e-mail address/, since });
  const url = extractLinks(mail.text).find((l) => l.includes("/account/email/confirm?token="));
  expect(url, mail.text).toBeTruthy();
  return new URL(url!).searchParams.get("token")!;
}

const emailOf = (userId: string) => getDb().select({ email: users.email }).from(users).where(eq(users.id, userId)).get()!.email;

describe("changing the e-mail address", () => {
  it("asks with the password; the new address gets a link and the old a notice; only the link changes it, once", async () => {
    const owner = await createUser({ name: "Mirela Oakes (invented)" });
    const newEmail = `${unique("moved")}@test.example`;

    await expect(ask(owner.id, newEmail, "not the password")).rejects.toMatchObject({ status: 400, fieldErrors: { current: ["That isn't your current password."] } });
    await expect(ask(owner.id, owner.email)).rejects.toMatchObject({ status: 400, fieldErrors: { email: ["That is already your address."] } });

    const since = new Date();
    const pending = await ask(owner.id, newEmail);
    await settleAfterAnswer();
    expect(pending.newEmail).toBe(newEmail);
    expect(pending.expiresAt - pending.requestedAt).toBe(24 * 60 * 60 * 1000);
    const token = await linkSentTo(newEmail, since);
    const notice = await waitForMail({ to: owner.email, subject: "Someone asked to change your Grainward e-mail address", since });
    expect(notice.text).toContain(newEmail);
    expect(extractLinks(notice.text).some((l) => l.endsWith("/account/email"))).toBe(true);
    // Nothing changes until the link is opened; the waiting change is on the account page.
    expect(emailOf(owner.id)).toBe(owner.email);
    expect(pendingEmailChange(owner)).toMatchObject({ newEmail });
    // Stored hashed, like every mailed token.
    expect(getDb().select().from(userTokens).where(eq(userTokens.tokenHash, token)).get()).toBeUndefined();

    const outcome = await confirmEmailChange(owner, token);
    expect(outcome).toEqual({ kind: "changed", newEmail });
    expect(emailOf(owner.id)).toBe(newEmail);
    await waitForMail({ to: owner.email, subject: "Your Grainward e-mail address was changed", since });
    // A replay changes nothing.
    expect(await confirmEmailChange(owner, token)).toEqual({ kind: "gone" });
    expect(pendingEmailChange(owner)).toBeNull();
    // The new address signs in; the old one no longer does.
    await expect(signInWithPassword({ email: newEmail, password: PASSWORD }, ip())).resolves.toMatchObject({ id: owner.id });
    await expect(signInWithPassword({ email: owner.email, password: PASSWORD }, ip())).rejects.toMatchObject({ status: 401 });
  });

  it("an address another account uses gets the same answer; that address is told instead of sent a link, and nothing changes", async () => {
    const owner = await createUser();
    const holder = await createUser({ name: "Address Holder (invented)" });
    const since = new Date();
    const pending = await ask(owner.id, holder.email);
    await settleAfterAnswer();
    expect(pending).toMatchObject({ newEmail: holder.email });
    const told = await waitForMail({ to: holder.email, since });
    expect(told.subject).toBe("Someone tried to move a Grainward account to your address");
    expect(extractLinks(told.text).some((l) => l.includes("token="))).toBe(false);
    await waitForMail({ to: owner.email, subject: /asked to change/, since });
    expect((await listMail({ to: holder.email })).filter((m) => Date.parse(m.receivedAt) >= since.getTime())).toHaveLength(1);
    // Even the token (never mailed) would not take the address.
    const row = getDb().select().from(userTokens).where(and(eq(userTokens.userId, owner.id), eq(userTokens.purpose, "change_email"))).get()!;
    expect(row.newEmail).toBe(holder.email);
    expect(emailOf(owner.id)).toBe(owner.email);
  });

  it("a new request replaces the waiting one; a link expires; the address taken meanwhile is refused at the link", async () => {
    const owner = await createUser();
    const first = `${unique("first")}@test.example`;
    const second = `${unique("second")}@test.example`;
    const since = new Date();
    await ask(owner.id, first);
    await settleAfterAnswer();
    const oldLink = await linkSentTo(first, since);
    await ask(owner.id, second);
    await settleAfterAnswer();
    const newLink = await linkSentTo(second, since);
    expect(await confirmEmailChange(owner, oldLink)).toEqual({ kind: "gone" });
    expect(pendingEmailChange(owner)).toMatchObject({ newEmail: second });

    // 24 hours on, the link is gone.
    getDb().update(userTokens).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(userTokens.tokenHash, sha256Hex(newLink))).run();
    expect(emailChangeLink(newLink)).toBeNull();
    expect(await confirmEmailChange(owner, newLink)).toEqual({ kind: "gone" });
    expect(emailOf(owner.id)).toBe(owner.email);

    // Asked again; someone signs up with that address before the link is opened.
    const third = `${unique("third")}@test.example`;
    await ask(owner.id, third);
    await settleAfterAnswer();
    const thirdLink = await linkSentTo(third, since);
    await createUser({ email: third });
    expect(await confirmEmailChange(owner, thirdLink)).toEqual({ kind: "taken" });
    expect(emailOf(owner.id)).toBe(owner.email);
  });

  it("a link opened by another signed-in account changes nothing and stays the asker's; the asker's opening ends their other sessions and keeps this one", async () => {
    const { confirmEmailChangeAction } = await import("@/app/(owner)/account/email/confirm/actions");
    const owner = await createUser();
    const stranger = await createUser();
    const newEmail = `${unique("mine")}@test.example`;
    const since = new Date();
    await ask(owner.id, newEmail);
    await settleAfterAnswer();
    const token = await linkSentTo(newEmail, since);
    expect(emailChangeLink(token)).toEqual({ userId: owner.id, newEmail });

    await session(stranger.id);
    expect(await redirectOf(confirmEmailChangeAction(form({ token })))).toBe("/account/email/confirm?failed=1");
    expect(emailOf(stranger.id)).toBe(stranger.email);
    expect(emailOf(owner.id)).toBe(owner.email);
    expect(emailChangeLink(token)).toEqual({ userId: owner.id, newEmail });

    // Signed out: the action's guard refuses before anything is read.
    jar.clear();
    expect(await redirectOf(confirmEmailChangeAction(form({ token })))).toBe("/account/email/confirm?failed=1");

    const elsewhere = await session(owner.id, false);
    const here = await session(owner.id);
    // A reset link mailed to the old address before the change stops working with it.
    const resetHash = sha256Hex(randomToken());
    getDb().insert(userTokens).values({ userId: owner.id, purpose: "password_reset", tokenHash: resetHash, expiresAt: new Date(Date.now() + 3_600_000) }).run();
    expect(await redirectOf(confirmEmailChangeAction(form({ token })))).toBe("/account?email=changed");
    expect(emailOf(owner.id)).toBe(newEmail);
    const left = getDb().select({ id: sessions.id }).from(sessions).where(eq(sessions.userId, owner.id)).all().map((s) => s.id);
    expect(left).not.toContain(elsewhere);
    expect(left).not.toContain(here);
    expect(left).toHaveLength(1); // the fresh one this browser carries on in
    expect(sha256Hex(jar.get(SESSION_COOKIE)!)).toBe(left[0]);
    expect(getDb().select({ usedAt: userTokens.usedAt }).from(userTokens).where(eq(userTokens.tokenHash, resetHash)).get()!.usedAt).not.toBeNull();
  });

  it("staff see the new address on the client record, and replies by mail from it reach the thread", async () => {
    const w = await claimWorld();
    const client = getDb().insert(clients).values({ studioId: w.studio.id, name: w.owner.name, email: w.owner.email, userId: w.owner.id }).returning().get();
    getDb().update(pieces).set({ clientId: client.id }).where(eq(pieces.id, w.piece.id)).run();
    const claim = await fileClaim(w.ownerV, w.piece.id);
    const thread = getDb().transaction((tx) => threadFor(tx, { kind: "claim", id: claim.id }, new Date()));
    const newEmail = `${unique("reply")}@test.example`;
    const since = new Date();
    await ask(w.owner.id, newEmail);
    await settleAfterAnswer();
    expect(await confirmEmailChange(w.owner, await linkSentTo(newEmail, since))).toMatchObject({ kind: "changed" });

    const { getClient } = await import("@/lib/clients/get");
    const seen = getClient(w.staffCtx, client.id);
    expect(seen.client.email).toBe(newEmail);
    expect(seen.client.account?.email).toBe(newEmail);

    const { replyAddress } = await import("@/lib/messages/reply-address");
    const mail = (from: string, n: number) => ({ messageId: `<${unique("m")}@owner.test.example>`, senders: [from], recipients: [replyAddress(thread.id)], subject: "Re: your claim", text: `Reply ${n} (invented).`, receivedAt: new Date() });
    expect(receiveInboundMail(mail(newEmail, 1))).toMatchObject({ kind: "added", threadId: thread.id });
    // From the old address: kept for the studio as unmatched mail, never dropped.
    expect(receiveInboundMail(mail(w.owner.email, 2))).toMatchObject({ kind: "unmatched", reason: "wrong_sender", studioId: w.studio.id });
    expect(getDb().select().from(threadMessages).where(eq(threadMessages.threadId, thread.id)).all().map((m) => m.body)).toContain("Reply 1 (invented).");
  });
});

describe("deleting the account", () => {
  it("releases pieces, withdraws open claims with a note for the studio, declines quotes, removes name, e-mail and password, keeps the books", async () => {
    const { deleteAccountAction } = await import("@/app/(owner)/account/delete/actions");
    const w = await claimWorld({ piece: { title: "Deletion test table (invented)" } });
    const claim = await fileClaim(w.ownerV, w.piece.id);
    const quoted = getDb()
      .insert(repairJobs)
      .values({ studioId: w.studio.id, pieceId: w.piece.id, ownerId: w.owner.id, origin: "studio", state: "quoted", quoteVersion: 1, title: "Re-oil the top (invented)", quoteInput: {}, lines: [], currency: "USD", totalMinor: 9_000 })
      .returning()
      .get();
    const done = getDb()
      .insert(repairJobs)
      .values({ studioId: w.studio.id, pieceId: w.piece.id, ownerId: w.owner.id, origin: "studio", state: "done", quoteVersion: 1, title: "Earlier repair (invented)", quoteInput: {}, lines: [], currency: "USD", totalMinor: 4_000 })
      .returning()
      .get();
    expect(deletionPreview(w.owner)).toMatchObject({ blocks: [], openClaims: 1, quotes: 1, pieces: [{ id: w.piece.id, title: "Deletion test table (invented)" }] });

    await session(w.owner.id, false); // another device
    await session(w.owner.id);
    expect(await deleteAccountAction({ current: "not the password" })).toMatchObject({ ok: false, fieldErrors: { current: ["That isn't your current password."] } });
    expect(getDb().select().from(users).where(eq(users.id, w.owner.id)).get()!.deletedAt).toBeNull();

    const since = new Date();
    expect(await redirectOf(deleteAccountAction({ current: PASSWORD }))).toBe("/account-deleted");

    const row = getDb().select().from(users).where(eq(users.id, w.owner.id)).get()!;
    expect(row.name).toBe(DELETED_NAME);
    expect(row.email).not.toContain(w.owner.email.split("@")[0]);
    expect(row.email).toMatch(/@deleted\.invalid$/);
    expect(row.deletedAt).not.toBeNull();
    expect(row.remindersEnabled).toBe(false);
    await expect(signInWithPassword({ email: w.owner.email, password: PASSWORD }, ip())).rejects.toMatchObject({ status: 401 });
    await expect(signInWithPassword({ email: row.email, password: PASSWORD }, ip())).rejects.toMatchObject({ status: 401 });
    expect(getDb().select().from(sessions).where(eq(sessions.userId, w.owner.id)).all()).toEqual([]);
    expect(jar.has(SESSION_COOKIE)).toBe(false);

    // The piece is released for the studio to hand on; its new code went to the old address.
    expect(getDb().select({ ownerId: pieces.ownerId }).from(pieces).where(eq(pieces.id, w.piece.id)).get()!.ownerId).toBeNull();
    await waitForMail({ to: w.owner.email, subject: /Deletion test table/, since });
    // The claim is withdrawn and the studio's inbox has the note, unread.
    expect(getDb().select({ state: claims.state }).from(claims).where(eq(claims.id, claim.id)).get()!.state).toBe("closed");
    const thread = getDb().select().from(threads).where(eq(threads.claimId, claim.id)).get()!;
    expect(thread.state).toBe("unread");
    const notes = getDb().select().from(threadMessages).where(eq(threadMessages.threadId, thread.id)).all();
    expect(notes.at(-1)!.body).toMatch(/^I deleted my Grainward account, so this claim is withdrawn\./);
    // The quote is declined; the finished repair stays, its owner the nameless account.
    expect(getDb().select({ state: repairJobs.state }).from(repairJobs).where(eq(repairJobs.id, quoted.id)).get()!.state).toBe("cancelled");
    expect(getDb().select({ ownerId: repairJobs.ownerId }).from(repairJobs).where(eq(repairJobs.id, done.id)).get()!.ownerId).toBe(w.owner.id);
    expect(getDb().select().from(auditLog).where(and(eq(auditLog.action, "account.deleted"), eq(auditLog.studioId, w.studio.id))).all()).toHaveLength(1);
    // Nothing of the person's name or address in the account's audit rows.
    const audits = JSON.stringify(getDb().select().from(auditLog).where(eq(auditLog.actorId, w.owner.id)).all());
    expect(audits).not.toContain(w.owner.email);
  });

  it("is refused in words while a paid repair is not done, a plan's first payment is under way, or the account is on a studio's team; nothing changes", async () => {
    const w = await claimWorld();
    getDb()
      .insert(repairJobs)
      .values({ studioId: w.studio.id, pieceId: w.piece.id, ownerId: w.owner.id, origin: "studio", state: "paid", quoteVersion: 1, title: "Paid, not done (invented)", quoteInput: {}, lines: [], currency: "USD", totalMinor: 9_000 })
      .run();
    await expect(deleteAccount(ownerActor(w.owner), PASSWORD, ip())).rejects.toMatchObject({ status: 409, message: expect.stringContaining("Your repair “Paid, not done (invented)” is paid for or booked and not done yet.") });
    expect(getDb().select({ ownerId: pieces.ownerId }).from(pieces).where(eq(pieces.id, w.piece.id)).get()!.ownerId).toBe(w.owner.id);
    expect(getDb().select().from(users).where(eq(users.id, w.owner.id)).get()!.deletedAt).toBeNull();

    const member = await createUser();
    const studio = createStudio({ name: "Team Studio (invented)" });
    getDb().insert(memberships).values({ studioId: studio.id, userId: member.id, role: "staff" }).run();
    expect(deletionPreview(member).blocks.map((b) => b.kind)).toEqual(["team"]);
    await expect(deleteAccount(ownerActor(member), PASSWORD, ip())).rejects.toMatchObject({ status: 409, message: expect.stringContaining("Team Studio (invented)") });
    // The password is checked first: a wrong one says only that.
    await expect(deleteAccount(ownerActor(member), "wrong password", ip())).rejects.toMatchObject({ status: 400 });
  });
});

describe("deleting the account: one transaction", () => {
  /** A piece of theirs the studio has archived, with its ownership and an open refresh offer. */
  function archivedPiece(w: Awaited<ReturnType<typeof claimWorld>>) {
    const { piece } = createPiece(w.studio, { ownerId: w.owner.id, registeredAt: new Date(), archivedAt: new Date(), title: "Archived stool (invented)" });
    getDb().insert(ownerships).values({ studioId: w.studio.id, pieceId: piece.id, userId: w.owner.id, via: "registration", startedAt: new Date() }).run();
    return piece;
  }
  const ownerOf = (pieceId: string) => getDb().select({ ownerId: pieces.ownerId }).from(pieces).where(eq(pieces.id, pieceId)).get()!.ownerId;
  const offerStatus = (id: string) => getDb().select({ status: refreshOffers.status }).from(refreshOffers).where(eq(refreshOffers.id, id)).get()!.status;

  it("a failure at its last write (the studios' audit rows) leaves claims, pieces, offers and the account as they were, and mails nothing; a second try deletes", async () => {
    const w = await claimWorld({ piece: { title: "Rollback test bench (invented)" } });
    const claim = await fileClaim(w.ownerV, w.piece.id);
    const archived = archivedPiece(w);
    const offer = offerFor(w.studio.id, w.piece.id, w.owner.id);
    const before = new Date();
    // A real failure of the database file at the last step: the audit row that says the account is deleted.
    const sqlite = getDb().$client;
    sqlite.exec(`CREATE TRIGGER fail_account_deleted BEFORE INSERT ON audit_log WHEN NEW.action = 'account.deleted' BEGIN SELECT RAISE(ABORT, 'forced failure (test)'); END`);
    try {
      await expect(deleteAccount(ownerActor(w.owner), PASSWORD, ip())).rejects.toThrow(/forced failure/);
    } finally {
      sqlite.exec(`DROP TRIGGER fail_account_deleted`);
    }
    expect(getDb().select({ state: claims.state }).from(claims).where(eq(claims.id, claim.id)).get()!.state).toBe(claim.state);
    expect(ownerOf(w.piece.id)).toBe(w.owner.id);
    expect(ownerOf(archived.id)).toBe(w.owner.id);
    expect(getDb().select().from(ownerships).where(and(eq(ownerships.userId, w.owner.id), isNull(ownerships.endedAt))).all()).toHaveLength(2);
    expect(offerStatus(offer.id)).toBe("offered");
    const row = getDb().select().from(users).where(eq(users.id, w.owner.id)).get()!;
    expect(row).toMatchObject({ name: w.owner.name, email: w.owner.email, deletedAt: null });
    expect(getDb().select().from(auditLog).where(and(eq(auditLog.actorId, w.owner.id), inArray(auditLog.action, ["claim.withdrawn", "piece.released", "account.deleted"]))).all()).toEqual([]);
    expect(getDb().select().from(threadMessages).where(eq(threadMessages.body, CLAIM_NOTE)).all().filter((m) => m.authorId === w.owner.id)).toEqual([]);
    expect((await listMail({ to: w.owner.email })).filter((m) => new Date(m.receivedAt) >= before)).toEqual([]);

    await deleteAccount(ownerActor(w.owner), PASSWORD, ip());
    expect(getDb().select().from(users).where(eq(users.id, w.owner.id)).get()!.name).toBe(DELETED_NAME);
    expect(getDb().select({ state: claims.state }).from(claims).where(eq(claims.id, claim.id)).get()!.state).toBe("closed");
    expect(ownerOf(w.piece.id)).toBeNull();
    await waitForMail({ to: w.owner.email, subject: /Rollback test bench/, since: before });
  });

  it("unlinks the pieces the studio archived too (no code mailed for them), and leaves no refresh offer open for the account", async () => {
    const w = await claimWorld({ piece: { title: "Offer test desk (invented)" } });
    const archived = archivedPiece(w);
    const offers = [offerFor(w.studio.id, w.piece.id, w.owner.id), offerFor(w.studio.id, archived.id, w.owner.id)];
    const since = new Date();
    await deleteAccount(ownerActor(w.owner), PASSWORD, ip());

    expect(ownerOf(archived.id)).toBeNull();
    expect(getDb().select().from(ownerships).where(and(eq(ownerships.userId, w.owner.id), isNull(ownerships.endedAt))).all()).toEqual([]);
    expect(getDb().select().from(auditLog).where(and(eq(auditLog.action, "piece.released"), eq(auditLog.subjectId, archived.id))).all()).toHaveLength(1);
    expect(offers.map((o) => offerStatus(o.id))).toEqual(["expired", "expired"]);
    expect(getDb().select().from(refreshOffers).where(and(eq(refreshOffers.userId, w.owner.id), eq(refreshOffers.status, "offered"))).all()).toEqual([]);
    // The held piece's code went to the old address; the archived one's did not.
    await waitForMail({ to: w.owner.email, subject: /Offer test desk/, since });
    expect((await listMail()).filter((m) => new Date(m.receivedAt) >= since && /Archived stool/.test(m.subject))).toEqual([]);
  });
});

describe("what the delete page says stops it", () => {
  it("several unfinished repairs are named in one sentence", async () => {
    const w = await claimWorld();
    for (const [title, state] of [["Buff the top (invented)", "paid"], ["Re-glue a leg (invented)", "scheduled"], ["Polish the resin (invented)", "covered"]] as const) {
      getDb().insert(repairJobs).values({ studioId: w.studio.id, pieceId: w.piece.id, ownerId: w.owner.id, origin: "studio", state, quoteVersion: 1, title, quoteInput: {}, lines: [], currency: "USD" }).run();
    }
    expect(deletionPreview(w.owner).blocks).toEqual([
      {
        kind: "repair",
        words: "3 repairs of yours are paid for or booked and not done yet: “Buff the top (invented)”, “Polish the resin (invented)” and “Re-glue a leg (invented)”. Once the studio has done them, or cancelled them (a paid repair that is cancelled is refunded), you can delete your account.",
      },
    ]);
  });
});
