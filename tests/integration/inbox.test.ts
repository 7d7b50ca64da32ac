// Conversations and the studio's inbox against a real SQLite file, the real SMTP sink, and the inbound
// listener over SMTP with nodemailer as the sending mail server: owner messages land unread; a staff
// reply mails the owner with the thread's own Reply-To; the owner's e-mailed answer lands in the
// thread once however often it is delivered; mail that matches no thread is kept; other studios and
// former owners get 404s. All data is invented.
import { eq } from "drizzle-orm";
import nodemailer from "nodemailer";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ZodError } from "zod";
import { getDb } from "@/db/client";
import { claims, clients, pieces, repairJobs, threadMessages, threads, unmatchedMail } from "@/db/schema";
import { clientTimeline } from "@/lib/clients/timeline";
import { decideClaim } from "@/lib/claims/decide-claim";
import { getOwnerClaim } from "@/lib/claims/view-claim";
import { postClaimMessage } from "@/lib/claims/reply";
import { transitionClaim } from "@/lib/claims/transition";
import { AppError } from "@/lib/errors";
import { startInboundListener, replyText, type InboundListener } from "@/lib/mail/inbound";
import { checkReplyAddress, replyAddress } from "@/lib/messages/reply-address";
import { findThread } from "@/lib/messages/store";
import { getThread, listInbox, ownerConversations, ownerSubject, postOwnerMessage, replyToThread, studioThread, unreadCount, updateThread } from "@/lib/messages/service";
import type { User } from "lucia";
import type { StudioContext } from "@/lib/auth/guards";
import { messageFormSchema } from "@/lib/validation/messages";
import { auditsOf, createUser } from "../support/fixtures";
import { getMail, waitForMail } from "../support/mail";
import { bookVisit } from "@/lib/visits/book";
import { listJobSlots } from "@/lib/visits/slots";
import { claimWorld, fileClaim, otherStudioStaff } from "./claims-helpers";
import { ownerActor, visitWorld } from "./visits-helpers";

let listener: InboundListener;
beforeAll(async () => {
  listener = await startInboundListener({ port: 0 });
});
afterAll(async () => {
  await listener?.close();
});

/** Sends like the owner's mail server would: plain SMTP to the listener. */
async function sendToListener(mail: { from: string; to: string; subject?: string; text: string; messageId?: string }) {
  const transport = nodemailer.createTransport({ host: "127.0.0.1", port: listener.port, secure: false, ignoreTLS: true });
  try {
    return await transport.sendMail({ subject: "Re: your repair job", ...mail });
  } finally {
    transport.close();
  }
}

async function status(p: Promise<unknown> | (() => unknown)): Promise<number> {
  try {
    await (typeof p === "function" ? p() : p);
    return 200;
  } catch (e) {
    if (e instanceof AppError) return e.status;
    if (e instanceof ZodError) return 400;
    throw e;
  }
}

/** A claim world plus a quoted repair job on the owner's piece (as staff leave it once the quote is sent). */
async function jobWorld() {
  const w = await claimWorld();
  const job = getDb()
    .insert(repairJobs)
    .values({ studioId: w.studio.id, pieceId: w.piece.id, ownerId: w.owner.id, origin: "studio", state: "quoted", title: "Re-oil the top (invented)", quoteInput: {}, lines: [], currency: "USD", quoteVersion: 1 })
    .returning()
    .get();
  return { ...w, job };
}

/** As POST /api/threads does: what it is about found first (404 if not the owner's), then the parsed body. */
const post = (owner: User, about: "claim" | "job" | "visit", id: string, body: string) =>
  Promise.resolve().then(() => postOwnerMessage(owner, ownerSubject(owner, { about, id }), messageFormSchema.parse({ body })));
/** As POST /api/threads/[id]/messages does: the studio's thread found first, then the parsed body. */
const staffReply = (ctx: StudioContext, threadId: string, body: string) => Promise.resolve().then(() => replyToThread(ctx, studioThread(ctx, threadId), messageFormSchema.parse({ body })));

const messagesIn = (threadId: string) => getDb().select().from(threadMessages).where(eq(threadMessages.threadId, threadId)).all();

describe("reply addresses", () => {
  it("are signed per thread: the thread's own checks out, a changed signature or thread does not", () => {
    const id = "0b7d1c2e-3f40-4a51-8c62-7d8e9fa0b1c2";
    const address = replyAddress(id);
    expect(address).toMatch(/^reply\+[0-9a-f]{32}\.[0-9a-f]{20}@/);
    expect(address.split("@")[0]!.length).toBeLessThanOrEqual(64); // RFC 5321 §4.5.3.1.1
    expect(checkReplyAddress(address)).toEqual({ kind: "ok", threadId: id });
    expect(checkReplyAddress(address.toUpperCase().replace(/@.*/, (d) => d.toLowerCase()))).toEqual({ kind: "ok", threadId: id });
    const forged = address.replace(/\.([0-9a-f])/, (_, c: string) => `.${c === "0" ? "1" : "0"}`);
    expect(checkReplyAddress(forged)).toEqual({ kind: "bad", threadId: id });
    const otherThread = address.replace(/^reply\+0/, "reply+1");
    expect(checkReplyAddress(otherThread).kind).toBe("bad");
    expect(checkReplyAddress("studio@test.example").kind).toBe("none");
  });

  it("replyText keeps what the owner wrote, not the quoted mail or the signature", () => {
    const text = "Thursday morning suits us.\nThe gate code is 4321.\n\nOn Mon, 30 Nov 2026 at 09:12, Test Studio <reply+abc@x.example> wrote:\n> We can come on Thursday.\n> Best, the studio\n";
    expect(replyText(text)).toBe("Thursday morning suits us.\nThe gate code is 4321.");
    expect(replyText("Fine by me.\n\n-- \nTest Owner (invented)\n555 0100")).toBe("Fine by me.");
    expect(replyText("x".repeat(5000))).toHaveLength(4000);
  });
});

describe("owner messages and the inbox", () => {
  it("an owner's message on a decided claim lands in the inbox, unread until staff open it", async () => {
    const w = await claimWorld();
    const claim = await fileClaim(w.ownerV, w.piece.id);
    transitionClaim(w.staffCtx, claim.id, { to: "in_review" });
    await decideClaim(w.staffCtx, claim.id, { decision: "declined", reason: "Heat marks are not covered (invented)." });
    expect(unreadCount(w.staffCtx)).toBe(0);

    const out = await post(w.owner, "claim", claim.id, "The top still feels tacky; when can the children use it?");
    expect(unreadCount(w.staffCtx)).toBe(1);
    const inbox = listInbox(w.staffCtx);
    expect(inbox.threads).toHaveLength(1);
    expect(inbox.threads[0]).toMatchObject({ id: out.threadId, state: "unread", about: "claim", ownerName: w.owner.name, pieceTitle: w.piece.title, preview: "The top still feels tacky; when can the children use it?" });
    expect(inbox.threads[0]!.waitingSince).not.toBeNull();
    // The claim page shows the same message.
    expect(getOwnerClaim(w.owner, claim.id).messages.map((m) => m.body)).toContain("The top still feels tacky; when can the children use it?");

    const opened = getThread(w.staffCtx, out.threadId, { markRead: true });
    expect(opened.thread.state).toBe("open");
    expect(unreadCount(w.staffCtx)).toBe(0);

    // The answer from the inbox goes on the claim's own thread and mails the owner with its Reply-To.
    const since = new Date();
    const after = await staffReply(w.staffCtx, out.threadId, "Give it two more weeks before daily use.");
    expect(after.thread.waitingSince).toBeNull();
    expect(getOwnerClaim(w.owner, claim.id).messages.at(-1)).toMatchObject({ fromStudio: true, body: "Give it two more weeks before daily use." });
    const mail = await waitForMail({ to: w.owner.email, since, subject: /New message from/ });
    expect(mail.headers["reply-to"]).toContain(replyAddress(out.threadId));
  });

  it("staff reply from the inbox: the owner gets it by mail with the thread's Reply-To, and nothing waits any more", async () => {
    const w = await jobWorld();
    const { threadId } = await post(w.owner, "job", w.job.id, "Can you come before the holidays?");
    const since = new Date();
    const after = await staffReply(w.staffCtx, threadId, "Yes, Thursday morning works for us.");
    expect(after.thread.waitingSince).toBeNull();
    expect(after.messages.map((m) => [m.author, m.body])).toEqual([
      ["owner", "Can you come before the holidays?"],
      ["staff", "Yes, Thursday morning works for us."],
    ]);
    const mail = await waitForMail({ to: w.owner.email, since, subject: /New message from/ });
    expect(mail.headers["reply-to"]).toContain(replyAddress(threadId));
    expect(mail.text).toContain("Yes, Thursday morning works for us.");
  });

  it("assign to a staff member and mark done; a new owner message makes it unread again", async () => {
    const w = await jobWorld();
    const { threadId } = await post(w.owner, "job", w.job.id, "Question about the oil (invented).");
    expect(updateThread(w.staffCtx, threadId, { assignedToId: w.staffCtx.user.id }).thread.assignedToId).toBe(w.staffCtx.user.id);
    expect(listInbox(w.staffCtx, { view: "mine" }).threads.map((t) => t.id)).toEqual([threadId]);
    const stranger = await createUser();
    expect(await status(() => updateThread(w.staffCtx, threadId, { assignedToId: stranger.id }))).toBe(422);
    expect(updateThread(w.staffCtx, threadId, { state: "done" }).thread.state).toBe("done");
    expect(listInbox(w.staffCtx).threads).toHaveLength(0);
    expect(listInbox(w.staffCtx, { view: "done" }).threads.map((t) => t.id)).toEqual([threadId]);
    await post(w.owner, "job", w.job.id, "One more thing (invented).");
    expect(getThread(w.staffCtx, threadId).thread.state).toBe("unread");
  });

  it("the client's timeline shows the messages, linking to the conversation", async () => {
    const w = await jobWorld();
    const client = getDb().insert(clients).values({ studioId: w.studio.id, name: w.owner.name, email: w.owner.email, userId: w.owner.id }).returning().get();
    const { threadId } = await post(w.owner, "job", w.job.id, "Hello (invented).");
    await staffReply(w.staffCtx, threadId, "Hello back (invented).");
    const entries = clientTimeline(w.staffCtx, client.id, 20).entries.filter((e) => e.kind === "message");
    expect(entries.map((e) => [e.title, e.href])).toEqual([
      [`The studio wrote to them about a repair job on “${w.piece.title}”`, `/studio/inbox/${threadId}`],
      [`They wrote to the studio about a repair job on “${w.piece.title}”`, `/studio/inbox/${threadId}`],
    ]);
  });

  it("another studio's staff get 404s; a stranger or a former owner cannot post", async () => {
    const w = await jobWorld();
    const { threadId } = await post(w.owner, "job", w.job.id, "Hello (invented).");
    const other = await otherStudioStaff();
    expect(await status(() => getThread(other, threadId))).toBe(404);
    expect(await status(staffReply(other, threadId, "Not my studio."))).toBe(404);
    expect(await status(() => updateThread(other, threadId, { state: "done" }))).toBe(404);
    expect(listInbox(other).threads.map((t) => t.id)).not.toContain(threadId);

    // The owner is allowed, so a blank message is a 400 (checked after who may write).
    expect(await status(post(w.owner, "job", w.job.id, "   "))).toBe(400);
    const stranger = await createUser();
    expect(await status(post(stranger, "job", w.job.id, "Hi"))).toBe(404);
    // The piece is transferred away: its former owner writes no more, on the job or the claim.
    const claim = await fileClaim(w.ownerV, w.piece.id);
    getDb().update(pieces).set({ ownerId: stranger.id }).where(eq(pieces.id, w.piece.id)).run();
    expect(await status(post(w.owner, "job", w.job.id, "Still me"))).toBe(404);
    expect(await status(post(w.owner, "claim", claim.id, "Still me"))).toBe(404);
    expect(ownerConversations(w.owner, { pieceId: w.piece.id })).toEqual([]);
  });
});

describe("replies by e-mail through the inbound listener", () => {
  it("the visit invite carries the visit thread's Reply-To, and the answer lands there", async () => {
    const NOW = Date.parse("2027-05-03T12:00:00Z"); // a Monday, as in visits.test.ts
    const w = await visitWorld();
    const slot = listJobSlots(ownerActor(w.owner), w.job.id, { from: "2027-05-05T00:00:00Z", to: "2027-05-08T00:00:00Z" }, NOW).slots[0]!;
    const since = new Date();
    const visit = await bookVisit(ownerActor(w.owner), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, NOW);
    const invite = await waitForMail({ to: w.owner.email, since, subject: /^Visit booked/ });
    const threadId = findThread(getDb(), { kind: "visit", id: visit.id })!.id;
    expect(invite.headers["reply-to"]).toContain(replyAddress(threadId));
    await sendToListener({ from: w.owner.email, to: replyAddress(threadId), text: "The side gate will be open. (invented)" });
    expect(messagesIn(threadId).map((m) => [m.author, m.source, m.body])).toEqual([["owner", "email", "The side gate will be open. (invented)"]]);
  });

  it("lands in the thread and the inbox exactly once, quotes stripped (sent twice: once)", async () => {
    const w = await jobWorld();
    const { threadId } = await post(w.owner, "job", w.job.id, "When can you come?");
    await staffReply(w.staffCtx, threadId, "Thursday at nine?");
    getThread(w.staffCtx, threadId, { markRead: true });
    expect(unreadCount(w.staffCtx)).toBe(0);

    const reply = {
      from: `"${w.owner.name}" <${w.owner.email}>`,
      to: replyAddress(threadId),
      text: "Thursday at nine is perfect.\n\nOn Tue, 1 Dec 2026, Test Studio wrote:\n> Thursday at nine?\n",
      messageId: `<reply-${threadId}@owner-mail.test.example>`,
    };
    await sendToListener(reply);
    await sendToListener(reply);
    const mine = messagesIn(threadId).filter((m) => m.source === "email");
    expect(mine).toHaveLength(1);
    expect(mine[0]).toMatchObject({ author: "owner", authorId: w.owner.id, body: "Thursday at nine is perfect.", emailMessageId: reply.messageId });
    const t = getThread(w.staffCtx, threadId);
    expect(t.thread.state).toBe("unread");
    expect(t.messages.at(-1)).toMatchObject({ author: "owner", source: "email", body: "Thursday at nine is perfect." });
    expect(unreadCount(w.staffCtx)).toBe(1);
  });

  it("an owner's e-mailed answer to a claim waiting on them takes it back to review, as the web page does; delivered twice, once", async () => {
    const w = await claimWorld();
    const claim = await fileClaim(w.ownerV, w.piece.id);
    transitionClaim(w.staffCtx, claim.id, { to: "in_review" });
    const since = new Date();
    const asked = await postClaimMessage(w.staff, claim.id, { body: "Could you send a photo of the glue line in daylight?", requestInfo: true });
    expect(asked.state).toBe("awaiting_owner");
    const request = await waitForMail({ to: w.owner.email, since, subject: /needs a little more/ });
    const replyTo = request.headers["reply-to"]!.match(/reply\+[^>\s,]+/)![0];
    const version = getDb().select().from(claims).where(eq(claims.id, claim.id)).get()!.version;

    const reply = { from: w.owner.email, to: replyTo, text: "It opened a little more; photo to follow. (invented)\n\n> Could you send a photo?", messageId: `<answer-${claim.id}@owner-mail.test.example>` };
    await sendToListener(reply);
    await sendToListener(reply);
    const after = getDb().select().from(claims).where(eq(claims.id, claim.id)).get()!;
    expect(after.state).toBe("in_review");
    expect(after.version).toBe(version + 1); // one move, not two
    expect(getOwnerClaim(w.owner, claim.id).messages.filter((m) => m.body === "It opened a little more; photo to follow. (invented)")).toHaveLength(1);
    const audits = auditsOf(claim.id, "claim.message").filter((a) => (a.data as { via?: string }).via === "email");
    expect(audits).toHaveLength(1);
    expect(audits[0]!.data).toMatchObject({ from: "awaiting_owner", to: "in_review", fromStudio: false });
    // The same move the web page makes: staff can decide it now, and a second e-mail moves nothing.
    await sendToListener({ ...reply, text: "One more thing (invented).", messageId: `<answer2-${claim.id}@owner-mail.test.example>` });
    expect(getDb().select().from(claims).where(eq(claims.id, claim.id)).get()!).toMatchObject({ state: "in_review", version: version + 1 });
  });

  it("the reply to the mail the owner actually received lands in its thread", async () => {
    const w = await jobWorld();
    const { threadId } = await post(w.owner, "job", w.job.id, "Is the quote final?");
    const since = new Date();
    await staffReply(w.staffCtx, threadId, "It is, unless the top needs more than one coat.");
    const got = await getMail((await waitForMail({ to: w.owner.email, since })).id);
    const replyTo = got.headers["reply-to"]!.match(/reply\+[^>\s,]+/)![0];
    await sendToListener({ from: w.owner.email, to: replyTo, text: `Understood, go ahead.\n\n> ${got.text.split("\n").join("\n> ")}` });
    expect(messagesIn(threadId).map((m) => m.body)).toContain("Understood, go ahead.");
  });

  it("a wrong sender or a bad token is kept as unmatched for the studio, not added to the thread", async () => {
    const w = await jobWorld();
    const { threadId } = await post(w.owner, "job", w.job.id, "Hello (invented).");
    const before = messagesIn(threadId).length;
    await sendToListener({ from: "someone-else@test.example", to: replyAddress(threadId), text: "Not the owner (invented).", messageId: `<wrong-${threadId}@test.example>` });
    const forged = replyAddress(threadId).replace(/\.([0-9a-f])/, (_, c: string) => `.${c === "0" ? "1" : "0"}`);
    await sendToListener({ from: w.owner.email, to: forged, text: "Forged address (invented).", messageId: `<forged-${threadId}@test.example>` });
    await sendToListener({ from: w.owner.email, to: forged, text: "Forged address (invented).", messageId: `<forged-${threadId}@test.example>` });
    expect(messagesIn(threadId)).toHaveLength(before);
    const kept = getDb().select().from(unmatchedMail).where(eq(unmatchedMail.threadId, threadId)).all();
    expect(kept.map((k) => k.reason).sort()).toEqual(["bad_token", "wrong_sender"]);
    expect(kept.every((k) => k.studioId === w.studio.id)).toBe(true);
    // The envelope's recipient and the To header name the same address: it is kept once, not "x, x".
    expect(kept.map((k) => k.toEmail).sort()).toEqual([forged, replyAddress(threadId)].sort());
    const listed = listInbox(w.staffCtx, { view: "unmatched" }).unmatched;
    expect(listed.map((u) => u.body).sort()).toEqual(["Forged address (invented).", "Not the owner (invented)."]);
    const other = await otherStudioStaff();
    expect(listInbox(other, { view: "unmatched" }).unmatched.map((u) => u.threadId)).not.toContain(threadId);
  });

  it("a reply from a former owner is kept as unmatched, not added", async () => {
    const w = await jobWorld();
    const { threadId } = await post(w.owner, "job", w.job.id, "Hello (invented).");
    getDb().update(pieces).set({ ownerId: null }).where(eq(pieces.id, w.piece.id)).run();
    await sendToListener({ from: w.owner.email, to: replyAddress(threadId), text: "Released it, but still writing.", messageId: `<former-${threadId}@test.example>` });
    expect(messagesIn(threadId).map((m) => m.body)).not.toContain("Released it, but still writing.");
    expect(getDb().select().from(unmatchedMail).where(eq(unmatchedMail.threadId, threadId)).all().map((k) => k.reason)).toEqual(["closed"]);
  });

  it("takes mail only for the reply domain and studios' own addresses; a studio's address is kept for that studio", async () => {
    const w = await jobWorld();
    await expect(sendToListener({ from: w.owner.email, to: "someone@elsewhere.test.example", text: "Not for us." })).rejects.toThrow(/550|recipient/i);
    const messageId = `<to-studio-${w.studio.id}@test.example>`;
    await sendToListener({ from: w.owner.email, to: w.studio.email, text: "Written to the studio's address (invented).", messageId });
    expect(getDb().select().from(unmatchedMail).where(eq(unmatchedMail.emailMessageId, messageId)).get()).toMatchObject({ studioId: w.studio.id, reason: "no_token", toEmail: w.studio.email });
  });

  it("refuses a message over the size limit at the SMTP level", async () => {
    const w = await jobWorld();
    const { threadId } = await post(w.owner, "job", w.job.id, "Hello (invented).");
    await expect(sendToListener({ from: w.owner.email, to: replyAddress(threadId), text: "x".repeat(11 * 1024 * 1024) })).rejects.toThrow(/552|too large|size/i);
    expect(getDb().select().from(threads).where(eq(threads.id, threadId)).get()!.state).toBe("unread");
  });
});
